import type { Result } from '../result.js';
import { fail, ok } from '../result.js';
import type { Observation } from '../study/analysis-types.js';
import { resolveColumns } from './column-mapping.js';
import type { Cell, DecodedTable } from './decoded-table.js';
import { cellText, isBlankCell } from './decoded-table.js';
import type { DateCellText } from './date-text.js';
import { chooseDateOrder, dateParts, resolveDate } from './date-text.js';
import { chooseDecimalMark } from './decimal-mark.js';
import type { ChangedCell, ImportOutcome, ImportReport, ImportWarning, Rejection } from './import-report.js';
import type { ImportSettings } from './import-settings.js';
import type { PeriodKey } from './period-key.js';
import { dayKey, defaultShiftStarts, shiftKey, shiftStartMinutes, weekKey } from './period-key.js';
import { appendCapped, readCount, readUnits, sourceLocation } from './read-observations.js';

export type EventPeriod = 'lot' | 'shift' | 'day' | 'week';

/** The columns of an event list: one row per nonconformity (or per batch of them, with a count). */
export interface EventMapping {
  /** The timestamp of each event (day, week, shift) or its lot. */
  time: string;
  category?: string;
  /** Nonconformities the row records; without it each row is one nonconformity. */
  count?: string;
  /** Inspection units of the row's period, repeated on each row (instead of a units table). */
  units?: string;
}

/** A second table (or sheet) giving each period's inspection units, zero-event periods included. */
export interface UnitsTable {
  table: DecodedTable;
  /** The column that names the period: a lot, or a date or date-time within the period. */
  key: string;
  units: string;
}

export interface EventSettings extends ImportSettings {
  period: EventPeriod;
  /** Shift start times (HH:MM); three eight-hour shifts from 06:00 when left out. */
  shiftStarts?: string[];
  unitsTable?: UnitsTable;
}

export const uncategorized = '(no category)';

interface PeriodBuild {
  key: PeriodKey;
  count: number;
  rows: number[];
  units?: { value: number; row: number };
  categories: Map<string, number>;
  unitsRow?: number;
}

/**
 * Periods from an event list: each row is one nonconformity (or `count` of them) with its timestamp
 * or lot and, optionally, its category. Rows are grouped by lot, shift, day or ISO week; each
 * period records its first and last source rows and per-category counts. Inspection units come
 * from a column of the event list, from a units table (which also lists the periods without any
 * event, as count 0), or are 1 per period.
 */
