import { signalsHigh, signalsLow, type CountLimits } from '../charts/count-limits.js';
import { probabilityLimits } from '../charts/probability-limits.js';
import { sigmaLimits } from '../charts/sigma-limits.js';
import { standardizedValue } from '../charts/standardized-value.js';
import { fail, ok, type Result } from '../result.js';
import { poissonCdf, poissonUpperTail } from '../stats/poisson.js';
import type { AnalysisResult, RuleId, Warning } from '../study/analysis-types.js';
import {
  averageRunLengthOfChain,
  runLengthChain,
  symbolKey,
  type PointSymbol,
  type SymbolProbability,
} from './run-length-chain.js';

/** The rises in the rate a change packet shows by default: +25 %, +50 %, +100 %. */
export const defaultShifts: readonly number[] = [1.25, 1.5, 2];

/** A set of limits at one number of inspection units k, with what the rules need to place a count. */
export interface LimitsAtUnits {
  /** The in-control rate per inspection unit ū the limits were set at. */
  rate: number;
  /** k, the inspection units of a period. */
  units: number;
  /** The count limits at k (the test that `beyond` makes). */
  limits: CountLimits;
  /** Laney's σz, which scales z; null or omitted for sigma and probability limits. */
  sigmaZ?: number | null;
}

export interface RunLengthPoint {
  /** The rate as a multiple of the in-control rate: 1 in control, 1.25 for a rise of 25 %. */
  shift: number;
  /** The rate per inspection unit at this shift. */
  rate: number;
  /** Probability that one period is beyond a limit at this rate. */
  beyondProbability: number;
  /** Expected number of periods to the first signal, from the first period; null when infinite. */
  arl: number | null;
}

export interface AverageRunLength {
  units: number;
  rules: RuleId[];
  /** `closed form` (1/p, the one-point rule alone) or `Markov chain` (rule sets). */
  method: 'closed form' | 'Markov chain';
  /** States of the chain (1 for the closed form). */
  states: number;
  /** The in-control point first, then each shift in the order asked. */
  points: RunLengthPoint[];
  warnings: Warning[];
}

/**
 * What the rules see of every possible count at k, grouped into the symbols that differ, each
 * with the run of counts [from, to] (to = +∞ for the last one) it covers. The symbol changes only
 * where z crosses 0, ±1, ±2 or the count crosses a limit, so a few runs cover every count.
 */
export function countSymbols(at: LimitsAtUnits): { symbol: PointSymbol; from: number; to: number }[] {
  const { rate, units, limits } = at;
  const sigmaZ = at.sigmaZ ?? 1;
  const mean = rate * units;
  const spread = Math.sqrt(mean) * sigmaZ;
  const breaks = new Set<number>([0]);
  const addAround = (x: number) => {
    if (!Number.isFinite(x)) return;
    const f = Math.floor(x);
    for (let d = -1; d <= 2; d++) if (f + d >= 0) breaks.add(f + d);
  };
  for (const c of [-2, -1, 0, 1, 2]) addAround(mean + c * spread);
  addAround(limits.upper);
  if (limits.lower !== null) addAround(limits.lower);
  const starts = [...breaks].sort((a, b) => a - b);
  const runs: { symbol: PointSymbol; from: number; to: number }[] = [];
  for (const from of starts) {
    const symbol = symbolOfCount(from, at);
    const last = runs[runs.length - 1];
    if (last && symbolKey(last.symbol) === symbolKey(symbol)) continue;
    if (last) last.to = from - 1;
    runs.push({ symbol, from, to: Number.POSITIVE_INFINITY });
  }
  return runs;
}

function symbolOfCount(count: number, at: LimitsAtUnits): PointSymbol {
  const z = standardizedValue(count / at.units, at.rate, at.units, at.sigmaZ ?? 1);
  const sign = (v: number): -1 | 0 | 1 => (v > 0 ? 1 : v < 0 ? -1 : 0);
  return {
    beyond: signalsHigh(count, at.limits) || signalsLow(count, at.limits),
    zoneA: z > 2 ? 1 : z < -2 ? -1 : 0,
    zoneB: z > 1 ? 1 : z < -1 ? -1 : 0,
    side: sign(z),
    inner: Math.abs(z) < 1,
  };
}

/**
 * P(from ≤ X ≤ to) for X ~ Poisson(mean), from the tail that keeps the digits: the lower tail
 * below the mean, the upper tail above it.
 */
