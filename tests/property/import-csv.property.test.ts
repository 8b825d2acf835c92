import fc from 'fast-check';
import Papa from 'papaparse';
import iconv from 'iconv-lite';
import { describe, expect, it } from 'vitest';
import {
  unexpectedFailure,
  importBytes,
  importPastedText,
} from '../../src-main/services/import/import-file.js';
import type { ImportRequest } from '../../src-main/services/import/import-request.js';
import type { ImportOutcome } from '../../shared-core/import/import-report.js';
import type { Result } from '../../shared-core/result.js';

// Property tests of the delimited-text importer: generated and mutated inputs (9,600 in all here,
// the XLSX file adds the rest of the 10,000). Each input must give a value, never a throw; every
// data row is accounted for; exporting the accepted periods and importing them again gives them back.

/** Cells a spreadsheet user could type into a number column, good and bad. */
const numberCell = fc.oneof(
  fc.nat({ max: 1000 }).map(String),
  fc.integer({ min: -50, max: 5 }).map(String),
  fc.double({ min: -10, max: 1e6, noNaN: true }).map(String),
  fc.double({ min: 0, max: 1000, noNaN: true }).map((x) => x.toFixed(2).replace('.', ',')),
  fc.nat({ max: 10_000_000 }).map((x) => x.toLocaleString('en-US')),
  fc.nat({ max: 10_000_000 }).map((x) => x.toLocaleString('de-DE')),
  fc.constantFrom(
    '',
    ' ',
    '0',
    '00',
    '1e400',
    'NaN',
    '-0',
    'n/a',
    '#DIV/0!',
    '1 000',
    '½',
    '\u22122',
    '3\u00a0',
  ),
  fc.string({ maxLength: 6 }),
);
const textCell = fc.oneof(
  fc.string({ maxLength: 8 }),
  fc.constantFrom('', 'Lé', '"q"', 'a,b', 'a;b', 'a\tb', 'x\ny', '€'),
);
const dateCell = fc.oneof(
  fc
    .date({ min: new Date(Date.UTC(2000, 0, 1)), max: new Date(Date.UTC(2040, 0, 1)), noInvalidDate: true })
    .map((d) => d.toISOString().slice(0, 10)),
  fc
    .tuple(
      fc.integer({ min: 1, max: 31 }),
      fc.integer({ min: 1, max: 13 }),
      fc.integer({ min: 1999, max: 2030 }),
    )
    .map(([a, b, y]) => `${a}/${b}/${y}`),
  fc.constantFrom('', '2026-02-29', '31/04/2026', 'yesterday', '03/04/26'),
);

const header = ['lot', 'count', 'units', 'date'];
const tableRows = fc.array(fc.tuple(textCell, numberCell, numberCell, dateCell), { maxLength: 25 });
const delimiter = fc.constantFrom(',', ';', '\t', '|');
const encoding = fc.constantFrom('utf-8', 'utf-8-bom', 'utf-16le', 'utf-16be', 'windows-1252');

function encode(text: string, how: string): Uint8Array {
  if (how === 'utf-8-bom')
    return new Uint8Array(Buffer.concat([Buffer.from([0xef, 0xbb, 0xbf]), Buffer.from(text)]));
  if (how === 'utf-16le' || how === 'utf-16be')
    return new Uint8Array(iconv.encode(text, how, { addBOM: true }));
  if (how === 'windows-1252') return new Uint8Array(iconv.encode(text, 'windows-1252'));
  return new TextEncoder().encode(text);
}

const requestArb = fc.record(
  {
    count: fc.constant('count'),
    units: fc.constant('units'),
    label: fc.constant('lot'),
    date: fc.constant('date'),
    decimal: fc.constantFrom('comma' as const, 'point' as const),
    dateOrder: fc.constantFrom('dmy' as const, 'mdy' as const),
  },
  { requiredKeys: ['count'] },
);

