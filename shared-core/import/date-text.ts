import type { Cell } from './decoded-table.js';

export type DateOrder = 'dmy' | 'mdy';

/** A date cell split into its parts; `first`/`second` are day and month in an order still to choose. */
export type DateParts =
  | { kind: 'iso'; year: number; month: number; day: number; time?: string }
  | { kind: 'numeric'; first: number; second: number; year: number; time?: string }
  | { kind: 'invalid'; message: string };

const iso = /^(\d{4})[-/](\d{1,2})[-/](\d{1,2})(?:[T ](\d{1,2}:\d{2}(?::\d{2})?))?$/;
const numeric = /^(\d{1,2})([/.-])(\d{1,2})\2(\d{2,4})(?:[T ](\d{1,2}:\d{2}(?::\d{2})?))?$/;

const pad = (value: number, width = 2) => String(value).padStart(width, '0');

/**
 * The parts of a date cell. Workbook dates arrive as Date objects holding the wall-clock value in
 * UTC (that is how the workbook reader builds them), text dates as ISO `2026-04-03` or as numeric
 * day and month with a four-digit year (`03/04/2026`, `3.4.2026`).
 */
export function dateParts(cell: Cell): DateParts {
  if (cell instanceof Date) {
    if (Number.isNaN(cell.getTime())) return { kind: 'invalid', message: 'is not a valid date' };
    const seconds = cell.getUTCHours() * 3600 + cell.getUTCMinutes() * 60 + cell.getUTCSeconds();
    const time =
      seconds === 0
        ? undefined
        : `${pad(cell.getUTCHours())}:${pad(cell.getUTCMinutes())}:${pad(cell.getUTCSeconds())}`;
    return {
      kind: 'iso',
      year: cell.getUTCFullYear(),
      month: cell.getUTCMonth() + 1,
      day: cell.getUTCDate(),
      time,
    };
  }
  if (typeof cell === 'number') {
    return {
      kind: 'invalid',
      message: 'is a number, not a date (format the cell as a date, or write it as yyyy-mm-dd)',
    };
  }
  if (typeof cell !== 'string') return { kind: 'invalid', message: 'is not a date' };
  const text = cell.trim();
  const isoMatch = iso.exec(text);
  if (isoMatch) {
    const [, year, month, day, time] = isoMatch;
    return {
      kind: 'iso',
      year: Number(year),
      month: Number(month),
      day: Number(day),
      time: normalTime(time),
    };
  }
  const numericMatch = numeric.exec(text);
  if (numericMatch) {
    const [, first, , second, year, time] = numericMatch;
    if (year.length !== 4)
      return { kind: 'invalid', message: 'has a two-digit year: write the year in full' };
    return {
      kind: 'numeric',
      first: Number(first),
      second: Number(second),
      year: Number(year),
      time: normalTime(time),
    };
  }
  return {
    kind: 'invalid',
    message: 'is not a date (write it as yyyy-mm-dd, or dd/mm/yyyy with --date-order)',
  };
}

function normalTime(time: string | undefined): string | undefined {
  if (time === undefined) return undefined;
  const [hours, minutes, seconds = '0'] = time.split(':');
  if (Number(hours) === 0 && Number(minutes) === 0 && Number(seconds) === 0) return undefined;
  return `${pad(Number(hours))}:${minutes}:${pad(Number(seconds))}`;
}

const monthLengths = [31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31];

/** Gregorian calendar: February has 29 days in years divisible by 4, except centuries not divisible by 400. */
function daysInMonth(year: number, month: number): number {
  const leap = (year % 4 === 0 && year % 100 !== 0) || year % 400 === 0;
  return month === 2 && leap ? 29 : monthLengths[month - 1];
}

