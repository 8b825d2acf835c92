import { resolveColumns, type ColumnMapping } from '../../../shared-core/import/column-mapping.js';
import type { TableSource } from '../../../shared-core/import/decoded-table.js';
import { chooseDecimalMark, type NumberCellText } from '../../../shared-core/import/decimal-mark.js';
import { findHeader, headerNames } from '../../../shared-core/import/header-row.js';
import type {
  ChangedCell,
  ImportOutcome,
  ImportReport,
  ImportWarning,
} from '../../../shared-core/import/import-report.js';
import type { ImportSettings } from '../../../shared-core/import/import-settings.js';
import { chooseDateOrder, isoDate, type DateOrderChoice } from '../../../shared-core/import/date-text.js';
import {
  dateGapWarnings,
  dateOrderWarnings,
  duplicateLabelWarnings,
} from '../../../shared-core/import/period-checks.js';
import { appendCapped } from '../../../shared-core/import/read-observations.js';
import type { Observation } from '../../../shared-core/study/analysis-types.js';
import { delimiterOfRecords, detectDelimiter, detectionRecords } from './delimited-table.js';
import type { ImportLimits } from './import-limits.js';

/** What the fast reader needs to know of a request: a plain table of rows, one period a row. */
export type FastRequest = ColumnMapping & ImportSettings & { delimiter?: string };

type TextSource = Omit<TableSource, 'delimiter' | 'delimiterSource'>;

/** A whole number as a spreadsheet writes it and as `String(number)` gives it back. */
const canonicalWhole = /^(?:0|[1-9]\d{0,14})$/;
/** A plain decimal with a point: "2.5", "0.125". */
const plainDecimal = /^\d{1,15}\.\d{1,15}$/;
const isoDay = /^\d{4}-\d{2}-\d{2}$/;
const delimiters = new Set([',', ';', '\t', '|']);

/** Thrown inside the reader to hand the file over to the general reader. */
class HandOver extends Error {}
const handOver = (): never => {
  throw new HandOver();
};

/**
 * The fields of one line. Plain fields, and quoted fields that hold no quote and no line break and
 * end right at a delimiter, are read here; anything else hands the file over.
 */
function splitLine(line: string, delimiter: string): string[] {
  if (line.indexOf('"') < 0) return line.split(delimiter);
  const fields: string[] = [];
  let start = 0;
  for (;;) {
    if (line.charCodeAt(start) === 34) {
      const close = line.indexOf('"', start + 1);
      if (close < 0) handOver();
      const after = close + 1;
      if (after < line.length && line[after] !== delimiter) handOver();
      fields.push(line.slice(start + 1, close));
      if (after >= line.length) return fields;
      start = after + 1;
      if (start === line.length) {
        fields.push('');
        return fields;
      }
    } else {
      const end = line.indexOf(delimiter, start);
      const field = end < 0 ? line.slice(start) : line.slice(start, end);
      if (field.indexOf('"') >= 0) handOver();
      fields.push(field);
      if (end < 0) return fields;
      start = end + 1;
      if (start === line.length) {
        fields.push('');
        return fields;
      }
    }
  }
}

const isBlankFields = (fields: string[]) => fields.every((field) => field.trim() === '');

/**
 * The value of text[from, to) when it is a whole number as `canonicalWhole` takes it, else -1: the
 * usual count or units cell is read without cutting it out of the text.
 */
function wholeAt(text: string, from: number, to: number): number {
  const length = to - from;
  if (length < 1 || length > 15) return -1;
  if (text.charCodeAt(from) === 48) return length === 1 ? 0 : -1;
  let value = 0;
  for (let i = from; i < to; i++) {
    const digit = text.charCodeAt(i) - 48;
    if (digit < 0 || digit > 9) return -1;
    value = value * 10 + digit;
  }
  return value;
}

/**
 * The wanted cells of one line (count, units, label), how many fields it has and whether one beyond
 * the header holds something. Reused from line to line: a line's other fields are never cut out,
 * and a count or units cell that is a plain whole number is read in place.
 */
class LineCells {
  /** Where each wanted cell starts and ends in the text (-1: the line is too short to have it). */
  private readonly starts: number[];
  private readonly ends: number[];
  /** The cells of a line split the careful way (quotes), or null for a line read in place. */
  private fieldsOfLine: (string | undefined)[] | null = null;
  fields = 0;
  extra = false;