/** Every data row is accepted, rejected or no production, and nothing is counted twice. */
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
  const rows = [...observations, ...noProduction].map((o) => o.row);
  expect(new Set([...rows, ...rejected.map((r) => r.row)]).size).toBe(report.rowsRead);
  for (const o of observations) {
    expect(Number.isInteger(o.count) && o.count >= 0).toBe(true);
    expect(Number.isFinite(o.units) && o.units > 0).toBe(true);
  }
}

// CPU-bound: a generous timeout, since CI runs the suites side by side on two cores.
const propertyTimeout = 120_000;

describe('delimited import (property)', () => {
  it(
    'never throws and accounts for every row of generated tables (4,000 inputs)',
    async () => {
      await fc.assert(
        fc.asyncProperty(
          tableRows,
          delimiter,
          encoding,
          requestArb,
          fc.boolean(),
          async (rows, sep, how, request, crlf) => {
            const text = Papa.unparse([header, ...rows], { delimiter: sep, newline: crlf ? '\r\n' : '\n' });
            const result = await importBytes('gen.csv', encode(text, how), request as ImportRequest);
            checkAccounting(result);
          },
        ),
        { numRuns: 4000 },
      );
    },
    propertyTimeout,
  );

  it(
    'never throws on mutated bytes (4,000 inputs)',
    async () => {
      const valid = Papa.unparse([
        header,
        ['L1', '3', '50', '2026-03-02'],
        ['L2', '1,5', '0', '03/04/2026'],
        ['"x"', '', '7', ''],
      ]);
      const seed = new TextEncoder().encode(valid);
      const mutation = fc.array(
        fc.tuple(fc.constantFrom('flip', 'insert', 'delete'), fc.nat(), fc.integer({ min: 0, max: 255 })),
        { minLength: 1, maxLength: 8 },
      );
      await fc.assert(
        fc.asyncProperty(mutation, requestArb, async (edits, request) => {
          const bytes = [...seed];
          for (const [kind, at, byte] of edits) {
            const i = at % (bytes.length + 1);
            if (kind === 'flip') bytes[i % bytes.length] = byte;
            else if (kind === 'insert') bytes.splice(i, 0, byte);
            else bytes.splice(i % bytes.length, 1);
          }
          checkAccounting(await importBytes('mutated.csv', Uint8Array.from(bytes), request as ImportRequest));
        }),
        { numRuns: 4000 },
      );
    },
    propertyTimeout,
  );

  it(
    'gives back the accepted periods when they are exported and imported again (1,600 inputs)',
    async () => {
      let exercised = 0;
      await fc.assert(
        fc.asyncProperty(tableRows, delimiter, requestArb, async (rows, sep, request) => {
          const text = Papa.unparse([header, ...rows], { delimiter: sep });
          const first = await importPastedText(text, { ...(request as ImportRequest), delimiter: sep });
          checkAccounting(first);
          if (!first.ok) return;
          const periods = [...first.value.observations];
          if (periods.length > 0) exercised++;
          // The export: one row per accepted period, numbers as JavaScript prints them (shortest
          // round-trip form, decimal point), quoted where needed, comma-delimited.
          const exported = Papa.unparse([
            ['label', 'count', 'units', 'date'],
            ...periods.map((o) => [o.label, String(o.count), String(o.units), o.date ?? '']),
          ]);
          const again = await importPastedText(exported, {
            count: 'count',
            units: 'units',
            label: 'label',
            ...(periods.some((o) => o.date) ? { date: 'date' } : {}),
            delimiter: ',',
          });
          expect(again.ok).toBe(true);
          if (!again.ok) return;
          const strip = (o: { label: string; count: number; units: number; date?: string }) => ({
            label: o.label,
            count: o.count,
            units: o.units,
            date: o.date,
          });
          expect(again.value.observations.map(strip)).toEqual(periods.map(strip));
          expect(again.value.rejected).toEqual([]);
        }),
        { numRuns: 1600 },
      );
      // Guard against a vacuous pass: most generated tables must keep some periods to export.
      expect(exercised).toBeGreaterThan(400);
    },
    propertyTimeout,
  );
});
