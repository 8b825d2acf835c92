import { parseArgs } from 'node:util';
import { describe, expect, it } from 'vitest';
import { importFlags, importRequestFromFlags } from '../../src-main/cli/import-flags.js';
import { suggestMapping } from '../../shared-core/import/column-mapping.js';
import { tablePreview } from '../../shared-core/import/table-preview.js';

const parse = (...args: string[]) =>
  importRequestFromFlags(parseArgs({ args, options: importFlags, allowPositionals: true }).values);

describe('importRequestFromFlags', () => {
  it('turns the flags into an import request', () => {
    expect(
      parse(
        ...['--count', 'defects', '--units', 'boards', '--label', 'lot', '--date', 'day'],
        ...['--delimiter', 'semicolon', '--decimal', 'comma', '--encoding', 'cp1252', '--date-order', 'dmy'],
        ...['--sheet', 'Line 4', '--inspection-unit', 'one board'],
      ),
    ).toEqual({
      ok: true,
      value: {
        count: 'defects',
        units: 'boards',
        label: 'lot',
        date: 'day',
        delimiter: ';',
        decimal: 'comma',
        encoding: 'windows-1252',
        dateOrder: 'dmy',
        sheet: 'Line 4',
        inspectionUnit: 'one board',
      },
    });
    expect(parse('--count', 'c', '--delimiter', 'tab')).toMatchObject({ value: { delimiter: '\t' } });
  });

  it('describes an event list', () => {
    expect(
      parse(
        ...[
          '--events',
          '--period',
          'shift',
          '--time',
          'when',
          '--category',
          'defect',
          '--shift-starts',
          '07:00, 19:00',
        ],
        ...['--units-sheet', 'Units', '--units', 'boards', '--units-key', 'day'],
      ),
    ).toEqual({
      ok: true,
      value: {
        count: '',
        units: 'boards',
        events: {
          period: 'shift',
          time: 'when',
          category: 'defect',
          shiftStarts: ['07:00', '19:00'],
          unitsSheet: 'Units',
          unitsKey: 'day',
        },
      },
    });
  });

  it('names every wrong flag, with the choices', () => {
    const result = parse(
      '--decimal',
      'dot',
      '--date-order',
      'ymd',
      '--delimiter',
      'colon',
      '--encoding',
      'ebcdic',
    );
    expect(result.ok).toBe(false);
    expect(!result.ok && result.findings.map((f) => f.message)).toEqual([
      'name the count column with --count COL',
      '--delimiter colon: use comma, semicolon, tab or pipe',
      '--decimal dot: use comma or point',
      '--date-order ymd: use dmy or mdy',
      '--encoding ebcdic: use utf-8, utf-16le, utf-16be, windows-1252',
    ]);
  });

  it('asks for what an event list needs, and refuses event flags without --events', () => {
    expect(parse('--events', '--time', 'when')).toMatchObject({
      ok: false,
      findings: [{ message: '--events needs --period day, week, shift or lot' }],
    });
    expect(parse('--events', '--period', 'day', '--time', 'when', '--units-file', 'u.csv')).toMatchObject({
      ok: false,
      findings: [{ message: expect.stringContaining('need --units COL') }],
    });
    expect(parse('--count', 'c', '--period', 'day', '--shift-starts', '06:00')).toMatchObject({
      ok: false,
      findings: [{ message: '--period, --shift-starts describe an event list: add --events' }],
    });
  });
});

describe('suggestMapping', () => {
  it('suggests columns from header names, for the user to confirm', () => {
    expect(suggestMapping(['Lot', 'Date', 'Defects', 'Boards inspected'])).toEqual({
      count: 'Defects',
      units: 'Boards inspected',
      date: 'Date',
      label: 'Lot',
    });
    expect(suggestMapping(['x', 'y'])).toEqual({});
  });
});

describe('tablePreview', () => {
  it('shows the first rows as text under their spreadsheet rows, with a suggested mapping', () => {
    const preview = tablePreview(
      {
        file: 'log.xlsx',
        sheet: 'Data',
        headerRow: 3,
        header: ['Lot', 'Date', 'Defects'],
        rows: [
          { row: 4, cells: ['A-1', new Date(Date.UTC(2026, 2, 2)), 3] },
          { row: 5, cells: ['A-2', new Date(Date.UTC(2026, 2, 3, 6, 30)), null] },
          { row: 6, cells: ['A-3'] },
        ],
      },
      2,
    );
    expect(preview).toEqual({
      file: 'log.xlsx',
      sheet: 'Data',
      headerRow: 3,
      header: ['Lot', 'Date', 'Defects'],
      rows: [
        { row: 4, cells: ['A-1', '2026-03-02', '3'] },
        { row: 5, cells: ['A-2', '2026-03-03 06:30:00', ''] },
      ],
      totalRows: 3,
      suggested: { count: 'Defects', date: 'Date', label: 'Lot' },
    });
  });
});
