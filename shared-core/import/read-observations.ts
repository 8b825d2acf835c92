import type { Result } from '../result.js';
import { fail, ok } from '../result.js';
import type { Observation } from '../study/analysis-types.js';
import type { ColumnMapping, ResolvedColumns } from './column-mapping.js';
import { resolveColumns } from './column-mapping.js';
import type { Cell, DecodedTable } from './decoded-table.js';
import { cellText, isBlankCell } from './decoded-table.js';
import type { DateCellText } from './date-text.js';
import { chooseDateOrder, dateParts, resolveDate } from './date-text.js';
import type { NumberCellText } from './decimal-mark.js';
import { chooseDecimalMark } from './decimal-mark.js';
import type { ChangedCell, ImportOutcome, ImportReport, ImportWarning, Rejection } from './import-report.js';
import type { ImportSettings } from './import-settings.js';
import type { DecimalMark } from './number-text.js';
import { parseNumberText } from './number-text.js';
import { dateGapWarnings, dateOrderWarnings, duplicateLabelWarnings } from './period-checks.js';

type CellReading = { value: number; changed?: string } | { rejection: string };

const blankMessage = 'the cell is blank; a blank is never read as 0';

/** A number cell as written: a workbook number as is, text under the decimal mark. */
function readNumber(cell: Cell, decimal: DecimalMark): CellReading {
  if (typeof cell === 'number') return { value: cell === 0 ? 0 : cell };
  if (typeof cell === 'boolean') return { rejection: 'is a true/false value, not a number' };
  if (cell instanceof Date) return { rejection: 'is a date, not a number' };
  const text = (cell ?? '').trim();
  const value = parseNumberText(text, decimal);
  if (value === null) return { rejection: 'is not a number' };
  if (value === 0) return text === '0' ? { value: 0 } : { value: 0, changed: '0' }; // "-0" and "0.0" are 0
  return String(value) === text ? { value } : { value, changed: String(value) };
}

/** A count of nonconformities: a whole number, 0 or more. */
export function readCount(cell: Cell, decimal: DecimalMark): CellReading {
  if (isBlankCell(cell)) return { rejection: blankMessage };
  const reading = readNumber(cell, decimal);
  if ('rejection' in reading) return reading;
  if (!Number.isFinite(reading.value)) return { rejection: 'is not a finite number' };
  if (reading.value < 0) return { rejection: 'is negative; a count of nonconformities is 0 or more' };
  if (!Number.isInteger(reading.value)) {
    // A workbook formula such as =A2*0.1*10 stores 2.9999999999999996 for 3: binary rounding, not a
    // fraction anyone counted. Such a cell is read as the whole number and listed as changed.
    const whole = Math.round(reading.value);
    if (typeof cell === 'number' && Math.abs(reading.value - whole) <= 1e-9 * Math.max(1, whole)) {
      return { value: whole, changed: String(whole) };
    }
    return { rejection: 'is not a whole number of nonconformities' };
  }
  return reading;
}

/** A number of inspection units: positive and finite (0 only marks a period without production). */
export function readUnits(cell: Cell, decimal: DecimalMark): CellReading {
  if (isBlankCell(cell)) return { rejection: blankMessage };
  const reading = readNumber(cell, decimal);
  if ('rejection' in reading) return reading;
  if (!Number.isFinite(reading.value)) return { rejection: 'is not a finite number of inspection units' };
  if (reading.value < 0) return { rejection: 'is negative; the inspection units must be more than 0' };
  return reading;
}

/**
 * Validated periods from a decoded table. Every data row ends up accepted, rejected (one line per
 * bad cell, all of them) or "no production" (0 units and a blank or 0 count: kept on record, not
 * analysed). Settings not stated are detected where the cells decide them (the decimal mark, the
 * date order) and asked otherwise: an ambiguous table fails with a finding that says what to state.
 *
 * No units column means one inspection unit per period (a c chart of counts per period); no label
 * column labels each period `#ROW` by its spreadsheet row.
 */
