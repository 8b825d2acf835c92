import fc from 'fast-check';
import iconv from 'iconv-lite';
import { describe, expect, it } from 'vitest';
import { decodeText } from '../../src-main/services/import/decode-text.js';
import { fastDelimitedOutcome } from '../../src-main/services/import/fast-delimited.js';
import { importBytes } from '../../src-main/services/import/import-file.js';
import { importLimits } from '../../src-main/services/import/import-limits.js';
import type { ImportRequest } from '../../src-main/services/import/import-request.js';
import { sha256Hex } from '../../shared-core/study/sha256.js';

// The one-pass reader of common delimited files must give what the general reader (papaparse, then
// readObservations) gives, to the byte: generated files full of the cases where the two could part
// (quotes, blank rows, short and long rows, spaces, decimals, leading zeros, zero units, line
// breaks, byte-order marks, encodings) are imported both ways and the outcomes compared.

const countCell = fc.oneof(
  { weight: 6, arbitrary: fc.nat({ max: 60 }).map(String) },
  {
    weight: 2,
    arbitrary: fc.constantFrom('0', ' 4', '5 ', '007', '00', '', ' ', '-1', '2.0', '3.5', '1,5', '1e2', 'x'),
  },
  { weight: 1, arbitrary: fc.nat({ max: 60 }).map((n) => `"${n}"`) },
);
const unitsCell = fc.oneof(
  { weight: 6, arbitrary: fc.integer({ min: 1, max: 30 }).map(String) },
  {
    weight: 3,
    arbitrary: fc.constantFrom(
      '2.5',
      '2.50',
      '2.500',
      '1.234',
      '0.125',
      '12.0',
      ' 8',
      '9 ',
      '0',
      '0.0',
      '010',
    ),
  },
  { weight: 1, arbitrary: fc.constantFrom('', '1,5', '1.234,5', '-3', '1e3', '1 000', '"8"', 'n/a') },
);
const labelCell = fc.oneof(
  { weight: 5, arbitrary: fc.nat({ max: 40 }).map((n) => `L${n}`) },
  {
    weight: 2,
    arbitrary: fc.constantFrom(
      '',
      ' ',
      ' L1 ',
      'Lé',
      '€',
      '"q"',
      '"a,b"',
      '"a;b"',
      '"x""y"',
      'a"b',
      '"x\ny"',
      '\u00a0',
    ),
  },
  { weight: 1, arbitrary: fc.string({ maxLength: 5 }) },
);
/** Real days as yyyy-mm-dd (the one-pass reader takes those), in and out of order, with gaps. */
const isoDayCell = fc
  .integer({ min: 0, max: 60 })
  .map((day) => new Date(Date.UTC(2026, 0, 5) + day * 86_400_000).toISOString().slice(0, 10));
/** ISO dates mostly, with others that go the general way. */
const dateCell = fc.oneof(
  { weight: 8, arbitrary: isoDayCell },
  {
    weight: 1,
    arbitrary: fc.constantFrom(
      '2026-02-29',
      '2026-13-01',
      ' 2026-03-02',
      '2026/03/02',
      '03/04/2026',
      '',
      '2026-3-2',
    ),
  },
);
const extraCell = fc.constantFrom('', ' ', 'note', '"n"', '');

/** Cells the fast reader takes: plain numbers (some with spaces or a point), simple quotes, any label. */
const tidyLine = fc.oneof(
  {
    weight: 12,
    arbitrary: fc
      .tuple(
        fc.oneof(
          fc.nat({ max: 40 }).map((n) => `L${n}`),
          fc.constantFrom('', ' L1 ', 'Lé', '€', '"a,b"', '""'),
        ),
        fc.oneof(fc.nat({ max: 60 }).map(String), fc.constantFrom(' 4', '0')),
        fc.oneof(
          fc.integer({ min: 1, max: 30 }).map(String),
          fc.constantFrom('2.5', '2.50', '2.500', '0.125', ' 8'),
        ),
        isoDayCell,
      )
      .map((cells) => [...cells]),
  },
  {
    weight: 1,
    arbitrary: fc.constantFrom(
      ['', '', '', ''],
      ['', '', '', '', 'note'],
      ['L9', '0', '0', '2026-01-09'],
      ['L8', '3', '7', '2026-01-02', ''],
    ),
  },
);

const line = fc.oneof(
  { weight: 12, arbitrary: fc.tuple(labelCell, countCell, unitsCell, dateCell).map((cells) => [...cells]) },
  { weight: 1, arbitrary: fc.tuple(labelCell, countCell).map((cells) => [...cells]) },
  {
    weight: 1,
    arbitrary: fc.tuple(labelCell, countCell, unitsCell, dateCell, extraCell).map((cells) => [...cells]),
  },
  { weight: 1, arbitrary: fc.constantFrom([''], [' '], ['', '', ''], [' ', '', '\t']) },
);

const headers = fc.constantFrom(
  ['lot', 'count', 'units', 'date'],
  ['lot', 'count', 'units', 'date'],
  ['Lot', ' count ', 'UNITS', 'Date'],
  ['"lot"', 'count', 'units', 'date'],
  ['lot', 'count', 'units', 'date', 'remark'],
  ['lot', 'count', 'units'],
  ['lot', 'count'],
);