export function readEventPeriods(
  events: DecodedTable,
  mapping: EventMapping,
  settings: EventSettings,
): Result<ImportOutcome> {
  const file = sourceLocation(events);
  const resolved = resolveColumns(file, events.headerRow, events.header, {
    count: mapping.time,
    ...(mapping.units === undefined ? {} : { units: mapping.units }),
    ...(mapping.category === undefined ? {} : { label: mapping.category }),
    ...(mapping.count === undefined ? {} : { date: mapping.count }),
  });
  if (!resolved.ok) return fail(...resolved.findings);
  const timeColumn = resolved.columns.count;
  const unitsColumn = resolved.columns.units;
  const categoryColumn = resolved.columns.label;
  const countColumn = resolved.columns.date;
  const name = (index: number) => events.header[index];

  const starts = shiftStartMinutes(settings.shiftStarts ?? defaultShiftStarts);
  if (starts === null) {
    return fail({
      message: `the shift start times ${(settings.shiftStarts ?? []).join(', ')} are not distinct HH:MM times`,
    });
  }

  const numberCellsOf = (table: DecodedTable, indices: (number | undefined)[]) =>
    indices.flatMap((index) =>
      index === undefined
        ? []
        : table.rows.flatMap(({ row, cells }) => {
            const cell = cells[index];
            return typeof cell === 'string' && cell.trim() !== ''
              ? [{ row, column: table.header[index], text: cell.trim() }]
              : [];
          }),
    );
  const decimal = chooseDecimalMark(
    numberCellsOf(events, [countColumn, unitsColumn]),
    settings.decimal,
    events.source?.delimiter,
  );
  if (decimal.kind === 'mixed') return fail({ file, message: decimal.message });
  if (decimal.kind === 'ambiguous') {
    const { row, column, text } = decimal.example;
    return fail({ file, row, column, value: text, message: decimal.message });
  }

  const timed = settings.period !== 'lot';
  const dateCells: DateCellText[] = timed
    ? events.rows
        .filter((row) => !isBlankCell(row.cells[timeColumn] ?? null))
        .map((row) => {
          const cell = row.cells[timeColumn] ?? null;
          return { row: row.row, column: name(timeColumn), text: cellText(cell), parts: dateParts(cell) };
        })
    : [];
  const order = chooseDateOrder(dateCells, settings.dateOrder);
  if (order.kind === 'mixed') return fail({ file, column: name(timeColumn), message: order.message });
  if (order.kind === 'ambiguous') {
    const { row, column, text } = order.example;
    return fail({ file, row, column, value: text, message: order.message });
  }

  /** The period a time or lot cell names, or why it names none. */
  const periodOf = (cell: Cell): PeriodKey | { message: string } => {
    if (isBlankCell(cell)) return { message: timed ? 'the timestamp is blank' : 'the lot is blank' };
    if (!timed) {
      const text = cellText(cell).trim();
      return { label: text, start: text };
    }
    const resolvedDate = resolveDate(dateParts(cell), order.order);
    if ('message' in resolvedDate) return resolvedDate;
    if (settings.period === 'day') return dayKey(resolvedDate.date);
    if (settings.period === 'week') return weekKey(resolvedDate.date);
    return (
      shiftKey(resolvedDate.date, starts) ?? { message: 'has no time of day, which grouping by shift needs' }
    );
  };

  const periods = new Map<string, PeriodBuild>();
  const rejected: Rejection[] = [];
  const changedCells: ChangedCell[] = [];
  let rejectedRows = 0;
  let acceptedRows = 0;
  const rowsByPeriod = new Map<string, number>();
  for (const { row, cells } of events.rows) {
    const cell = (index: number | undefined): Cell => (index === undefined ? null : (cells[index] ?? null));
    const problems: Rejection[] = [];
    const changes: ChangedCell[] = [];
    const key = periodOf(cell(timeColumn));
    if ('message' in key)
      problems.push({
        row,
        column: name(timeColumn),
        value: cellText(cell(timeColumn)).trim(),
        message: key.message,
      });
    let count = 1;
    if (countColumn !== undefined) {
      const reading = readCount(cell(countColumn), decimal.decimal);
      if ('rejection' in reading) {
        problems.push({
          row,
          column: name(countColumn),
          value: cellText(cell(countColumn)).trim(),
          message: reading.rejection,
        });
      } else {
        count = reading.value;
        if (reading.changed !== undefined)
          changes.push({
            row,
            column: name(countColumn),
            from: cellText(cell(countColumn)),
            to: reading.changed,
          });
      }
    }
    let units: number | undefined;
    if (unitsColumn !== undefined) {
      const reading = readUnits(cell(unitsColumn), decimal.decimal);
      if ('rejection' in reading) {
        problems.push({
          row,
          column: name(unitsColumn),
          value: cellText(cell(unitsColumn)).trim(),
          message: reading.rejection,
        });
      } else {
        units = reading.value;
        if (reading.changed !== undefined)
          changes.push({
            row,
            column: name(unitsColumn),
            from: cellText(cell(unitsColumn)),
            to: reading.changed,
          });
      }
    }
    if (!('message' in key) && units !== undefined) {
      const known = periods.get(key.label)?.units;
      if (known && known.value !== units) {
        problems.push({
          row,
          column: name(unitsColumn!),
          value: cellText(cell(unitsColumn)).trim(),
          message: `differs from the ${known.value} units that row ${known.row} gives for ${key.label}`,
        });
      }
    }
    if (problems.length > 0 || 'message' in key) {
      rejected.push(...problems);
      rejectedRows++;
      continue;
    }
    acceptedRows++;
    changedCells.push(...changes);
    const period = periods.get(key.label) ?? {
      key,
      count: 0,
      rows: [],
      categories: new Map<string, number>(),
    };
    period.count += count;
    period.rows.push(row);
    if (units !== undefined && period.units === undefined) period.units = { value: units, row };
    if (categoryColumn !== undefined) {
      const category = cellText(cell(categoryColumn)).trim() || uncategorized;
      period.categories.set(category, (period.categories.get(category) ?? 0) + count);
    }
    periods.set(key.label, period);
    rowsByPeriod.set(key.label, (rowsByPeriod.get(key.label) ?? 0) + 1);
  }

  // Units from a second table: its periods with no event are periods with 0 nonconformities.
  const warnings: ImportWarning[] = [];
  appendCapped(
    warnings,
    (events.notes ?? []).map((note) => ({ ...note })),
  );
  let unitsReport: ImportReport['unitsTable'];
  const unitsOrder: string[] = [];
  if (settings.unitsTable) {
    const { table, key, units } = settings.unitsTable;
    const unitsFile = sourceLocation(table);
    const columns = resolveColumns(unitsFile, table.headerRow, table.header, { count: units, label: key });
    if (!columns.ok) return fail(...columns.findings);
    const unitsIndex = columns.columns.count;
    const keyIndex = columns.columns.label!;
    const unitsDecimal = chooseDecimalMark(
      numberCellsOf(table, [unitsIndex]),
      settings.decimal ?? (decimal.source === 'given' ? decimal.decimal : undefined),
      table.source?.delimiter,
    );
    if (unitsDecimal.kind === 'mixed') return fail({ file: unitsFile, message: unitsDecimal.message });
    if (unitsDecimal.kind === 'ambiguous') {
      const { row, column, text } = unitsDecimal.example;
      return fail({ file: unitsFile, row, column, value: text, message: unitsDecimal.message });
    }
    const seen = new Map<string, number>();
    let accepted = 0;
    let rejectedUnitRows = 0;
    let idleRows = 0;
    for (const { row, cells } of table.rows) {
      const keyCell = cells[keyIndex] ?? null;
      const period = periodOf(keyCell);
      const problems: Rejection[] = [];
      if ('message' in period)
        problems.push({
          file: unitsFile,
          row,
          column: table.header[keyIndex],
          value: cellText(keyCell).trim(),
          message: period.message,
        });
      const reading = readUnits(cells[unitsIndex] ?? null, unitsDecimal.decimal);
      if ('rejection' in reading)
        problems.push({
          file: unitsFile,
          row,
          column: table.header[unitsIndex],
          value: cellText(cells[unitsIndex] ?? null).trim(),
          message: reading.rejection,
        });
      if (!('message' in period) && seen.has(period.label)) {
        problems.push({
          file: unitsFile,
          row,
          column: table.header[keyIndex],
          value: cellText(keyCell).trim(),
          message: `names ${period.label} again (row ${seen.get(period.label)} already gives its units)`,
        });
      }
      if (problems.length > 0 || 'message' in period || 'rejection' in reading) {
        rejected.push(...problems);
        rejectedUnitRows++;
        continue;
      }
      if (reading.changed !== undefined)
        changedCells.push({
          row,
          column: table.header[unitsIndex],
          from: cellText(cells[unitsIndex] ?? null),
          to: reading.changed,
        });
      seen.set(period.label, row);
      unitsOrder.push(period.label);
      const build = periods.get(period.label) ?? {
        key: period,
        count: 0,
        rows: [],
        categories: new Map<string, number>(),
      };
      build.units = { value: reading.value, row };
      build.unitsRow = row;
      periods.set(period.label, build);
      if (reading.value === 0 && build.count === 0) idleRows++;
      else accepted++;
    }
    unitsReport = {
      file: unitsFile,
      rowsRead: table.rows.length,
      accepted,
      rejectedRows: rejectedUnitRows,
      noProduction: idleRows,
    };
    appendCapped(
      warnings,
      (table.notes ?? []).map((note) => ({ ...note, message: `${unitsFile}: ${note.message}` })),
    );
  } else if (unitsColumn === undefined) {
    warnings.push({
      code: 'event-periods-without-units',
      message:
        'each period counts as one inspection unit, and periods without any nonconformity are not in an event list: give a units table to list every period with its units',
    });
  }

  const observations: Observation[] = [];
  const noProduction: Observation[] = [];
  for (const period of periods.values()) {
    const first = period.rows[0] ?? period.unitsRow!;
    if (period.units === undefined && (settings.unitsTable !== undefined || unitsColumn !== undefined)) {
      // Events of a period the units table does not list cannot be analysed: say so on their first row.
      rejected.push({
        row: first,
        column: name(timeColumn),
        value: period.key.label,
        message: `has ${period.count} nonconformities in ${span(period.rows)} but no inspection units in the units table`,
      });
      rejectedRows += period.rows.length;
      acceptedRows -= period.rows.length;
      continue;
    }
    const units = period.units?.value ?? 1;
    const observation: Observation = { label: period.key.label, row: first, count: period.count, units };
    if (period.rows.length > 0) observation.rows = [period.rows[0], period.rows[period.rows.length - 1]];
    if (timed) observation.date = period.key.start;
    if (categoryColumn !== undefined) observation.categories = Object.fromEntries(period.categories);
    if (units === 0 && period.count === 0) noProduction.push(observation);
    else if (units === 0) {
      rejected.push({
        row: first,
        column: name(timeColumn),
        value: period.key.label,
        message: `has ${period.count} nonconformities but 0 inspection units (units table row ${period.units?.row})`,
      });
      rejectedRows += period.rows.length;
      acceptedRows -= period.rows.length;
    } else observations.push(observation);
  }
  const position = new Map(unitsOrder.map((label, index) => [label, index]));
  const periodOrder = (a: Observation, b: Observation) => {
    if (timed) return a.date! < b.date! ? -1 : a.date! > b.date! ? 1 : 0;
    if (position.size > 0)
      return (position.get(a.label) ?? Infinity) - (position.get(b.label) ?? Infinity) || a.row - b.row;
    return a.row - b.row;
  };
  observations.sort(periodOrder);
  noProduction.sort(periodOrder);

  const categoryTotals = new Map<string, number>();
  for (const observation of observations) {
    for (const [category, count] of Object.entries(observation.categories ?? {})) {
      categoryTotals.set(category, (categoryTotals.get(category) ?? 0) + count);
    }
  }
  const source = events.source;
  const report: ImportReport = {
    file: events.file,
    location: file,
    sha256: source?.sha256 ?? null,
    bytes: source?.bytes ?? null,
    rowsRead: events.rows.length,
    accepted: acceptedRows,
    rejectedRows,
    noProduction: 0,
    blankRows: events.blankRows ?? [],
    rejected,
    changedCells,
    settings: {
      mapping: {
        count: mapping.count ?? '',
        ...(mapping.units === undefined ? {} : { units: mapping.units }),
      },
      decimal: decimal.decimal,
      decimalSource: decimal.source,
      decimalReason: decimal.reason,
      ...(timed
        ? { dateOrder: order.order, dateOrderSource: order.source, dateOrderReason: order.reason }
        : {}),
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
      ...(events.sheet === undefined ? {} : { sheet: events.sheet }),
      headerRow: events.headerRow,
      events: {
        period: settings.period,
        time: mapping.time,
        ...(mapping.category === undefined ? {} : { category: mapping.category }),
        ...(settings.period === 'shift'
          ? { shiftStarts: (settings.shiftStarts ?? defaultShiftStarts).join(',') }
          : {}),
        ...(settings.unitsTable
          ? { unitsFrom: sourceLocation(settings.unitsTable.table), unitsKey: settings.unitsTable.key }
          : {}),
      },
    },
    warnings,
    periods: observations.length + noProduction.length,
    ...(unitsReport ? { unitsTable: unitsReport } : {}),
    ...(categoryColumn === undefined
      ? {}
      : {
          categories: [...categoryTotals]
            .sort((a, b) => b[1] - a[1] || (a[0] < b[0] ? -1 : 1))
            .map(([category, count]) => ({ category, count })),
        }),
  };
  return ok({ observations, rejected, noProduction, report });
}

function span(rows: number[]): string {
  return rows.length === 1 ? `row ${rows[0]}` : `rows ${rows[0]} to ${rows[rows.length - 1]}`;
}