export function readObservations(
  table: DecodedTable,
  mapping: ColumnMapping,
  settings: ImportSettings = {},
): Result<ImportOutcome> {
  const file = sourceLocation(table);
  const resolved = resolveColumns(file, table.headerRow, table.header, mapping);
  if (!resolved.ok) return fail(...resolved.findings);
  const { columns } = resolved;
  const name = (index: number) => table.header[index];

  const decimal = chooseDecimalMark(numberCells(table, columns), settings.decimal, table.source?.delimiter);
  if (decimal.kind !== 'chosen') {
    if (decimal.kind === 'mixed') return fail({ file, message: decimal.message });
    const { row, column, text } = decimal.example;
    return fail({ file, row, column, value: text, message: decimal.message });
  }
  const dateCells: DateCellText[] =
    columns.date === undefined
      ? []
      : table.rows
          .filter((row) => !isBlankCell(row.cells[columns.date!] ?? null))
          .map((row) => {
            const cell = row.cells[columns.date!] ?? null;
            return {
              row: row.row,
              column: name(columns.date!),
              text: cellText(cell),
              parts: dateParts(cell),
            };
          });
  const order = chooseDateOrder(dateCells, settings.dateOrder);
  const partsByRow = new Map(dateCells.map((cell) => [cell.row, cell.parts]));
  if (order.kind !== 'chosen') {
    if (order.kind === 'mixed') return fail({ file, column: order.dmy.column, message: order.message });
    const { row, column, text } = order.example;
    return fail({ file, row, column, value: text, message: order.message });
  }

  const observations: Observation[] = [];
  const noProduction: Observation[] = [];
  const rejected: Rejection[] = [];
  const changedCells: ChangedCell[] = [];
  let rejectedRows = 0;
  for (const { row, cells } of table.rows) {
    const cell = (index: number | undefined): Cell => (index === undefined ? null : (cells[index] ?? null));
    const problems: Rejection[] = [];
    const changes: ChangedCell[] = [];
    const take = (index: number, reading: CellReading): number | undefined => {
      const written = cellText(cell(index));
      if ('rejection' in reading) {
        problems.push({
          row,
          column: name(index),
          value: written.trim() === '' ? '' : written,
          message: reading.rejection,
        });
        return undefined;
      }
      if (reading.changed !== undefined)
        changes.push({ row, column: name(index), from: written, to: reading.changed });
      return reading.value;
    };

    const unitsCell = cell(columns.units);
    const countCell = cell(columns.count);
    const unitsReading = columns.units === undefined ? { value: 1 } : readUnits(unitsCell, decimal.decimal);
    const idle =
      'value' in unitsReading &&
      unitsReading.value === 0 &&
      (isBlankCell(countCell) || parseNumberText(cellText(countCell), decimal.decimal) === 0);
    const count = idle ? 0 : take(columns.count, readCount(countCell, decimal.decimal));
    const units = columns.units === undefined ? 1 : take(columns.units, unitsReading);
    if (!idle && units === 0) {
      problems.push({
        row,
        column: name(columns.units!),
        value: cellText(unitsCell),
        message: 'is not a positive number of inspection units (0 units with nonconformities counted)',
      });
    }

    let date: string | undefined;
    if (columns.date !== undefined) {
      const dateCell = cell(columns.date);
      if (isBlankCell(dateCell)) {
        problems.push({ row, column: name(columns.date), value: '', message: 'the date is blank' });
      } else {
        const resolvedDate = resolveDate(partsByRow.get(row) ?? dateParts(dateCell), order.order);
        if ('message' in resolvedDate) {
          problems.push({
            row,
            column: name(columns.date),
            value: cellText(dateCell),
            message: resolvedDate.message,
          });
        } else {
          date = resolvedDate.date;
          const written = cellText(dateCell).trim();
          if (typeof dateCell === 'string' && written !== date)
            changes.push({ row, column: name(columns.date), from: written, to: date });
        }
      }
    }
    const labelText = columns.label === undefined ? '' : cellText(cell(columns.label)).trim();
    const label = labelText === '' ? `#${row}` : (dateLabel(cell(columns.label)) ?? labelText);

    if (problems.length > 0) {
      for (const problem of problems) rejected.push(problem);
      rejectedRows++;
      continue;
    }
    for (const change of changes) changedCells.push(change);
    const observation: Observation = { label, row, count: count!, units: units! };
    if (date !== undefined) observation.date = date;
    (idle ? noProduction : observations).push(observation);
  }

  const warnings: ImportWarning[] = [];
  const warn = (list: ImportWarning[]) => appendCapped(warnings, list);
  warn((table.notes ?? []).map((note) => ({ ...note })));
  if (columns.label !== undefined) {
    warn(duplicateLabelWarnings(observations.concat(noProduction), name(columns.label)));
    warn(blankLabelWarnings(table, columns, name(columns.label)));
  }
  if (columns.date !== undefined) {
    const inFileOrder = observations.concat(noProduction).sort((a, b) => a.row - b.row);
    warn(dateOrderWarnings(inFileOrder, name(columns.date)));
    observations.sort(byDateThenRow);
    noProduction.sort(byDateThenRow);
    warn(dateGapWarnings(observations.concat(noProduction).sort(byDateThenRow), name(columns.date)));
  }
  warn(
    table.rows
      .filter((row) => row.hidden)
      .map((row) => ({
        code: 'hidden-row',
        row: row.row,
        message: 'the row is hidden in the workbook; it is read like any other row',
      })),
  );

  const source = table.source;
  const report: ImportReport = {
    file: table.file,
    location: file,
    sha256: source?.sha256 ?? null,
    bytes: source?.bytes ?? null,
    rowsRead: table.rows.length,
    accepted: observations.length,
    rejectedRows,
    noProduction: noProduction.length,
    blankRows: table.blankRows ?? [],
    rejected,
    changedCells,
    settings: {
      mapping: { ...mapping },
      decimal: decimal.decimal,
      decimalSource: decimal.source,
      decimalReason: decimal.reason,
      ...(columns.date === undefined
        ? {}
        : { dateOrder: order.order, dateOrderSource: order.source, dateOrderReason: order.reason }),
      ...(settings.inspectionUnit === undefined ? {} : { inspectionUnit: settings.inspectionUnit }),
      ...(source === undefined
        ? {}
        : {
            format: source.format,
            encoding: source.encoding,
            encodingSource: source.encodingSource,
            delimiter: source.delimiter,
            delimiterSource: source.delimiterSource,
          }),
      ...(table.sheet === undefined ? {} : { sheet: table.sheet }),
      headerRow: table.headerRow,
    },
    warnings,
  };
  return ok({ observations, rejected, noProduction, report });
}

