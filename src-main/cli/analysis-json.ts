import type { ImportOutcome } from '../../shared-core/import/import-report.js';
import type { AnalysisResult, Iteration, PeriodResult } from '../../shared-core/study/analysis-types.js';

/** One period in the shape of the analyze contract (also used by `check` for new periods). */
export function periodJson(p: PeriodResult) {
  return {
    label: p.label,
    row: p.row,
    ...(p.rows ? { rows: p.rows } : {}),
    count: p.count,
    units: p.units,
    rate: p.rate,
    lcl: p.lcl,
    ucl: p.ucl,
    z: p.z,
    status: p.status,
    rules: p.rules,
    ...(p.cause ? { cause: p.cause } : {}),
  };
}

/** The fields of the contract before the periods. */
const headFields = (result: AnalysisResult) => ({
  chart: result.chart,
  limits: result.limits,
  center: result.center,
  sigmaZ: result.sigmaZ,
});

/** The fields of the contract after the periods. */
const tailFields = (result: AnalysisResult, outcome: ImportOutcome, iterations: Iteration[]) => ({
  dispersion: result.dispersion,
  stable: result.stable,
  warnings: [
    ...outcome.report.warnings.map((w) => ({ code: w.code, message: w.message })),
    ...result.warnings,
  ],
  rejected: outcome.rejected,
  rate: result.rate,
  rateSource: result.rateSource,
  rateInterval: result.rateInterval,
  rateEffect: result.rateEffect,
  multiplier: result.multiplier,
  alpha: result.alpha,
  fap: result.fap,
  m: result.m,
  totals: result.totals,
  averageK: result.averageK,
  iterations,
  noProduction: outcome.noProduction.map((o) => ({ label: o.label, row: o.row })),
  import: outcome.report,
});

/**
 * The `analyze --json` object: DESIGN.md's contract first (chart, limits, center, sigmaZ, periods,
 * dispersion, stable, warnings, rejected), then the fields added since (they keep their meaning).
 */
export function analysisJson(result: AnalysisResult, outcome: ImportOutcome, iterations: Iteration[]) {
  return {
    ...headFields(result),
    periods: result.periods.map(periodJson),
    ...tailFields(result, outcome, iterations),
  };
}

