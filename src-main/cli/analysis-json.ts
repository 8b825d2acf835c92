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
  // A 32-bit integer's text is its decimal digits (-0 too: String(-0) is "0", as in JSON).
  if ((value | 0) === value) return String(value);
  bits[0] = value;
  const slot = (words[0] ^ Math.imul(words[1], 0x9e3779b1)) >>> 20;
  // NaN never matches its slot.
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

/** A string JSON writes as it is between quotes (a loop: labels are short, and there is one per period). */
function isPlainText(value: unknown): value is string {
  if (typeof value !== 'string') return false;
  for (let i = 0; i < value.length; i++) {
    const c = value.charCodeAt(i);
    if (c < 0x20 || c === 0x22 || c === 0x5c || (c >= 0xd800 && c <= 0xdfff)) return false;
  }
  return true;
}
const isNumber = (value: unknown): value is number => typeof value === 'number';
const isStatus = (value: unknown): value is string =>
  value === 'in' || value === 'signal' || value === 'excluded';

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
    isStatus(status) &&
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

/**
 * UTF-8 bytes in chunks of at most `size` bytes, each handed to `write` once and never touched
 * again. Text is encoded natively straight into the chunk; no piece is split, and a piece longer
 * than a chunk goes alone.
 */
class ByteChunks {
  private chunk: Buffer | null = null;
  /** Bytes of the chunk written so far (a caller that wrote into `reserve`'s chunk moves it on). */
  used = 0;

  constructor(
    readonly size: number,
    private readonly write: (bytes: Uint8Array) => void,
  ) {}

  text(value: string): void {
    // At most three bytes per UTF-16 unit; the exact length only when that bound does not fit.
    if (this.used + 3 * value.length > this.size) {
      const bytes = Buffer.byteLength(value);
      if (this.used + bytes > this.size) {
        this.flush();
        if (bytes > this.size) return this.write(Buffer.from(value));
      }
    }
    this.chunk ??= Buffer.allocUnsafe(this.size);
    this.used += this.chunk.write(value, this.used);
  }

  /**
   * The chunk to write the next `bytes` bytes (at most `size`) into by hand, at `this.used`: a
   * fresh one when they do not fit in this one. The caller adds what it wrote to `used`.
   */
  reserve(bytes: number): Buffer {
    if (this.used + bytes > this.size) this.flush();
    return (this.chunk ??= Buffer.allocUnsafe(this.size));
  }

  flush(): void {
    if (this.chunk === null || this.used === 0) return;
    this.write(this.chunk.subarray(0, this.used));
    this.chunk = null;
    this.used = 0;
  }
}

/**
 * The bytes of a usual period after its row, `,"count":…,"rules":[]}`, kept by a hash of its count
 * and units: they depend only on the numbers and status checked below, and a long history has few
 * distinct ones (one rate, limits and z per count and k).
 */
interface PeriodTail {
  /** The period it was written for: a later one with the same numbers and status shares it. */
  period: PeriodResult;
  bytes: Uint8Array;
}
const tailSlots: (PeriodTail | undefined)[] = new Array<PeriodTail | undefined>(1024).fill(undefined);

/** Whether two usual periods write the same text after their rows. */
const sameTail = (a: PeriodResult, b: PeriodResult) =>
  a.count === b.count &&
  a.units === b.units &&
  a.rate === b.rate &&
  a.lcl === b.lcl &&
  a.ucl === b.ucl &&
  a.z === b.z &&
  a.status === b.status;

function periodTail(p: PeriodResult): Uint8Array {
  bits[0] = p.count;
  let hash = Math.imul(words[0] ^ words[1], 0x9e3779b1);
  bits[0] = p.units;
  hash = (hash ^ Math.imul(words[0] ^ words[1], 0x85ebca6b)) >>> 22;
  const kept = tailSlots[hash];
  if (kept !== undefined && sameTail(kept.period, p)) return kept.bytes;
  const lcl = p.lcl === null ? 'null' : numberText(p.lcl);
  const bytes = Buffer.from(
    `,"count":${numberText(p.count)},"units":${numberText(p.units)},"rate":${numberText(p.rate)},"lcl":${lcl},"ucl":${numberText(p.ucl)},"z":${numberText(p.z)},"status":"${p.status}","rules":[]}`,
  );
  tailSlots[hash] = { period: p, bytes };
  return bytes;
}

const labelStart = Buffer.from(',{"label":"');
const firstLabelStart = labelStart.subarray(1);
const rowStart = Buffer.from('","row":');

/** Writes the text of a row number at `at`, digit by digit for a whole number: returns the end. */
function putRow(chunk: Buffer, at: number, row: number): number {
  if (!(row >= 0 && row < 2 ** 31 && (row | 0) === row))
    return at + chunk.write(numberText(row), at, 'latin1');
  let digits = 1;
  for (let rest = row; rest >= 10; rest = (rest / 10) | 0) digits++;
  for (let i = digits - 1, rest = row; i >= 0; i--, rest = (rest / 10) | 0)
    chunk[at + i] = 0x30 + (rest % 10);
  return at + digits;
}

/**
 * One period's JSON into the chunks. The usual period is copied in as bytes: its opening, its label
 * (ASCII byte by byte, else encoded), its row's digits and its kept tail; any other goes as text.
 */
function writePeriod(out: ByteChunks, p: PeriodResult, first: boolean): void {
  const text = () => (first ? '' : ',') + periodJsonText(p);
  if (!isUsual(p)) return out.text(text());
  const label = p.label;
  const tail = periodTail(p);
  // The opening, the label at three bytes a unit at most, the row (at most 24 characters), the tail.
  const most = labelStart.length + 3 * label.length + rowStart.length + 24 + tail.length;
  if (most > out.size) return out.text(text());
  const chunk = out.reserve(most);
  let at = out.used;
  const opening = first ? firstLabelStart : labelStart;
  chunk.set(opening, at);
  at += opening.length;
  let ascii = true;
  for (let i = 0; i < label.length; i++) {
    const c = label.charCodeAt(i);
    if (c >= 0x80) {
      ascii = false;
      break;
    }
    chunk[at + i] = c;
  }
  at += ascii ? label.length : chunk.write(label, at);
  chunk.set(rowStart, at);
  at = putRow(chunk, at + rowStart.length, p.row);
  chunk.set(tail, at);
  out.used = at + tail.length;
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
  for (let i = 0; i < periods.length; i++) writePeriod(out, periods[i], i === 0);
  const tail = JSON.stringify(tailFields(result, outcome, iterations));
  out.text(`]${tail.length > 2 ? ',' + tail.slice(1) : '}'}`);
  out.flush();
}