function poissonRange(from: number, to: number, mean: number): number {
  if (from > mean)
    return (
      poissonUpperTail(from, mean) - (to === Number.POSITIVE_INFINITY ? 0 : poissonUpperTail(to + 1, mean))
    );
  const upper = to === Number.POSITIVE_INFINITY ? 1 : poissonCdf(to, mean);
  return upper - (from === 0 ? 0 : poissonCdf(from - 1, mean));
}

/** The per-symbol probabilities of a period whose count is Poisson with mean shift·ū·k. */
export function countSymbolProbabilities(at: LimitsAtUnits, shift: number): SymbolProbability[] {
  const mean = shift * at.rate * at.units;
  return countSymbols(at).map(({ symbol, from, to }) => ({
    symbol,
    probability: Math.max(0, poissonRange(from, to, mean)),
  }));
}

/**
 * The average run length (ARL) of a set of limits at k when the counts are Poisson at the in-control
 * rate and at rises of it: the expected number of periods until the first signal.
 *
 *   one-point rule `beyond` alone: ARL = 1/p,  p = P(X > UCL) + P(X < LCL),  X ~ Poisson(s·ū·k)
 *   rule sets: ARL from the Markov chain of the rules (run-length-chain.ts)
 *
 * Exact Poisson probabilities, no normal approximation; the rules count from the first period with
 * complete windows, as the Review screen applies them.
 * Sources: Montgomery, Introduction to Statistical Quality Control, ch. 5 (ARL = 1/p); Champ &
 * Woodall (1987), Technometrics 29(4) (rule sets).
 */
export function averageRunLength(
  at: LimitsAtUnits,
  rules: readonly RuleId[],
  shifts: readonly number[] = defaultShifts,
): Result<AverageRunLength> {
  if (!(at.rate > 0) || !(at.units > 0) || !Number.isFinite(at.rate) || !Number.isFinite(at.units))
    return fail({ message: 'the limits need a positive rate and a positive number of inspection units' });
  const bad = shifts.find((s) => !(s > 0) || !Number.isFinite(s));
  if (bad !== undefined)
    return fail({ value: String(bad), message: 'a shift must be a positive multiple of the rate' });
  const unique = [...new Set(rules)];
  const all = [1, ...shifts.filter((s) => s !== 1)];
  const symbols = countSymbols(at).map((run) => run.symbol);
  const beyondOnly = unique.length === 1 && unique[0] === 'beyond';
  const chain = beyondOnly ? null : runLengthChain(unique, symbols);
  if (chain && !chain.ok) return chain;

  const points = all.map((shift): RunLengthPoint => {
    const probabilities = countSymbolProbabilities(at, shift);
    const beyondProbability = probabilities.reduce(
      (sum, p) => sum + (p.symbol.beyond ? p.probability : 0),
      0,
    );
    const arl = chain
      ? averageRunLengthOfChain(
          chain.value,
          probabilities.map((p) => p.probability),
        )
      : 1 / beyondProbability;
    return { shift, rate: shift * at.rate, beyondProbability, arl: Number.isFinite(arl) ? arl : null };
  });
  const warnings: Warning[] = [];
  if ((at.sigmaZ ?? 1) > 1)
    warnings.push({
      code: 'arl-poisson-only',
      message: `the run lengths assume Poisson counts; these data vary more than that (σz = ${(at.sigmaZ as number).toFixed(2)}), so real run lengths to a false alarm are shorter`,
    });
  if (points[0].arl === null)
    warnings.push({
      code: 'arl-no-signal',
      message:
        'at this number of inspection units no count can signal in control: the limits cannot raise an alarm',
    });
  return ok({
    units: at.units,
    rules: unique,
    method: beyondOnly ? 'closed form' : 'Markov chain',
    states: chain ? chain.value.states : 1,
    points,
    warnings,
  });
}

/**
 * The limits an analysis sets at k (the same method, rate, multiplier, α and σz), for the run
 * lengths of approved or proposed limits at a typical number of inspection units.
 */
export function limitsAtUnits(result: AnalysisResult, units: number): LimitsAtUnits {
  const limits =
    result.limits === 'probability'
      ? probabilityLimits(result.rate, units, result.alpha ?? 0.0027)
      : sigmaLimits(result.rate, units, result.multiplier, result.sigmaZ ?? 1);
  return { rate: result.rate, units, limits, sigmaZ: result.sigmaZ };
}

/** The typical k of an analysis: the common k of a c chart, else the mean k of the included periods. */
export function typicalUnits(result: AnalysisResult): number {
  return result.totals.units / result.m;
}
