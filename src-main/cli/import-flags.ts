import type { Finding, Result } from '../../shared-core/result.js';
import { fail, ok } from '../../shared-core/result.js';
import { encodingFromName, encodingNames } from '../services/import/decode-text.js';
import { delimiterNames } from '../services/import/delimited-table.js';
import type { EventsRequest, ImportRequest } from '../services/import/import-request.js';

/**
 * The import flags every command that reads a table shares, in the shape of the `options` of
 * node's `util.parseArgs`: spread them into a command's own options.
 */
export const importFlags = {
  count: { type: 'string' },
  units: { type: 'string' },
  label: { type: 'string' },
  date: { type: 'string' },
  'inspection-unit': { type: 'string' },
  delimiter: { type: 'string' },
  decimal: { type: 'string' },
  encoding: { type: 'string' },
  sheet: { type: 'string' },
  'date-order': { type: 'string' },
  events: { type: 'boolean' },
  period: { type: 'string' },
  time: { type: 'string' },
  category: { type: 'string' },
  'shift-starts': { type: 'string' },
  'units-sheet': { type: 'string' },
  'units-file': { type: 'string' },
  'units-key': { type: 'string' },
} as const;

/** One line per flag, for a command's help text. */
export const importFlagHelp = [
  '--count COL             the column of nonconformity counts (required)',
  '--units COL             the column of inspection units per period (default: 1 unit per period)',
  '--label COL             the column of period labels (default: #ROW, the spreadsheet row)',
  '--date COL              the column of period dates (periods are analysed in date order)',
  '--inspection-unit TEXT  what one inspection unit is ("one board", "50 m2 of cloth")',
  '--delimiter D           comma, semicolon, tab or pipe (default: detected)',
  '--decimal comma|point   the decimal mark (default: detected where the cells decide it)',
  '--encoding E            utf-8, utf-16le, utf-16be or windows-1252 (default: detected)',
  '--sheet NAME            the workbook sheet (default: the first sheet with the named columns)',
  '--date-order dmy|mdy    how numeric dates such as 03/04/2026 are written',
  '--events                one row per nonconformity: group the rows into periods',
  '--period day|week|shift|lot  the period events are grouped by (with --events)',
  '--time COL              the timestamp (or lot) column of an event list',
  '--category COL          the nonconformity category column of an event list',
  '--shift-starts HH:MM,... shift start times for --period shift (default 06:00,14:00,22:00)',
  '--units-sheet NAME      a sheet listing each period with its units (the --units column)',
  '--units-file FILE       a second file listing each period with its units (the --units column)',
  '--units-key COL         the period column of the units sheet or file (default: the --time name)',
];

type FlagValues = { [name in keyof typeof importFlags]?: string | boolean | (string | boolean)[] };

function text(flags: FlagValues, name: keyof typeof importFlags): string | undefined {
  const value = flags[name];
  const last = Array.isArray(value) ? value[value.length - 1] : value;
  return typeof last === 'string' ? last : undefined;
}

function oneOf<T extends string>(
  flags: FlagValues,
  name: keyof typeof importFlags,
  allowed: readonly T[],
  findings: Finding[],
): T | undefined {
  const value = text(flags, name);
  if (value === undefined) return undefined;
  const chosen = allowed.find((option) => option === value.trim().toLowerCase());
  if (chosen === undefined) findings.push({ message: `--${name} ${value}: use ${allowed.join(' or ')}` });
  return chosen;
}

/** The import request a command's flags describe, or findings naming each flag that is wrong. */
export function importRequestFromFlags(flags: Record<string, unknown>): Result<ImportRequest> {
  const values = flags as FlagValues;
  const findings: Finding[] = [];
  const count = text(values, 'count');
  const events = values.events === true;
  if (count === undefined && !events) findings.push({ message: 'name the count column with --count COL' });
  const request: ImportRequest = { count: count ?? '' };
  for (const role of ['units', 'label', 'date'] as const) {
    const name = text(values, role);
    if (name !== undefined) request[role] = name;
  }
  const inspectionUnit = text(values, 'inspection-unit');
  if (inspectionUnit !== undefined) request.inspectionUnit = inspectionUnit;
  const delimiter = text(values, 'delimiter');
  if (delimiter !== undefined) {
    const character = delimiterNames[delimiter.toLowerCase()];
    if (character === undefined)
      findings.push({ message: `--delimiter ${delimiter}: use comma, semicolon, tab or pipe` });
    else request.delimiter = character;
  }
  const decimal = oneOf(values, 'decimal', ['comma', 'point'] as const, findings);
  if (decimal) request.decimal = decimal;
  const dateOrder = oneOf(values, 'date-order', ['dmy', 'mdy'] as const, findings);
  if (dateOrder) request.dateOrder = dateOrder;
  const encoding = text(values, 'encoding');
  if (encoding !== undefined) {
    const named = encodingFromName(encoding);
    if (named === null) findings.push({ message: `--encoding ${encoding}: use ${encodingNames.join(', ')}` });
    else request.encoding = named;
  }
  const sheet = text(values, 'sheet');
  if (sheet !== undefined) request.sheet = sheet;

  const period = oneOf(values, 'period', ['day', 'week', 'shift', 'lot'] as const, findings);
  const time = text(values, 'time');
  const category = text(values, 'category');
  const shifts = text(values, 'shift-starts');
  const unitsSheet = text(values, 'units-sheet');
  const unitsFile = text(values, 'units-file');
  const unitsKey = text(values, 'units-key');
  const eventsOnly = {
    'shift-starts': shifts,
    'units-sheet': unitsSheet,
    'units-file': unitsFile,
    'units-key': unitsKey,
  };
  if (events) {
    if (unitsSheet !== undefined && unitsFile !== undefined)
      findings.push({ message: 'give --units-sheet or --units-file, not both' });
    if ((unitsSheet !== undefined || unitsFile !== undefined) && request.units === undefined)
      findings.push({
        message: '--units-sheet and --units-file need --units COL, the units column of that table',
      });
    if (shifts !== undefined && period !== 'shift')
      findings.push({ message: '--shift-starts applies to --period shift' });
    if (period === undefined && text(values, 'period') === undefined)
      findings.push({ message: '--events needs --period day, week, shift or lot' });
    if (time === undefined)
      findings.push({ message: '--events needs --time COL (the timestamp or lot column)' });
    if (period !== undefined && time !== undefined) {
      const grouping: EventsRequest = { period, time };
      if (category !== undefined) grouping.category = category;
      if (shifts !== undefined) grouping.shiftStarts = shifts.split(',').map((start) => start.trim());
      if (unitsSheet !== undefined) grouping.unitsSheet = unitsSheet;
      if (unitsFile !== undefined) grouping.unitsFile = unitsFile;
      if (unitsKey !== undefined) grouping.unitsKey = unitsKey;
      request.events = grouping;
    }
  } else {
    const stray = Object.entries({ period: text(values, 'period'), time, category, ...eventsOnly })
      .filter(([, value]) => value !== undefined)
      .map(([flag]) => `--${flag}`);
    if (stray.length > 0)
      findings.push({ message: `${stray.join(', ')} describe an event list: add --events` });
  }
  return findings.length > 0 ? fail(...findings) : ok(request);
}
