import { createRequire } from 'node:module';
import type { Result } from '../../../shared-core/result.js';
import { fail, ok } from '../../../shared-core/result.js';
import type { Cell, DecodedTable, TableSource } from '../../../shared-core/import/decoded-table.js';
import { headerNames, locateHeader } from '../../../shared-core/import/header-row.js';
import { importLimits, type ImportLimits } from './import-limits.js';

export const delimiterNames: Record<string, string> = {
  comma: ',',
  semicolon: ';',
  tab: '\t',
  pipe: '|',
  ',': ',',
  ';': ';',
  '\t': '\t',
  '\\t': '\t',
  '|': '|',
};

const candidates = ['\t', ';', '|', ','] as const;

export const delimiterLabel = (delimiter: string) =>
  ({ ',': 'comma', ';': 'semicolon', '\t': 'tab', '|': 'pipe' })[delimiter] ?? delimiter;

// papaparse loads on first use: the one-pass reader takes most files without it.
let papa: typeof import('papaparse') | undefined;

function parse(text: string, delimiter: string, preview = 0) {
  papa ??= createRequire(import.meta.url)('papaparse') as typeof import('papaparse');
  return papa.parse<string[]>(text, { delimiter, preview, skipEmptyLines: false, newline: undefined });
}

const isBlankRecord = (record: string[]) => record.every((field) => field.trim() === '');

/**
 * The delimiter that splits the first records most consistently: the header and the rows below it
 * have the same number of fields, more than one. A header rarely holds a delimiter, so "1,5" in a
 * semicolon file does not make it comma-delimited. Ties go to tab, semicolon, pipe, then comma.
 */
export function detectDelimiter(text: string): string {
  return delimiterOfRecords((delimiter) => parse(text, delimiter, detectionRecords).data);
}

/** How many records of a text the delimiter detection reads. */
export const detectionRecords = 60;

/** The choice of `detectDelimiter`, given the first `detectionRecords` records split by each candidate. */
export function delimiterOfRecords(firstRecords: (delimiter: string) => string[][]): string {
  let best: { delimiter: string; score: number; fields: number } = { delimiter: ',', score: -1, fields: 0 };
  for (const delimiter of candidates) {
    const records = firstRecords(delimiter).filter((record) => !isBlankRecord(record));
    if (records.length === 0) continue;
    const counts = records.map((record) => record.length);
    const widest = Math.max(...counts);
    if (widest < 2) continue;
    const header = counts[0];
    const consistent = counts.filter((count) => count === header).length / counts.length;
    const score = header >= 2 ? consistent : consistent / 2;
    if (score > best.score || (score === best.score && widest > best.fields))
      best = { delimiter, score, fields: widest };
  }
  return best.delimiter;
}

export interface DelimitedOptions {
  delimiter?: string;
  /** Column names to look for when locating the header row. */
  headerNames?: string[];
  limits?: Partial<ImportLimits>;
}

/**
 * A table from delimited text (comma, semicolon, tab or pipe; quoted fields may hold delimiters and
 * line breaks). Each record is one spreadsheet row, numbered as a spreadsheet would number it.
 * Trailing blank lines are ignored; blank rows between data rows are listed; a record with an
 * unterminated quote is refused with its row.
 */
export function delimitedTable(
  text: string,
  file: string,
  source: Omit<TableSource, 'delimiter' | 'delimiterSource'>,
  options: DelimitedOptions = {},
): Result<DecodedTable> {
  const maxRows = options.limits?.maxRows ?? importLimits.maxRows;
  // A first line "sep=;" names the delimiter; spreadsheet programs hide it and number the rows
  // after it from 1, so it is taken off before numbering.
  const sepLine = /^sep=([,;\t|])\r?\n/.exec(text);
  if (sepLine) text = text.slice(sepLine[0].length);
  const delimiter = options.delimiter ?? sepLine?.[1] ?? detectDelimiter(text);
  const parsed = parse(text, delimiter);
  const records = parsed.data;
  while (records.length > 0 && isBlankRecord(records[records.length - 1])) records.pop();
  const quoteError = parsed.errors.find((error) => error.type === 'Quotes');
  if (quoteError) {
    return fail({
      file,
      row: (quoteError.row ?? 0) + 1,
      message: 'has a quoted field that is never closed (a " without its closing ")',
    });
  }
  const headerIndex = locateHeader(records, options.headerNames ?? []);
  if (records.length - headerIndex - 1 > maxRows) {
    return fail({
      file,
      message: `has more than ${maxRows.toLocaleString('en-US')} data rows; split the file`,
    });
  }
  const width = records[headerIndex]?.length ?? 0;
  const table: DecodedTable = {
    file,
    headerRow: headerIndex + 1,
    header: headerNames(records[headerIndex] ?? []),
    rows: [],
    source: { ...source, delimiter, delimiterSource: options.delimiter ? 'given' : 'detected' },
    notes: [],
    blankRows: [],
  };
  if (headerIndex > 0) {
    table.notes!.push({
      code: 'above-header',
      row: headerIndex + 1,
      message: `the header is on row ${headerIndex + 1}; rows 1 to ${headerIndex} above it are not read`,
    });
  }
  for (let i = headerIndex + 1; i < records.length; i++) {
    const record = records[i];
    if (isBlankRecord(record)) {
      table.blankRows!.push(i + 1);
      continue;
    }
    if (record.length > width && record.slice(width).some((field) => field.trim() !== '')) {
      table.notes!.push({
        code: 'extra-cells',
        row: i + 1,
        message: `has ${record.length} cells but the header has ${width}; the cells beyond the header are not read`,
      });
    }
    const cells: Cell[] = record.slice(0, width);
    table.rows.push({ row: i + 1, cells });
  }
  return ok(table);
}
