import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  analysisJson,
  periodJson,
  periodJsonText,
  writeAnalysisJson,
} from '../../src-main/cli/analysis-json.js';
import type { ImportOutcome } from '../../shared-core/import/import-report.js';
import type { AnalysisResult, Iteration, PeriodResult } from '../../shared-core/study/analysis-types.js';
import { analyzePhaseOne } from '../../shared-core/study/phase-one.js';
import { defaultOptions } from '../../shared-core/study/analysis-types.js';
import { iterationSnapshot } from '../../shared-core/study/iteration-history.js';

// The hand-written writer of `analyze --json` must give JSON.stringify's text to the byte (the
// reference is the JavaScript engine's own JSON.stringify, ECMA-262 §25.5.2): numbers in their
// shortest form, -0 as 0, NaN and infinities as null, keys left out where the value is undefined,
// strings escaped (quotes, backslashes, control characters, lone surrogates).

const number = fc.oneof(
  fc.double(),
  fc.constantFrom(
    0,
    -0,
    NaN,
    Infinity,
    -Infinity,
    1e21,
    1e-7,
    5e-324,
    Number.MAX_VALUE,
    0.1 + 0.2,
    123456789012,
  ),
  fc.integer(),
);
const text = fc.oneof(
  fc.string(),
  fc.string({ unit: 'grapheme' }),
  fc.string({ unit: 'binary' }),
  fc.constantFrom('L1', 'Lé', '€', 'a"b', 'a\\b', '\n\t\u0000\u001f', '\ud800', '\udfff x', '😀', '\u2028'),
);
const cause = fc.record(
  { category: text, description: text, reference: text },
  { requiredKeys: ['category', 'description'] },
);

/** A period as the analysis gives it, the common shape the writer takes in one template. */
const usualPeriod: fc.Arbitrary<PeriodResult> = fc
  .record({
    index: fc.nat(),
    label: text,
    row: fc.nat(),
    count: number,
    units: number,
    rate: number,
    center: number,
    lcl: fc.oneof(number, fc.constant(null)),
    ucl: number,
    z: number,
    status: fc.constantFrom('in', 'signal', 'excluded', 'é"'),
    rules: fc.oneof(fc.constant([]), fc.array(fc.constantFrom('beyond', 'run'))),
  })
  .map((p) => p as unknown as PeriodResult);

const anyPeriod: fc.Arbitrary<PeriodResult> = fc
  .record(
    {
      index: fc.nat(),
      label: text,
      row: fc.nat(),
      rows: fc.tuple(fc.nat(), fc.nat()),
      count: number,
      units: number,
      rate: number,
      center: number,
      lcl: fc.oneof(number, fc.constant(null)),
      ucl: number,
      z: number,
      status: fc.constantFrom('in', 'signal', 'excluded'),
      rules: fc.array(fc.constantFrom('beyond', 'run', 'trend', 'zone-a', 'é"')),
      cause,
    },
    // Optional fields, and required ones left out too: the writer must leave out what stringify does.
    { requiredKeys: ['index', 'row', 'count', 'status'] },
  )
  .map((p) => p as PeriodResult);

const period = fc.oneof(usualPeriod, anyPeriod);

function analysisOf(periods: PeriodResult[]): {
  result: AnalysisResult;
  outcome: ImportOutcome;
  iterations: Iteration[];
} {
  const analyzed = analyzePhaseOne(
    [
      { label: 'A', row: 2, count: 3, units: 10 },
      { label: 'B', row: 3, count: 5, units: 12 },
    ],
    [],
    defaultOptions,
  );
  if (!analyzed.ok) throw new Error('the base analysis failed');
  const result = { ...analyzed.value, periods };
  const outcome = {
    observations: [],
    rejected: [{ row: 4, column: 'count', value: '-1', message: 'is negative' }],
    noProduction: [{ label: 'Z"', row: 9, count: 0, units: 0 }],
    report: { warnings: [{ code: 'x', message: 'ü\n' }] },
  } as unknown as ImportOutcome;
  return { result, outcome, iterations: [iterationSnapshot(analyzed.value)] };
}

