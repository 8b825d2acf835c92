import { describe, expect, it } from 'vitest';
import type { Cell, DecodedTable } from '../../shared-core/import/decoded-table.js';
import { readObservations } from '../../shared-core/import/read-observations.js';
import { rejectionFinding } from '../../shared-core/import/import-report.js';
import { describeFinding } from '../../shared-core/result.js';

/** A decoded table as a text decoder gives it: header on row 1, strings in every cell. */
function table(header: string[], rows: Cell[][], delimiter = ','): DecodedTable {
  return {
    file: 'h.csv',
    headerRow: 1,
    header,
    rows: rows.map((cells, i) => ({ row: i + 2, cells })),
    source: { format: 'delimited', sha256: 'ab'.repeat(32), bytes: 100, delimiter, encoding: 'utf-8' },
  };
}

const read = (t: DecodedTable, mapping: Parameters<typeof readObservations>[1], settings = {}) => {
  const result = readObservations(t, mapping, settings);
  if (!result.ok) throw new Error(result.findings.map(describeFinding).join('\n'));
  return result.value;
};

describe('readObservations', () => {
  it('reads counts, units and labels with their spreadsheet rows', () => {
    const outcome = read(
      table(
        ['lot', 'defects', 'boards'],
        [
          ['L1', '3', '50'],
          ['L2', '0', '48'],
        ],
      ),
      { count: 'defects', units: 'boards', label: 'lot' },
    );
    expect(outcome.observations).toEqual([
      { label: 'L1', row: 2, count: 3, units: 50 },
      { label: 'L2', row: 3, count: 0, units: 48 },
    ]);
    expect(outcome.report).toMatchObject({ rowsRead: 2, accepted: 2, rejectedRows: 0, noProduction: 0 });
    expect(outcome.report.sha256).toBe('ab'.repeat(32));
  });

  it('gives one unit per period without a units column and labels periods #ROW without a label column', () => {
    const outcome = read(table(['count'], [['4'], ['6']]), { count: 'count' });
    expect(outcome.observations).toEqual([
      { label: '#2', row: 2, count: 4, units: 1 },
      { label: '#3', row: 3, count: 6, units: 1 },
    ]);
  });

  it('fails on a missing column, naming the file, the column and the headers found', () => {
    const result = readObservations(table(['lot', 'defects'], [['L1', '3']]), { count: 'count', units: 'n' });
    expect(result.ok).toBe(false);
    if (result.ok) return;
    expect(result.findings).toHaveLength(2);
    expect(describeFinding(result.findings[0])).toBe(
      'h.csv, row 1, column "count": there is no column "count" in the header row (columns found: "lot", "defects")',
    );
  });

  it('matches a header ignoring case and spacing when only one column matches', () => {
    const outcome = read(table([' Defects ', 'Boards'], [['1', '2']]), { count: 'defects', units: 'boards' });
    expect(outcome.observations[0]).toMatchObject({ count: 1, units: 2 });
  });

  it('rejects every bad cell with its row, column, value and reason', () => {
    const outcome = read(
      table(
        ['lot', 'count', 'units'],
        [
          ['A', '2.5', '10'],
          ['B', '-1', '10'],
          ['C', '', '10'],
          ['D', 'three', '0'],
          ['E', '1', '-2'],
          ['F', '1', ''],
          ['G', '4', '0'],
          ['H', '1', '1e400'],
          ['I', '5', '10'],
        ],
      ),
      { count: 'count', units: 'units', label: 'lot' },
    );
    expect(outcome.observations.map((o) => o.label)).toEqual(['I']);
    expect(outcome.rejected).toEqual([
      { row: 2, column: 'count', value: '2.5', message: 'is not a whole number of nonconformities' },
      {
        row: 3,
        column: 'count',
        value: '-1',
        message: 'is negative; a count of nonconformities is 0 or more',
      },
      { row: 4, column: 'count', value: '', message: 'the cell is blank; a blank is never read as 0' },
      { row: 5, column: 'count', value: 'three', message: 'is not a number' },
      {
        row: 5,
        column: 'units',
        value: '0',
        message: 'is not a positive number of inspection units (0 units with nonconformities counted)',
      },
      {
        row: 6,
        column: 'units',
        value: '-2',
        message: 'is negative; the inspection units must be more than 0',
      },
      { row: 7, column: 'units', value: '', message: 'the cell is blank; a blank is never read as 0' },
      {
        row: 8,
        column: 'units',
        value: '0',
        message: 'is not a positive number of inspection units (0 units with nonconformities counted)',
      },
      { row: 9, column: 'units', value: '1e400', message: 'is not a finite number of inspection units' },
    ]);
    expect(outcome.report).toMatchObject({ rowsRead: 9, accepted: 1, rejectedRows: 8 });
    expect(describeFinding(rejectionFinding('h.csv', outcome.rejected[0]))).toBe(
      'h.csv, row 2, column "count": "2.5" is not a whole number of nonconformities',
    );
    expect(describeFinding(rejectionFinding('h.csv', outcome.rejected[2]))).toBe(
      'h.csv, row 4, column "count": the cell is blank; a blank is never read as 0',
    );
  });

  it('keeps 0-unit periods with a blank or 0 count on record as no production', () => {
    const outcome = read(
      table(
        ['lot', 'count', 'units'],
        [
          ['A', '', '0'],
          ['B', '0', '0'],
          ['C', '2', '5'],
        ],
      ),
      { count: 'count', units: 'units', label: 'lot' },
    );
    expect(outcome.noProduction).toEqual([
      { label: 'A', row: 2, count: 0, units: 0 },
      { label: 'B', row: 3, count: 0, units: 0 },
    ]);
    expect(outcome.observations).toHaveLength(1);
    expect(outcome.rejected).toEqual([]);
    const { rowsRead, accepted, rejectedRows, noProduction } = outcome.report;
    expect(accepted + rejectedRows + noProduction).toBe(rowsRead);
  });

  it('records every cell read as something other than its text', () => {
    const outcome = read(
      table(
        ['count', 'units'],
        [
          ['1', '1,5'],
          ['2', '3,0'],
        ],
        ';',
      ),
      {
        count: 'count',
        units: 'units',
      },
    );
    expect(outcome.report.settings).toMatchObject({ decimal: 'comma', decimalSource: 'detected' });
    expect(outcome.observations.map((o) => o.units)).toEqual([1.5, 3]);
    expect(outcome.report.changedCells).toEqual([
      { row: 2, column: 'units', from: '1,5', to: '1.5' },
      { row: 3, column: 'units', from: '3,0', to: '3' },
    ]);
  });

  it('fails on an ambiguous decimal mark, naming the cell and what to state', () => {
    const result = readObservations(table(['count', 'units'], [['1', '1,250']], '\t'), {
      count: 'count',
      units: 'units',
    });
    expect(result.ok).toBe(false);
    if (result.ok) return;
    expect(describeFinding(result.findings[0])).toBe(
      'h.csv, row 2, column "units": "1,250" could be 1250 or 1.250: state the decimal mark (--decimal comma or --decimal point)',
    );
    expect(
      readObservations(
        table(['count', 'units'], [['1', '1,250']], '\t'),
        { count: 'count', units: 'units' },
        {
          decimal: 'comma',
        },
      ),
    ).toMatchObject({ ok: true, value: { observations: [{ units: 1.25 }] } });
  });

  it('sorts dated periods into date order and warns about rows out of order', () => {
    const outcome = read(
      table(
        ['date', 'count'],
        [
          ['2026-03-02', '1'],
          ['2026-03-04', '2'],
          ['2026-03-03', '3'],
          ['2026-03-05', '4'],
        ],
      ),
      { count: 'count', date: 'date' },
    );
    expect(outcome.observations.map((o) => o.row)).toEqual([2, 4, 3, 5]);
    expect(outcome.report.warnings).toEqual([
      expect.objectContaining({ code: 'date-order', row: 4, column: 'date' }),
    ]);
  });

  it('warns about a gap in dated periods, but not about a weekend in a working-day series', () => {
    // 2026-03-06 is a Friday and 2026-03-09 a Monday (a calendar fact).
    const days = ['2026-03-04', '2026-03-05', '2026-03-06', '2026-03-09', '2026-03-10', '2026-03-12'];
    const outcome = read(
      table(
        ['date', 'count'],
        days.map((d) => [d, '1']),
      ),
      { count: 'count', date: 'date' },
    );
    const gaps = outcome.report.warnings.filter((w) => w.code === 'date-gap');
    expect(gaps).toHaveLength(1);
    expect(gaps[0]).toMatchObject({ row: 7 });
    expect(gaps[0].message).toContain('between 2026-03-10 (row 6) and 2026-03-12');
  });

  it('asks for the date order when 03/04/2026 is not decided by another cell', () => {
    const result = readObservations(
      table(
        ['date', 'count'],
        [
          ['03/04/2026', '1'],
          ['04/04/2026', '1'],
        ],
      ),
      {
        count: 'count',
        date: 'date',
      },
    );
    expect(result).toMatchObject({ ok: false, findings: [{ row: 2, column: 'date', value: '03/04/2026' }] });
    const given = read(
      table(['date', 'count'], [['03/04/2026', '1']]),
      { count: 'count', date: 'date' },
      {
        dateOrder: 'mdy',
      },
    );
    expect(given.observations[0].date).toBe('2026-03-04');
    expect(given.report.changedCells).toEqual([
      { row: 2, column: 'date', from: '03/04/2026', to: '2026-03-04' },
    ]);
  });

  it('warns about duplicate labels, naming the rows to use instead', () => {
    const outcome = read(
      table(
        ['lot', 'count'],
        [
          ['A', '1'],
          ['B', '1'],
          ['A', '2'],
        ],
      ),
      { count: 'count', label: 'lot' },
    );
    expect(outcome.report.warnings).toEqual([
      expect.objectContaining({ code: 'duplicate-label', message: expect.stringContaining('#2, #4') }),
    ]);
  });

  it('reads workbook cells: numbers as numbers, text and booleans in number columns rejected', () => {
    const outcome = read(
      table(
        ['count', 'units'],
        [
          [3, 10.5],
          [true, 2],
          [new Date(Date.UTC(2026, 0, 1)), 3],
          ['4', 2],
        ],
      ),
      { count: 'count', units: 'units' },
    );
    expect(outcome.observations).toEqual([
      { label: '#2', row: 2, count: 3, units: 10.5 },
      { label: '#5', row: 5, count: 4, units: 2 },
    ]);
    expect(outcome.rejected.map((r) => r.message)).toEqual([
      'is a true/false value, not a number',
      'is a date, not a number',
    ]);
  });

  it('sums up warnings beyond 20 of a kind, even for a reversed table of 150,000 rows', () => {
    const day = (i: number) => new Date(Date.UTC(2000, 0, 1) + i * 86_400_000).toISOString().slice(0, 10);
    const rows = Array.from({ length: 150_000 }, (_, i) => [day(150_000 - i), '1']);
    const outcome = read(table(['date', 'count'], rows), { count: 'count', date: 'date' });
    const order = outcome.report.warnings.filter((w) => w.code === 'date-order');
    expect(order).toHaveLength(21);
    expect(order[20].message).toBe('and 149979 more like the 20 above (date-order)');
    expect(outcome.observations[0].date).toBe(day(1));
    expect(outcome.report.accepted).toBe(150_000);
  });

  it('reads a workbook count off by binary rounding as the whole number, listing the change', () => {
    // 0.1 + 0.2 is 0.30000000000000004 in IEEE 754 doubles (a fact of floating point), so 3 computed
    // by a formula as (0.1 + 0.2) * 10 arrives as 3.0000000000000004.
    const almostThree = (0.1 + 0.2) * 10;
    expect(almostThree).not.toBe(3);
    const outcome = read(table(['count'], [[almostThree], [2.5], ['3.0000000000000004']]), {
      count: 'count',
    });
    expect(outcome.observations).toEqual([{ label: '#2', row: 2, count: 3, units: 1 }]);
    expect(outcome.report.changedCells).toEqual([
      { row: 2, column: 'count', from: String(almostThree), to: '3' },
    ]);
    // Text is taken as written: a typed fraction is never rounded away.
    expect(outcome.rejected.map((r) => r.row)).toEqual([3, 4]);
  });
});