  constructor(
    private readonly text: string,
    private readonly delimiter: string,
    private readonly width: number,
    private readonly columns: number[],
  ) {
    this.starts = columns.map(() => -1);
    this.ends = columns.map(() => -1);
  }

  /** A line without quotes, from `start` to `end` (its break excluded). */
  scan(start: number, end: number): void {
    const { text, delimiter, width, columns, starts, ends } = this;
    this.fieldsOfLine = null;
    starts[0] = starts[1] = starts[2] = starts[3] = -1;
    this.extra = false;
    let index = 0;
    let from = start;
    for (;;) {
      let to = text.indexOf(delimiter, from);
      if (to < 0 || to > end) to = end;
      const wanted =
        index === columns[0]
          ? 0
          : index === columns[1]
            ? 1
            : index === columns[2]
              ? 2
              : index === columns[3]
                ? 3
                : -1;
      if (wanted >= 0) {
        starts[wanted] = from;
        ends[wanted] = to;
      } else if (index >= width && !this.extra && text.slice(from, to).trim() !== '') this.extra = true;
      index++;
      if (to === end) break;
      from = to + 1;
    }
    this.fields = index;
  }

  /** A line with a quote: split field by field (or handed over). */
  split(start: number, end: number): void {
    const fields = splitLine(this.text.slice(start, end), this.delimiter);
    this.fieldsOfLine = this.columns.map((column) => fields[column]);
    this.fields = fields.length;
    this.extra = fields.length > this.width && !isBlankFields(fields.slice(this.width));
  }

  /** The text of wanted cell `k` (0 count, 1 units, 2 label, 3 date), or undefined when the line is short. */
  cell(k: number): string | undefined {
    if (this.fieldsOfLine !== null) return this.fieldsOfLine[k];
    return this.starts[k] < 0 ? undefined : this.text.slice(this.starts[k], this.ends[k]);
  }

  /** The value of wanted cell `k` when it is a plain whole number as written, else -1. */
  whole(k: number): number {
    if (this.fieldsOfLine !== null) {
      const cell = this.fieldsOfLine[k];
      return cell !== undefined && canonicalWhole.test(cell) ? Number(cell) : -1;
    }
    return this.starts[k] < 0 ? -1 : wholeAt(this.text, this.starts[k], this.ends[k]);
  }
}

/**
 * The line break of the text as the general reader would take it: "\n" when there is no "\r",
 * "\r\n" when every break is one; null (hand over) for "\r" alone or a mix.
 */
function lineBreak(text: string): '\n' | '\r\n' | null {
  if (text.indexOf('\r') < 0) return '\n';
  let returns = 0;
  let pairs = 0;
  let newlines = 0;
  for (let i = 0; i < text.length; i++) {
    const code = text.charCodeAt(i);
    if (code === 13) {
      returns++;
      if (text.charCodeAt(i + 1) === 10) pairs++;
    } else if (code === 10) newlines++;
  }
  return returns === pairs && newlines === pairs ? '\r\n' : null;
}

/**
 * The delimiter the general reader would detect, without parsing the whole text to find it: the
 * first records of a text without quotes are its first lines split at the candidate.
 */
function detectedDelimiter(text: string, newline: string): string {
  let end = -1;
  for (let i = 0; i < detectionRecords; i++) {
    end = text.indexOf(newline, end + 1);
    if (end < 0) {
      end = text.length;
      break;
    }
  }
  const head = text.slice(0, end);
  if (head.indexOf('"') >= 0) return detectDelimiter(text);
  const lines = head.split(newline).slice(0, detectionRecords);
  return delimiterOfRecords((delimiter) => lines.map((line) => line.split(delimiter)));
}

/**
 * The import outcome of the common delimited file in one pass over its text, or null when the file
 * needs the general reader (papaparse, then `readObservations`). The outcome is the general reader's
 * to the byte: the same periods, report, settings and warnings, in the same order; the property test
 * `import-fast-reader` compares the two on generated files.
 *
 * Taken here: UTF-8 or any text `decodeText` gave, "\n" or "\r\n" breaks, the header on the first
 * line, plain or simply quoted fields, counts written as plain whole numbers, units as whole numbers
 * or plain decimals with a point, labels as any text, dates as yyyy-mm-dd, blank rows, cells beyond
 * the header. Handed over: a `sep=` line, titles above the header, other dates, a cell that is
 * blank, negative, not a plain number or otherwise rejected, decimal commas, thousands separators,
 * quotes the rules above do not cover, too many rows.
 */
