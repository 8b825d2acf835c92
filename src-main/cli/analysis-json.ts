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

/** `JSON.stringify(periodJson(p))`, without building the object. */
export function periodJsonText(p: PeriodResult): string {
  const { label, row, count, units, rate, lcl, ucl, z, status, rules } = p;
  // The usual period (plain label, numbers, no rule fired, not excluded) in one template.
  if (
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
  ) {
    const lower = lcl === null ? 'null' : numberText(lcl);
    return `{"label":"${label}","row":${numberText(row)},"count":${numberText(count)},"units":${numberText(units)},"rate":${numberText(rate)},"lcl":${lower},"ucl":${numberText(ucl)},"z":${numberText(z)},"status":"${status}","rules":[]}`;
  }
  const text =
    member('label', label) +
    member('row', row) +
    (p.rows ? member('rows', p.rows) : '') +
    member('count', count) +
    member('units', units) +
    member('rate', rate) +
    member('lcl', lcl) +
    member('ucl', ucl) +
    member('z', z) +
    member('status', status) +
    member('rules', rules) +
    (p.cause ? member('cause', p.cause) : '');
  return text === '' ? '{}' : `{${text.slice(1)}}`;
}

/**
 * Writes `JSON.stringify(analysisJson(...))` to `write` in chunks of about `chunkChars` characters:
 * the periods, nearly all of the text for a long history, are written one by one instead of being
 * built as objects and stringified as one string.
 */
export function writeAnalysisJson(
  result: AnalysisResult,
  outcome: ImportOutcome,
  iterations: Iteration[],
  write: (chunk: string) => void,
  chunkChars = 1 << 20,
): void {
  const head = JSON.stringify(headFields(result));
  let prefix = `${head.slice(0, -1)}${head.length > 2 ? ',' : ''}"periods":[`;
  // Periods are joined chunk by chunk: a join gives one flat string, where adding each period to
  // the chunk would give a deep chain of pieces that is slow to turn into bytes.
  let parts: string[] = [];
  let size = 0;
  for (const period of result.periods) {
    const text = periodJsonText(period);
    parts.push(text);
    size += text.length + 1;
    if (size >= chunkChars) {
      write(prefix + parts.join(','));
      prefix = ',';
      parts = [];
      size = 0;
    }
  }
  const rest = parts.length > 0 ? prefix + parts.join(',') : prefix === ',' ? '' : prefix;
  const tail = JSON.stringify(tailFields(result, outcome, iterations));
  write(`${rest}]${tail.length > 2 ? ',' + tail.slice(1) : '}'}`);
}