/** Characters JSON.stringify escapes in a string (lone surrogates too, so any surrogate goes there). */
// eslint-disable-next-line no-control-regex -- control characters are exactly what JSON escapes
const needsEscape = /["\\\u0000-\u001f\ud800-\udfff]/;

/**
 * Number texts already written, in a small table indexed by a hash of the number's bits: the
 * limits, rates and z of a history repeat (one per distinct k, one per distinct count and k), and
 * writing a double's shortest form is the slow part. A slot holds the last number hashed to it.
 */
const slots = 4096;
const slotNumbers = new Float64Array(slots).fill(NaN);
const slotTexts: string[] = new Array<string>(slots).fill('');
const bits = new Float64Array(1);
const words = new Uint32Array(bits.buffer);

function numberText(value: number): string {
  bits[0] = value;
  const slot = (words[0] ^ Math.imul(words[1], 0x9e3779b1)) >>> 20;
  // -0 finds 0's slot text "0", which is also how JSON writes -0; NaN never matches.
  if (slotNumbers[slot] === value) return slotTexts[slot];
  const text = Number.isFinite(value) ? String(value) : 'null';
  slotNumbers[slot] = value;
  slotTexts[slot] = text;
  return text;
}

/** `JSON.stringify(value)` for one value, with numbers, plain strings and empty arrays written directly. */
function jsonValue(value: unknown): string | undefined {
  if (typeof value === 'number') return numberText(value);
  if (typeof value === 'string') return needsEscape.test(value) ? JSON.stringify(value) : `"${value}"`;
  if (Array.isArray(value) && value.length === 0) return '[]';
  return JSON.stringify(value);
}

/** `,"key":value`, or nothing when JSON.stringify would leave the key out. */
function member(key: string, value: unknown): string {
  const written = jsonValue(value);
  return written === undefined ? '' : `,"${key}":${written}`;
}

const isPlainText = (value: unknown): value is string =>
  typeof value === 'string' && !needsEscape.test(value);
const isNumber = (value: unknown): value is number => typeof value === 'number';

/** The usual period: a plain label and status, numbers, no rule fired, not excluded, no rows. */
function isUsual(p: PeriodResult): boolean {
  const { label, row, count, units, rate, lcl, ucl, z, status, rules } = p;
  return (
    isPlainText(label) &&
    isNumber(row) &&
    isNumber(count) &&
    isNumber(units) &&
    isNumber(rate) &&
    (lcl === null || isNumber(lcl)) &&
    isNumber(ucl) &&
    isNumber(z) &&
    isPlainText(status) &&
    Array.isArray(rules) &&
    rules.length === 0 &&
    !p.rows &&
    !p.cause
  );
}

/** `JSON.stringify(periodJson(p))`, without building the object. */
export function periodJsonText(p: PeriodResult): string {
  const text =
    member('label', p.label) +
    member('row', p.row) +
    (p.rows ? member('rows', p.rows) : '') +
    member('count', p.count) +
    member('units', p.units) +
    member('rate', p.rate) +
    member('lcl', p.lcl) +
    member('ucl', p.ucl) +
    member('z', p.z) +
    member('status', p.status) +
    member('rules', p.rules) +
    (p.cause ? member('cause', p.cause) : '');
  return text === '' ? '{}' : `{${text.slice(1)}}`;
}

const encoder = new TextEncoder();

/**
 * UTF-8 bytes in chunks of at most `size` bytes, each handed to `write` once. Pieces of text are
 * joined as a string (cheap in V8) and encoded a chunk at a time by the native encoder: at most three
 * bytes per UTF-16 unit, so a chunk of size/3 units never passes `size` bytes.
 */
class ByteChunks {
  private pending = '';
  private readonly units: number;

  constructor(
    size: number,
    private readonly write: (bytes: Uint8Array) => void,
  ) {
    this.units = Math.max(1, Math.floor(size / 3));
  }

  text(value: string): void {
    if (this.pending.length + value.length > this.units) {
      this.flush();
      // A piece longer than a chunk goes alone (a long period), never split inside.
      if (value.length > this.units) return this.write(encoder.encode(value));
    }
    this.pending += value;
  }

  flush(): void {
    if (this.pending === '') return;
    this.write(encoder.encode(this.pending));
    this.pending = '';
  }
}

/** One period's JSON into the chunks: the usual period from one template, any other as text. */
function writePeriod(out: ByteChunks, p: PeriodResult): void {
  if (!isUsual(p)) return out.text(periodJsonText(p));
  const lcl = p.lcl === null ? 'null' : numberText(p.lcl);
  out.text(
    `{"label":"${p.label}","row":${numberText(p.row)},"count":${numberText(p.count)},"units":${numberText(p.units)},"rate":${numberText(p.rate)},"lcl":${lcl},"ucl":${numberText(p.ucl)},"z":${numberText(p.z)},"status":"${p.status}","rules":[]}`,
  );
}

/**
 * Writes the UTF-8 bytes of `JSON.stringify(analysisJson(...))` to `write` in chunks of
 * `chunkBytes`: the periods, nearly all of a long history's text, go into the chunks one by one,
 * never built as objects or as one string.
 */
export function writeAnalysisJson(
  result: AnalysisResult,
  outcome: ImportOutcome,
  iterations: Iteration[],
  write: (bytes: Uint8Array) => void,
  chunkBytes = 1 << 20,
): void {
  const out = new ByteChunks(chunkBytes, write);
  const head = JSON.stringify(headFields(result));
  out.text(`${head.slice(0, -1)}${head.length > 2 ? ',' : ''}"periods":[`);
  const periods = result.periods;
  for (let i = 0; i < periods.length; i++) {
    if (i > 0) out.text(',');
    writePeriod(out, periods[i]);
  }
  const tail = JSON.stringify(tailFields(result, outcome, iterations));
  out.text(`]${tail.length > 2 ? ',' + tail.slice(1) : '}'}`);
  out.flush();
}
