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
 * Number texts already written: the limits, rates and z of a history repeat (one per distinct k,
 * one per distinct count and k), and writing a double's shortest form is the slow part.
 */
const numberTexts = new Map<number, string>();
const maxRemembered = 65_536;

/** `JSON.stringify(value)` for one value, with numbers, plain strings and empty arrays written directly. */
function jsonValue(value: unknown): string | undefined {
  if (typeof value === 'number') {
    let text = numberTexts.get(value);
    if (text === undefined) {
      text = Number.isFinite(value) ? String(value) : 'null';
      if (numberTexts.size < maxRemembered) numberTexts.set(value, text);
    }
    return text;
  }
  if (typeof value === 'string') return needsEscape.test(value) ? JSON.stringify(value) : `"${value}"`;
  if (Array.isArray(value) && value.length === 0) return '[]';
  return JSON.stringify(value);
}

/** `,"key":value`, or nothing when JSON.stringify would leave the key out. */
function member(key: string, value: unknown): string {
  const written = jsonValue(value);
  return written === undefined ? '' : `,"${key}":${written}`;
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
  let chunk = `${head.slice(0, -1)}${head.length > 2 ? ',' : ''}"periods":[`;
  const periods = result.periods;
  for (let i = 0; i < periods.length; i++) {
    chunk += i === 0 ? periodJsonText(periods[i]) : ',' + periodJsonText(periods[i]);
    if (chunk.length >= chunkChars) {
      write(chunk);
      chunk = '';
    }
  }
  const tail = JSON.stringify(tailFields(result, outcome, iterations));
  write(`${chunk}]${tail.length > 2 ? ',' + tail.slice(1) : '}'}`);
}
