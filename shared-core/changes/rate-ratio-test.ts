import { fail, ok, type Finding, type Result } from '../result.js';
import { binomialCdf, binomialPmf, binomialUpperTail } from '../stats/binomial.js';
import { inverseRegularizedBeta } from '../stats/incomplete-beta.js';
import type { Warning } from '../study/analysis-types.js';

/** A total count of nonconformities found in a total number of inspection units. */
export interface RateSample {
  count: number;
  units: number;
}

export interface RateRatioOptions {
  /** Confidence of the interval (default 0.95). */
  confidence?: number;
  /** The periods of either sample vary more than Poisson counts do (the dispersion check). */
  overdispersed?: boolean;
}

export interface RateRatioTest {
  /** (x_new/t_new)/(x_base/t_base); null where infinite (no count in the base). */
  ratio: number | null;
  ciLow: number;
  /** null where infinite (every count in the new sample). */
  ciHigh: number | null;
  /** Two-sided exact conditional p-value of ratio = 1. */
  pValue: number;
  confidence: number;
  base: RateSample & { rate: number };
  new: RateSample & { rate: number };
  /** N = x_base + x_new and p₀ = t_new/(t_base + t_new), the binomial the test conditions on. */
  conditional: { total: number; nullProportion: number };
  cautions: Warning[];
}

/** Probabilities within this relative tolerance of the observed one count as "not larger". */
const RELATIVE_TOLERANCE = 1e-7;

/**
 * The exact conditional test and interval for the ratio R = λ_new/λ_base of two Poisson rates.
 *
 * Given the total N = x_base + x_new, x_new is Binomial(N, p) with p = R·t_new/(t_base + R·t_new);
 * under R = 1, p₀ = t_new/(t_base + t_new).
 *
 *   p-value = Σ P(X = i) over the i with P(X = i) ≤ P(X = x_new)·(1 + 1e-7)
 *   interval: the Clopper–Pearson interval (p_L, p_U) for p, mapped by R = p·t_base/((1 − p)·t_new)
 *     p_L = I⁻¹(α/2; x, N − x + 1),  p_U = I⁻¹(1 − α/2; x + 1, N − x)
 *
 * The two-sided p sums the tail beyond the observed count and the matching part of the other
 * tail, found by bisection on the monotone side of the mode (no sum over 0…N).
 * Sources: J. Przyborowski & H. Wilenski, "Homogeneity of results in testing samples from Poisson
 * series", Biometrika 31 (1940); C. J. Clopper & E. S. Pearson, Biometrika 26 (1934); the
 * the two-sided rule that sums every outcome no more probable than the observed one (common
 * practice in exact tests).
 */
export function rateRatioTest(
  base: RateSample,
  changed: RateSample,
  options: RateRatioOptions = {},
): Result<RateRatioTest> {
  const confidence = options.confidence ?? 0.95;
  const findings: Finding[] = [
    ...sampleFindings(base, 'base'),
    ...sampleFindings(changed, 'new'),
    ...(confidence > 0 && confidence < 1
      ? []
      : [{ value: String(confidence), message: 'the confidence must be between 0 and 1' }]),
  ];
  if (findings.length > 0) return fail(...findings);

  const total = base.count + changed.count;
  const nullProportion = changed.units / (base.units + changed.units);
  const x = changed.count;
  const alpha = 1 - confidence;
  const toRatio = (p: number) => (p * base.units) / ((1 - p) * changed.units);
  const lowerP = x === 0 ? 0 : inverseRegularizedBeta(alpha / 2, x, total - x + 1);
  const upperP = x === total ? 1 : inverseRegularizedBeta(1 - alpha / 2, x + 1, total - x);

  const cautions: Warning[] = [];
  if (total === 0)
    cautions.push({
      code: 'no-counts',
      message: 'no nonconformity was counted in either sample: the data say nothing about the ratio',
    });
  if (options.overdispersed)
    cautions.push({
      code: 'test-optimistic',
      message:
        'the periods vary more than Poisson counts do (over-dispersion): this test and interval assume Poisson counts, so they are optimistic; the real uncertainty is larger',
    });

  return ok({
    ratio: base.count === 0 ? null : x / changed.units / (base.count / base.units),
    ciLow: lowerP === 0 ? 0 : toRatio(lowerP),
    ciHigh: upperP >= 1 ? null : toRatio(upperP),
    pValue: total === 0 ? 1 : twoSidedP(x, total, nullProportion),
    confidence,
    base: { ...base, rate: base.count / base.units },
    new: { ...changed, rate: changed.count / changed.units },
    conditional: { total, nullProportion },
    cautions,
  });
}

function sampleFindings(sample: RateSample, name: string): Finding[] {
  const findings: Finding[] = [];
  if (!Number.isInteger(sample.count) || sample.count < 0)
    findings.push({
      column: 'count',
      value: String(sample.count),
      message: `the ${name} count must be a whole number of nonconformities, 0 or more`,
    });
  if (!(sample.units > 0) || !Number.isFinite(sample.units))
    findings.push({
      column: 'units',
      value: String(sample.units),
      message: `the ${name} inspection units must be a positive number`,
    });
  return findings;
}

/**
 * Σ P(X = i) over every i whose probability is not larger than the observed one (within the
 * relative tolerance), for X ~ Binomial(n, p): the observed tail plus the part of the other tail
 * beyond the first i (counted from the far end) whose probability is not larger.
 */
export function twoSidedP(x: number, n: number, p: number): number {
  const observed = binomialPmf(x, n, p) * (1 + RELATIVE_TOLERANCE);
  const mean = n * p;
  if (x === mean) return 1;
  if (x < mean) {
    // On [⌈mean⌉, n] the probabilities fall: find the first i there that is not larger.
    const first = firstIndexWhere(Math.ceil(mean), n, (i) => binomialPmf(i, n, p) <= observed);
    const other = first === null ? 0 : binomialUpperTail(first, n, p);
    return Math.min(1, binomialCdf(x, n, p) + other);
  }
  // On [0, ⌊mean⌋] the probabilities rise: find the last i there that is not larger.
  const firstLarger = firstIndexWhere(0, Math.floor(mean), (i) => binomialPmf(i, n, p) > observed);
  const last = firstLarger === null ? Math.floor(mean) : firstLarger - 1;
  const other = last < 0 ? 0 : binomialCdf(last, n, p);
  return Math.min(1, binomialUpperTail(x, n, p) + other);
}

/** The smallest i in [from, to] where a monotone test turns true, or null when it never does. */
function firstIndexWhere(from: number, to: number, test: (i: number) => boolean): number | null {
  if (from > to || !test(to)) return null;
  let low = from;
  let high = to;
  while (low < high) {
    const middle = Math.floor((low + high) / 2);
    if (test(middle)) high = middle;
    else low = middle + 1;
  }
  return low;
}