/** The ISO date (or date-time) of valid parts, or a message saying what is wrong. */
export function isoDate(
  year: number,
  month: number,
  day: number,
  time: string | undefined,
): { date: string } | { message: string } {
  if (month < 1 || month > 12) return { message: `has no month ${month}` };
  if (day < 1 || day > daysInMonth(year, month)) return { message: `has no day ${day} in that month` };
  if (time !== undefined) {
    const [hours, minutes, seconds] = time.split(':').map(Number);
    if (hours > 23 || minutes > 59 || seconds > 59) return { message: `has no time ${time}` };
  }
  const date = `${pad(year, 4)}-${pad(month)}-${pad(day)}`;
  return { date: time === undefined ? date : `${date}T${time}` };
}

/** The ISO date of parts under a date order (numeric parts need one). */
export function resolveDate(
  parts: DateParts,
  order: DateOrder | undefined,
): { date: string } | { message: string } {
  if (parts.kind === 'invalid') return { message: parts.message };
  if (parts.kind === 'iso') return isoDate(parts.year, parts.month, parts.day, parts.time);
  if (order === undefined) return { message: 'needs a date order (--date-order dmy or --date-order mdy)' };
  const [day, month] = order === 'dmy' ? [parts.first, parts.second] : [parts.second, parts.first];
  return isoDate(parts.year, month, day, parts.time);
}

export interface DateCellText {
  row: number;
  column: string;
  text: string;
  parts: DateParts;
}

export type DateOrderChoice =
  | { kind: 'chosen'; order: DateOrder | undefined; source: 'given' | 'detected' | 'none'; reason: string }
  | { kind: 'ambiguous'; example: DateCellText; message: string }
  | { kind: 'mixed'; dmy: DateCellText; mdy: DateCellText; message: string };

const monthNames = [
  'January',
  'February',
  'March',
  'April',
  'May',
  'June',
  'July',
  'August',
  'September',
  'October',
  'November',
  'December',
];

/**
 * The order of day and month in a column of numeric dates. A cell with a first part above 12 can
 * only be day-first, one with a second part above 12 only month-first; a column where every cell
 * reads both ways (03/04/2026) is asked, never guessed.
 */
export function chooseDateOrder(cells: DateCellText[], given: DateOrder | undefined): DateOrderChoice {
  if (given) return { kind: 'chosen', order: given, source: 'given', reason: 'stated by the user' };
  let dmy: DateCellText | undefined;
  let mdy: DateCellText | undefined;
  let ambiguous: DateCellText | undefined;
  for (const cell of cells) {
    const { parts } = cell;
    if (parts.kind !== 'numeric') continue;
    if (parts.first > 12 && parts.second <= 12) dmy ??= cell;
    else if (parts.second > 12 && parts.first <= 12) mdy ??= cell;
    else if (parts.first <= 12 && parts.second <= 12 && parts.first !== parts.second) ambiguous ??= cell;
  }
  if (dmy && mdy) {
    return {
      kind: 'mixed',
      dmy,
      mdy,
      message:
        `row ${dmy.row} ("${dmy.text}") is written day first and row ${mdy.row} ("${mdy.text}") month first: ` +
        'state the date order (--date-order dmy or --date-order mdy)',
    };
  }
  const where = (cell: DateCellText) => `row ${cell.row}, column "${cell.column}": "${cell.text}"`;
  if (dmy) return { kind: 'chosen', order: 'dmy', source: 'detected', reason: `day first in ${where(dmy)}` };
  if (mdy)
    return { kind: 'chosen', order: 'mdy', source: 'detected', reason: `month first in ${where(mdy)}` };
  if (ambiguous && ambiguous.parts.kind === 'numeric') {
    const { first, second } = ambiguous.parts;
    return {
      kind: 'ambiguous',
      example: ambiguous,
      message:
        `could be ${first} ${monthNames[second - 1]} or ${monthNames[first - 1]} ${second}: ` +
        'state the date order (--date-order dmy or --date-order mdy)',
    };
  }
  const anyNumeric = cells.some((cell) => cell.parts.kind === 'numeric');
  return anyNumeric
    ? {
        kind: 'chosen',
        order: 'dmy',
        source: 'detected',
        reason: 'day and month are equal in every numeric date',
      }
    : { kind: 'chosen', order: undefined, source: 'none', reason: 'no numeric dates' };
}