export function fastDelimitedOutcome(
  text: string,
  file: string,
  source: TextSource,
  request: FastRequest,
  limits: ImportLimits,
): ImportOutcome | null {
  try {
    return readFast(text, file, source, request, limits);
  } catch (error) {
    if (error instanceof HandOver) return null;
    throw error;
  }
}

function readFast(
  text: string,
  file: string,
  source: TextSource,
  request: FastRequest,
  limits: ImportLimits,
): ImportOutcome | null {
  const { count, units, label, date, decimal: givenDecimal, inspectionUnit } = request;
  // papaparse drops a leading U+FEFF; a text that still has one after decoding goes the general way.
  if (text.startsWith('sep=') || text.charCodeAt(0) === 0xfeff) return null;
  if (request.delimiter !== undefined && !delimiters.has(request.delimiter)) return null;
  const newline = lineBreak(text);
  if (newline === null) return null;
  const delimiter = request.delimiter ?? detectedDelimiter(text, newline);

  const firstEnd = text.indexOf(newline);
  const headerFields = splitLine(firstEnd < 0 ? text : text.slice(0, firstEnd), delimiter);
  const names = [count, units, label, date].filter(
    (name): name is string => typeof name === 'string' && name !== '',
  );
  if (findHeader([headerFields], names) !== 0) return null;
  const header = headerNames(headerFields);
  const resolved = resolveColumns(file, 1, header, { count, units, label, date });
  if (!resolved.ok) return null;
  const { columns } = resolved;
  const width = headerFields.length;
  const countAt = columns.count;
  const unitsAt = columns.units;
  const labelAt = columns.label;
  const dateAt = columns.date;
  // A column that is both label and date goes the general way (one cell, two readings).
  if (dateAt !== undefined && dateAt === labelAt) return null;

  const observations: Observation[] = [];
  const noProduction: Observation[] = [];
  const changedCells: ChangedCell[] = [];
  const notes: ImportWarning[] = [];
  const blankRows: number[] = [];
  const blankLabelRows: number[] = [];
  const pointCells: NumberCellText[] = [];
  let pendingBlank: number[] = [];
  let rowsRead = 0;
  let row = 1;
  let start = firstEnd < 0 ? text.length : firstEnd + newline.length;
  const step = newline.length;

  const cells = new LineCells(text, delimiter, width, [countAt, unitsAt ?? -1, labelAt ?? -1, dateAt ?? -1]);
  let nextQuote = text.indexOf('"', start);
  while (start < text.length) {
    let end = text.indexOf(newline, start);
    if (end < 0) end = text.length;
    if (nextQuote >= 0 && nextQuote < start) nextQuote = text.indexOf('"', start);
    if (nextQuote >= 0 && nextQuote < end) cells.split(start, end);
    else cells.scan(start, end);
    const lineStart = start;
    start = end + step;
    row++;
    let countValue = cells.whole(0);
    if (countValue < 0) {
      const countText = cells.cell(0);
      if (isBlankFields(splitLine(text.slice(lineStart, end), delimiter))) {
        pendingBlank.push(row);
        continue;
      }
      const trimmed = countText?.trim();
      if (trimmed === undefined || !canonicalWhole.test(trimmed)) return null;
      countValue = Number(trimmed);
    }
    if (pendingBlank.length > 0) {
      for (const blank of pendingBlank) blankRows.push(blank);
      pendingBlank = [];
    }
    rowsRead++;
    // The general reader counts the blank rows between data rows against the limit too.
    if (row - 1 > limits.maxRows) return null;
    if (cells.extra) {
      notes.push({
        code: 'extra-cells',
        row,
        message: `has ${cells.fields} cells but the header has ${width}; the cells beyond the header are not read`,
      });
    }

    let unitsValue = 1;
    if (unitsAt !== undefined) {
      unitsValue = cells.whole(1);
      if (unitsValue < 0) {
        const unitsText = cells.cell(1);
        if (unitsText === undefined) return null;
        const trimmed = unitsText.trim();
        if (canonicalWhole.test(trimmed)) unitsValue = Number(trimmed);
        else if (plainDecimal.test(trimmed)) {
          unitsValue = Number(trimmed);
          pointCells.push({ row, column: header[unitsAt], text: trimmed });
          const written = String(unitsValue);
          if (written !== trimmed)
            changedCells.push({ row, column: header[unitsAt], from: unitsText, to: written });
        } else return null;
      }
      // 0 units with nonconformities counted is a rejection: the general reader words it.
      if (unitsValue === 0 && countValue !== 0) return null;
    }

    let labelText = '';
    if (labelAt !== undefined) {
      const cell = cells.cell(2);
      if (cell !== undefined) labelText = cell.trim();
      if (labelText === '') blankLabelRows.push(row);
    }
    let dateText: string | undefined;
    if (dateAt !== undefined) {
      dateText = cells.cell(3)?.trim();
      // Only ISO dates as the general reader writes them back (yyyy-mm-dd, a real day): no change.
      if (dateText === undefined || !isoDay.test(dateText)) return null;
      const resolved = isoDate(
        Number(dateText.slice(0, 4)),
        Number(dateText.slice(5, 7)),
        Number(dateText.slice(8)),
        undefined,
      );
      if (!('date' in resolved) || resolved.date !== dateText) return null;
    }
    const observation: Observation = {
      label: labelText === '' ? `#${row}` : labelText,
      row,
      count: countValue,
      units: unitsValue,
    };
    if (dateText !== undefined) observation.date = dateText;
    (unitsValue === 0 ? noProduction : observations).push(observation);
  }

  const decimal = chooseDecimalMark(pointCells, givenDecimal, delimiter);
  if (decimal.kind !== 'chosen' || (pointCells.length > 0 && decimal.decimal !== 'point')) return null;

  const warnings: ImportWarning[] = [];
  appendCapped(warnings, notes);
  if (labelAt !== undefined) {
    const column = header[labelAt];
    appendCapped(warnings, duplicateLabels(observations.concat(noProduction), column));
    if (blankLabelRows.length > 0) {
      const rows = blankLabelRows;
      const shown = rows.slice(0, 10).join(', ') + (rows.length > 10 ? `, and ${rows.length - 10} more` : '');
      appendCapped(warnings, [
        {
          code: 'blank-label',
          column,
          message: `rows ${shown} have no label; they are labelled by their row (#ROW)`,
        },
      ]);
    }
  }

  let order: DateOrderChoice | undefined;
  if (dateAt !== undefined) {
    // Every date is ISO, so the order is what the general reader chooses for no numeric date.
    order = chooseDateOrder([], request.dateOrder);
    if (order.kind !== 'chosen') return null;
    const column = header[dateAt];
    const inFileOrder = observations.concat(noProduction).sort((a, b) => a.row - b.row);
    appendCapped(warnings, dateOrderWarnings(inFileOrder, column));
    observations.sort(byDateThenRow);
    noProduction.sort(byDateThenRow);
    appendCapped(warnings, dateGapWarnings(observations.concat(noProduction).sort(byDateThenRow), column));
  }

  const rejected: ImportOutcome['rejected'] = [];
  const report: ImportReport = {
    file,
    location: file,
    sha256: source.sha256,
    bytes: source.bytes,
    rowsRead,
    accepted: observations.length,
    rejectedRows: 0,
    noProduction: noProduction.length,
    blankRows,
    rejected,
    changedCells,
    settings: {
      mapping: { count, units, label, date },
      decimal: decimal.decimal,
      decimalSource: decimal.source,
      decimalReason: decimal.reason,
      ...(order?.kind !== 'chosen'
        ? {}
        : { dateOrder: order.order, dateOrderSource: order.source, dateOrderReason: order.reason }),
      ...(inspectionUnit === undefined ? {} : { inspectionUnit }),
      format: source.format,
      encoding: source.encoding,
      encodingSource: source.encodingSource,
      delimiter,
      delimiterSource: request.delimiter ? 'given' : 'detected',
      headerRow: 1,
    },
    warnings,
  };
  return { observations, rejected, noProduction, report };
}

/** Date order, then file order among periods of the same date (as the general reader sorts). */
function byDateThenRow(a: Observation, b: Observation): number {
  if (a.date !== b.date) return (a.date ?? '') < (b.date ?? '') ? -1 : 1;
  return a.row - b.row;
}

/**
 * The duplicate-label warnings, worked out only for the labels that repeat (most files have none):
 * sorted labels put repeats side by side, and sorting is quicker than a set of 100,000 labels.
 */
function duplicateLabels(periods: Observation[], column: string): ImportWarning[] {
  const labels = periods.map((period) => period.label).sort();
  let repeated: Set<string> | undefined;
  for (let i = 1; i < labels.length; i++)
    if (labels[i] === labels[i - 1]) (repeated ??= new Set()).add(labels[i]);
  if (repeated === undefined) return [];
  return duplicateLabelWarnings(
    periods.filter((period) => repeated.has(period.label)),
    column,
  );
}