const file = fc.record({
  header: headers,
  lines: fc.oneof(
    { weight: 2, arbitrary: fc.array(tidyLine, { maxLength: 30 }) },
    { weight: 1, arbitrary: fc.array(line, { maxLength: 30 }) },
  ),
  delimiter: fc.constantFrom(',', ';', '\t', '|'),
  newline: fc.constantFrom('\n', '\n', '\n', '\r\n', '\r\n', '\r', 'mixed'),
  trailing: fc.constantFrom('', '\n', '\n\n', '\n \n'),
  above: fc.constantFrom('', '', '', '', '', 'Invented line 4 history\n', 'sep=;\n'),
  statedDelimiter: fc.constantFrom('same', 'none', 'none', 'other'),
  encoding: fc.constantFrom('utf-8', 'utf-8', 'utf-8-bom', 'windows-1252', 'utf-16le'),
  request: fc.record(
    {
      units: fc.constantFrom('units', undefined),
      label: fc.constantFrom('lot', undefined),
      date: fc.constantFrom('date', undefined),
      dateOrder: fc.constantFrom('dmy' as const, 'mdy' as const, undefined, undefined),
      decimal: fc.constantFrom('comma' as const, 'point' as const, undefined, undefined),
      inspectionUnit: fc.constant('one board'),
    },
    { requiredKeys: [] },
  ),
});

type GeneratedFile = typeof file extends fc.Arbitrary<infer T> ? T : never;

function text(f: GeneratedFile): string {
  const records = [f.header, ...f.lines].map((cells) => cells.join(f.delimiter));
  let body = '';
  records.forEach((record, i) => {
    const newline = f.newline === 'mixed' ? (i % 3 === 0 ? '\r\n' : '\n') : f.newline;
    body += i === 0 ? record : newline + record;
  });
  return f.above + body + f.trailing;
}

function encode(content: string, how: string): Uint8Array {
  if (how === 'utf-8-bom') return new Uint8Array([0xef, 0xbb, 0xbf, ...new TextEncoder().encode(content)]);
  if (how === 'utf-16le') return new Uint8Array(iconv.encode(content, 'utf-16le', { addBOM: true }));
  if (how === 'windows-1252') return new Uint8Array(iconv.encode(content, 'windows-1252'));
  return new TextEncoder().encode(content);
}

// CPU-bound: a generous timeout, since CI runs the suites side by side on two cores.
const propertyTimeout = 120_000;

describe('the one-pass delimited reader (property)', () => {
  it(
    'gives the general reader’s outcome, byte for byte, or hands the file over (3,000 files)',
    async () => {
      let handled = 0;
      let handledDated = 0;
      let runs = 0;
      await fc.assert(
        fc.asyncProperty(file, async (f) => {
          runs++;
          const bytes = encode(text(f), f.encoding);
          const request = { count: 'count', ...f.request } as ImportRequest;
          if (f.statedDelimiter === 'same') request.delimiter = f.delimiter;
          if (f.statedDelimiter === 'other') request.delimiter = f.delimiter === ',' ? ';' : ',';
          const general = await importBytes('gen.csv', bytes, request, undefined, {
            generalReaderOnly: true,
          });
          const chosen = await importBytes('gen.csv', bytes, request);
          expect(JSON.stringify(chosen)).toBe(JSON.stringify(general));
          expect(chosen).toEqual(general);

          const decoded = decodeText(bytes, 'gen.csv', request.encoding);
          if (!decoded.ok) return;
          const { text: content, encoding, source } = decoded.value;
          const fast = fastDelimitedOutcome(
            content,
            'gen.csv',
            {
              format: 'delimited',
              sha256: sha256Hex(bytes),
              bytes: bytes.byteLength,
              encoding,
              encodingSource: source,
            },
            request,
            importLimits,
          );
          if (fast === null) return;
          handled++;
          if (request.date !== undefined) handledDated++;
          expect(general.ok).toBe(true);
          if (general.ok) expect(JSON.stringify(fast)).toBe(JSON.stringify(general.value));
        }),
        { numRuns: 3000 },
      );
      // Both branches are exercised: a good share of the files is read the fast way.
      expect(handled / runs).toBeGreaterThan(0.12);
      expect(handled / runs).toBeLessThan(0.9);
      expect(handledDated / runs).toBeGreaterThan(0.03);
    },
    propertyTimeout,
  );

  it('hands over a file with more data rows than the limit, blank rows between them counted', async () => {
    const content = 'lot,count\nL1,1\n\nL2,2\n';
    const bytes = new TextEncoder().encode(content);
    const source = { format: 'delimited' as const, sha256: sha256Hex(bytes), bytes: bytes.length };
    const limits = { ...importLimits, maxRows: 2 };
    expect(fastDelimitedOutcome(content, 'f.csv', source, { count: 'count' }, limits)).toBeNull();
    const general = await importBytes('f.csv', bytes, { count: 'count' }, undefined, {
      limits: { maxRows: 2 },
    });
    expect(general.ok).toBe(false);
  });
});
