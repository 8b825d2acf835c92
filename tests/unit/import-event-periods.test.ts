import { describe, expect, it } from 'vitest';
import type { Cell, DecodedTable } from '../../shared-core/import/decoded-table.js';
import { readEventPeriods } from '../../shared-core/import/event-periods.js';
import { describeFinding } from '../../shared-core/result.js';

function table(file: string, header: string[], rows: Cell[][]): DecodedTable {
  return { file, headerRow: 1, header, rows: rows.map((cells, i) => ({ row: i + 2, cells })) };
}

type Args = Parameters<typeof readEventPeriods>;
const read = (...args: Args) => {
  const result = readEventPeriods(...args);
  if (!result.ok) throw new Error(result.findings.map(describeFinding).join('\n'));
  return result.value;
};

// An invented event log: each row is one nonconformity found on an invented board line.
const log = table(
  'events.csv',
  ['when', 'defect', 'lot'],
  [
    ['2026-03-02 07:10', 'bridge', 'L1'],
    ['2026-03-02 09:45', 'void', 'L1'],
    ['2026-03-02 15:00', 'bridge', 'L2'],
    ['2026-03-04 08:00', '', 'L3'],
    ['2026-03-03 23:10', 'bridge', 'L2'],
  ],
);

describe('readEventPeriods', () => {
  it('groups events by day, in date order, with first and last rows and category counts', () => {
    const outcome = read(log, { time: 'when', category: 'defect' }, { period: 'day' });
    expect(outcome.observations).toEqual([
      {
        label: '2026-03-02',
        row: 2,
        rows: [2, 4],
        count: 3,
        units: 1,
        date: '2026-03-02',
        categories: { bridge: 2, void: 1 },
      },
      {
        label: '2026-03-03',
        row: 6,
        rows: [6, 6],
        count: 1,
        units: 1,
        date: '2026-03-03',
        categories: { bridge: 1 },
      },
      {
        label: '2026-03-04',
        row: 5,
        rows: [5, 5],
        count: 1,
        units: 1,
        date: '2026-03-04',
        categories: { '(no category)': 1 },
      },
    ]);
    expect(outcome.report.categories).toEqual([
      { category: 'bridge', count: 3 },
      { category: '(no category)', count: 1 },
      { category: 'void', count: 1 },
    ]);
    expect(outcome.report.warnings.map((w) => w.code)).toContain('event-periods-without-units');
    expect(outcome.report).toMatchObject({ rowsRead: 5, accepted: 5, rejectedRows: 0, periods: 3 });
  });

  it('groups by shift and by ISO week', () => {
    const byShift = read(log, { time: 'when' }, { period: 'shift' });
    expect(byShift.observations.map((o) => [o.label, o.count])).toEqual([
      ['2026-03-02 S1', 2],
      ['2026-03-02 S2', 1],
      ['2026-03-03 S3', 1],
      ['2026-03-04 S1', 1],
    ]);
    const byWeek = read(log, { time: 'when' }, { period: 'week' });
    expect(byWeek.observations).toEqual([
      { label: '2026-W10', row: 2, rows: [2, 6], count: 5, units: 1, date: '2026-03-02' },
    ]);
  });

  it('groups by lot in order of first appearance, with units repeated on each row', () => {
    const rows = table(
      'lots.csv',
      ['lot', 'boards'],
      [
        ['L1', '50'],
        ['L2', '40'],
        ['L1', '50'],
        ['L2', '45'],
      ],
    );
    const outcome = read(rows, { time: 'lot', units: 'boards' }, { period: 'lot' });
    expect(outcome.observations).toEqual([
      { label: 'L1', row: 2, rows: [2, 4], count: 2, units: 50 },
      { label: 'L2', row: 3, rows: [3, 3], count: 1, units: 40 },
    ]);
    expect(outcome.rejected).toEqual([
      { row: 5, column: 'boards', value: '45', message: 'differs from the 40 units that row 3 gives for L2' },
    ]);
    const { rowsRead, accepted, rejectedRows, noProduction } = outcome.report;
    expect(accepted + rejectedRows + noProduction).toBe(rowsRead);
  });

  it('takes units from a units table, which also brings the periods without any event', () => {
    const units = table(
      'units.csv',
      ['lot', 'boards'],
      [
        ['L1', '50'],
        ['L2', '40'],
        ['L3', '45'],
        ['L4', '0'],
      ],
    );
    const events = table(
      'events.csv',
      ['lot', 'qty'],
      [
        ['L2', '2'],
        ['L1', '1'],
        ['L2', '1'],
        ['L9', '1'],
      ],
    );
    const outcome = read(
      events,
      { time: 'lot', count: 'qty' },
      { period: 'lot', unitsTable: { table: units, key: 'lot', units: 'boards' } },
    );
    expect(outcome.observations).toEqual([
      { label: 'L1', row: 3, rows: [3, 3], count: 1, units: 50 },
      { label: 'L2', row: 2, rows: [2, 4], count: 3, units: 40 },
      { label: 'L3', row: 4, count: 0, units: 45 },
    ]);
    expect(outcome.noProduction).toEqual([{ label: 'L4', row: 5, count: 0, units: 0 }]);
    expect(outcome.rejected).toEqual([
      {
        row: 5,
        column: 'lot',
        value: 'L9',
        message: 'has 1 nonconformities in row 5 but no inspection units in the units table',
      },
    ]);
    expect(outcome.report.unitsTable).toEqual({
      file: 'units.csv',
      rowsRead: 4,
      accepted: 3,
      rejectedRows: 0,
      noProduction: 1,
    });
    expect(outcome.report).toMatchObject({ rowsRead: 4, accepted: 3, rejectedRows: 1 });
  });

  it('rejects a blank or unreadable timestamp and a shift event without a time, naming the row', () => {
    const events = table(
      'e.csv',
      ['when'],
      [['2026-03-02 07:00'], [''], ['2026-02-30 07:00'], ['2026-03-02']],
    );
    const outcome = read(events, { time: 'when' }, { period: 'shift' });
    expect(outcome.rejected).toEqual([
      { row: 3, column: 'when', value: '', message: 'the timestamp is blank' },
      { row: 4, column: 'when', value: '2026-02-30 07:00', message: 'has no day 30 in that month' },
      {
        row: 5,
        column: 'when',
        value: '2026-03-02',
        message: 'has no time of day, which grouping by shift needs',
      },
    ]);
  });

  it('asks for the date order of ambiguous timestamps', () => {
    const events = table('e.csv', ['when'], [['03/04/2026 07:00']]);
    const result = readEventPeriods(events, { time: 'when' }, { period: 'day' });
    expect(result.ok).toBe(false);
    expect(!result.ok && describeFinding(result.findings[0])).toContain('--date-order');
    expect(read(events, { time: 'when' }, { period: 'day', dateOrder: 'dmy' }).observations[0].label).toBe(
      '2026-04-03',
    );
  });
});