describe('writeAnalysisJson', () => {
  it('writes each period as JSON.stringify(periodJson(p)) does (2,000 generated periods)', () => {
    fc.assert(
      fc.property(period, (p) => {
        const written = periodJsonText(p);
        expect(written).toBe(JSON.stringify(periodJson(p)));
        expect(JSON.parse(written)).toEqual(JSON.parse(JSON.stringify(periodJson(p))));
      }),
      { numRuns: 2000 },
    );
  });

  it('writes the whole object as JSON.stringify does, in chunks of any size (300 generated results)', () => {
    fc.assert(
      fc.property(fc.array(period, { maxLength: 40 }), fc.integer({ min: 1, max: 5000 }), (periods, size) => {
        const { result, outcome, iterations } = analysisOf(periods);
        const chunks: Uint8Array[] = [];
        writeAnalysisJson(result, outcome, iterations, (chunk) => chunks.push(chunk), size);
        const expected = JSON.stringify(analysisJson(result, outcome, iterations));
        // Byte for byte the UTF-8 of JSON.stringify's text, and the same text read back.
        expect(Buffer.concat(chunks).equals(Buffer.from(expected, 'utf8'))).toBe(true);
        expect(new TextDecoder().decode(Buffer.concat(chunks))).toBe(expected);
        // No chunk is over the size asked for, unless one piece of text is (a long period).
        const longest = Math.max(
          ...periods.map((p) => Buffer.byteLength(JSON.stringify(periodJson(p)))),
          2000,
        );
        for (const chunk of chunks) expect(chunk.length).toBeLessThanOrEqual(Math.max(size, longest));
      }),
      { numRuns: 300 },
    );
  });

  it('writes a real analysis of 5,000 periods byte for byte, repeated numbers included', () => {
    const observations = Array.from({ length: 5000 }, (_, i) => ({
      label: `P${i + 1}`,
      row: i + 2,
      count: (i * 7919) % 13,
      units: 8 + (i % 5),
    }));
    const analyzed = analyzePhaseOne(
      observations,
      [{ index: 3, cause: { category: 'tooling', description: 'worn die' } }],
      defaultOptions,
    );
    if (!analyzed.ok) throw new Error('the analysis failed');
    const { outcome, iterations } = analysisOf([]);
    const chunks: Uint8Array[] = [];
    writeAnalysisJson(analyzed.value, outcome, iterations, (chunk) => chunks.push(chunk), 4096);
    expect(chunks.length).toBeGreaterThan(10);
    for (const chunk of chunks) expect(chunk.length).toBeLessThanOrEqual(4096);
    const expected = JSON.stringify(analysisJson(analyzed.value, outcome, iterations));
    expect(Buffer.concat(chunks).equals(Buffer.from(expected, 'utf8'))).toBe(true);
  });

  it('writes periods that share a count and units but differ elsewhere each with its own numbers', () => {
    const base = {
      index: 0,
      label: 'A',
      row: 2,
      count: 4,
      units: 10,
      rate: 0.4,
      center: 0.5,
      lcl: null,
      ucl: 1.2,
      z: -0.4,
      status: 'in',
      rules: [],
    } as PeriodResult;
    const periods: PeriodResult[] = [
      base,
      { ...base, label: 'B', row: 3 },
      { ...base, label: 'C', row: 4, z: -0.5 },
      { ...base, label: 'D', row: 5, lcl: 0.01 },
      { ...base, label: 'E', row: 6, ucl: 1.3 },
      { ...base, label: 'F', row: 7, rate: 0.41 },
      { ...base, label: 'G', row: 8, status: 'excluded' },
      { ...base, label: 'H', row: 9, count: -0 },
      { ...base, label: 'I', row: 10, count: 0 },
      { ...base, label: 'Ü', row: 2 ** 40 },
    ];
    const { result, outcome, iterations } = analysisOf(periods);
    const chunks: Uint8Array[] = [];
    writeAnalysisJson(result, outcome, iterations, (chunk) => chunks.push(chunk), 300);
    const expected = JSON.stringify(analysisJson(result, outcome, iterations));
    expect(Buffer.concat(chunks).toString('utf8')).toBe(expected);
  });
});