/** Warnings of one kind beyond this many are summed up in one line (rejections never are). */
export const warningsPerCode = 20;

/**
 * Appends warnings, keeping the first `warningsPerCode` of each code and one line that counts the
 * rest, so that a reversed million-row file gives a readable report.
 */
export function appendCapped(warnings: ImportWarning[], more: ImportWarning[]): void {
  const kept = new Map<string, number>();
  for (const warning of warnings) kept.set(warning.code, (kept.get(warning.code) ?? 0) + 1);
  const over = new Map<string, number>();
  for (const warning of more) {
    const count = kept.get(warning.code) ?? 0;
    if (count < warningsPerCode) {
      warnings.push(warning);
      kept.set(warning.code, count + 1);
    } else over.set(warning.code, (over.get(warning.code) ?? 0) + 1);
  }
  for (const [code, count] of over) {
    warnings.push({ code, message: `and ${count} more like the ${warningsPerCode} above (${code})` });
  }
}

/** The file, and the sheet of a workbook, as messages name them: `h.xlsx, sheet "Line 4"`. */
export function sourceLocation(table: DecodedTable): string {
  return table.sheet === undefined ? table.file : `${table.file}, sheet "${table.sheet}"`;
}

function byDateThenRow(a: Observation, b: Observation): number {
  if (a.date !== b.date) return (a.date ?? '') < (b.date ?? '') ? -1 : 1;
  return a.row - b.row;
}

/** A workbook date used as a label reads as its ISO date, not as a JavaScript date string. */
function dateLabel(cell: Cell): string | undefined {
  if (!(cell instanceof Date)) return undefined;
  const resolved = resolveDate(dateParts(cell), undefined);
  return 'date' in resolved ? resolved.date : undefined;
}

function blankLabelWarnings(table: DecodedTable, columns: ResolvedColumns, column: string): ImportWarning[] {
  const rows = table.rows
    .filter((row) => isBlankCell(row.cells[columns.label!] ?? null))
    .map((row) => row.row);
  if (rows.length === 0) return [];
  const shown = rows.slice(0, 10).join(', ') + (rows.length > 10 ? `, and ${rows.length - 10} more` : '');
  return [
    {
      code: 'blank-label',
      column,
      message: `rows ${shown} have no label; they are labelled by their row (#ROW)`,
    },
  ];
}

function numberCells(table: DecodedTable, columns: ResolvedColumns): NumberCellText[] {
  const cells: NumberCellText[] = [];
  for (const index of [columns.count, columns.units]) {
    if (index === undefined) continue;
    for (const row of table.rows) {
      const cell = row.cells[index];
      // Only cells with a point or a comma can tell the decimal mark.
      if (typeof cell === 'string' && (cell.includes(',') || cell.includes('.')))
        cells.push({ row: row.row, column: table.header[index], text: cell.trim() });
    }
  }
  return cells;
}
