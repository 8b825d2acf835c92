import ExcelJS from 'exceljs';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { unexpectedFailure, importBytes } from '../../src-main/services/import/import-file.js';
import type { ImportOutcome } from '../../shared-core/import/import-report.js';
import type { Result } from '../../shared-core/result.js';

// Property tests of the XLSX importer: 400 generated or mutated workbooks (the delimited-text
// file brings the total to 10,000). Workbooks are written with exceljs in the test.

const cellValue: fc.Arbitrary<ExcelJS.CellValue> = fc.oneof(
  fc.nat({ max: 500 }),
  fc.integer({ min: -20, max: 20 }),
  fc.double({ min: -1e6, max: 1e6, noNaN: true, noDefaultInfinity: true }),
  fc.constantFrom(null, '', ' ', '12', '1,5', 'abc', '#N/A', true, false),
  fc.date({ min: new Date(Date.UTC(1950, 0, 1)), max: new Date(Date.UTC(2050, 0, 1)), noInvalidDate: true }),
  fc.nat({ max: 50 }).map((n) => ({ formula: `${n}+0`, result: n })),
  fc.constant({ formula: 'A1*2' } as ExcelJS.CellValue),
  fc.string({ maxLength: 5 }).map((text) => ({ richText: [{ text }, { text: '!' }] })),
);

const workbookArb = fc.record({
  rows: fc.array(fc.array(cellValue, { minLength: 4, maxLength: 4 }), { maxLength: 15 }),
  titleRows: fc.nat({ max: 2 }),
  date1904: fc.boolean(),
  hidden: fc.array(fc.nat({ max: 20 }), { maxLength: 3 }),
  merge: fc.option(fc.tuple(fc.nat({ max: 15 }), fc.nat({ max: 2 })), { nil: undefined }),
});

type WorkbookSpec = typeof workbookArb extends fc.Arbitrary<infer T> ? T : never;

async function workbookBytes(spec: WorkbookSpec) {
  const workbook = new ExcelJS.Workbook();
  workbook.properties.date1904 = spec.date1904;
  const sheet = workbook.addWorksheet('Data');
  for (let i = 0; i < spec.titleRows; i++) sheet.addRow([`Invented title ${i + 1}`]);
  sheet.addRow(['lot', 'count', 'units', 'date']);
  for (const row of spec.rows) sheet.addRow(row);
  for (const r of spec.hidden) sheet.getRow(r + 1).hidden = true;
  if (spec.merge) {
    const [row, column] = spec.merge;
    const top = row + 1;
    sheet.mergeCells(top, column + 1, top + 1, column + 2);
  }
  return new Uint8Array(await workbook.xlsx.writeBuffer());
}

function checkAccounting(result: Result<ImportOutcome>) {
  if (!result.ok) {
    expect(result.findings.length).toBeGreaterThan(0);
    for (const finding of result.findings) expect(finding.message).not.toContain(unexpectedFailure);
    return;
  }
  const { observations, noProduction, rejected, report } = result.value;
  expect(report.accepted + report.rejectedRows + report.noProduction).toBe(report.rowsRead);
  expect(observations.length).toBe(report.accepted);
  expect(noProduction.length).toBe(report.noProduction);
  expect(new Set(rejected.map((r) => r.row)).size).toBe(report.rejectedRows);
}

const request = { count: 'count', units: 'units', label: 'lot', date: 'date', dateOrder: 'dmy' as const };

// CPU-bound: a generous timeout, since CI runs the suites side by side on two cores.
const propertyTimeout = 120_000;

describe('XLSX import (property)', () => {
  it(
    'never throws and accounts for every row of generated workbooks (120 inputs)',
    async () => {
      await fc.assert(
        fc.asyncProperty(workbookArb, async (spec) => {
          checkAccounting(await importBytes('gen.xlsx', await workbookBytes(spec), request));
        }),
        { numRuns: 120 },
      );
    },
    propertyTimeout,
  );

  it(
    'never throws on mutated workbook bytes (230 inputs)',
    async () => {
      const seed = await workbookBytes({
        rows: [
          ['L1', 3, 50, new Date(Date.UTC(2026, 2, 2))],
          ['L2', 1, 48, new Date(Date.UTC(2026, 2, 3))],
        ],
        titleRows: 0,
        date1904: false,
        hidden: [],
        merge: undefined,
      });
      const edits = fc.array(fc.tuple(fc.nat(), fc.integer({ min: 0, max: 255 })), {
        minLength: 1,
        maxLength: 6,
      });
      await fc.assert(
        fc.asyncProperty(edits, async (changes) => {
          const bytes = seed.slice();
          for (const [at, byte] of changes) bytes[at % bytes.length] = byte;
          checkAccounting(await importBytes('mutated.xlsx', bytes, request));
        }),
        { numRuns: 230 },
      );
    },
    propertyTimeout,
  );

  it(
    'gives back the accepted periods when they are written to a workbook and read again (50 inputs)',
    async () => {
      let exercised = 0;
      await fc.assert(
        fc.asyncProperty(workbookArb, async (spec) => {
          const first = await importBytes('gen.xlsx', await workbookBytes(spec), request);
          if (!first.ok || first.value.observations.length === 0) return;
          exercised++;
          const workbook = new ExcelJS.Workbook();
          const sheet = workbook.addWorksheet('Export');
          sheet.addRow(['label', 'count', 'units', 'date']);
          for (const o of first.value.observations) sheet.addRow([o.label, o.count, o.units, o.date ?? '']);
          const bytes = new Uint8Array(await workbook.xlsx.writeBuffer());
          const again = await importBytes('export.xlsx', bytes, {
            count: 'count',
            units: 'units',
            label: 'label',
            date: 'date',
          });
          expect(again.ok).toBe(true);
          if (!again.ok) return;
          const strip = ({
            label,
            count,
            units,
            date,
          }: {
            label: string;
            count: number;
            units: number;
            date?: string;
          }) => ({
            label,
            count,
            units,
            date,
          });
          expect(again.value.observations.map(strip)).toEqual(first.value.observations.map(strip));
        }),
        { numRuns: 50 },
      );
      expect(exercised).toBeGreaterThan(0);
    },
    propertyTimeout,
  );
});
