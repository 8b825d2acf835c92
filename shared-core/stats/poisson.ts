import { regularizedGammaP, regularizedGammaQ } from './incomplete-gamma.js';
import { smallestIntegerWhere } from './integer-search.js';
import { normalQuantile } from './normal.js';
import { logPoissonTerm, poissonTerm } from './poisson-term.js';

/*
 * The Poisson distribution with mean μ ≥ 0, exact and stable from μ = 1e-6 to 1e7 and beyond:
 * probabilities come from Loader's saddle-point form and the regularized incomplete gamma function,
 * never from sums over 0…k or from 1 − (the other tail). A NaN argument or a negative or infinite
 * mean gives NaN.
 */

function invalidMean(mean: number): boolean {
  return Number.isNaN(mean) || mean < 0 || mean === Number.POSITIVE_INFINITY;
}

/**
 * ln P(X = k) = −δ(k) − bd0(k, μ) − ½·ln(2πk)   (ln e^{−μ} = −μ at k = 0)
 *
 * −∞ for k < 0 or a non-integer k (no probability there).
 * Source: C. Loader, "Fast and accurate computation of binomial probabilities" (2000), dpois_raw.
 */
export function poissonLogPmf(k: number, mean: number): number {
  if (Number.isNaN(k) || invalidMean(mean)) return Number.NaN;
  if (k < 0 || !Number.isInteger(k)) return Number.NEGATIVE_INFINITY;
  return logPoissonTerm(k, mean);
}

/** P(X = k) = μ^k·e^{−μ}/k!, through Loader's form (see poissonLogPmf). 0 for k < 0 or non-integer k. */
export function poissonPmf(k: number, mean: number): number {
  if (Number.isNaN(k) || invalidMean(mean)) return Number.NaN;
  if (k < 0 || !Number.isInteger(k)) return 0;
  return poissonTerm(k, mean);
}

/**
 * P(X ≤ k) = Q(⌊k⌋ + 1, μ), the regularized upper incomplete gamma function.
 *
 * 0 for k < 0, 1 for μ = 0 and k ≥ 0.
 * Source: Abramowitz & Stegun 26.4.21 (with 26.4.19: the Poisson sum is a chi-square tail).
 */
export function poissonCdf(k: number, mean: number): number {
  if (Number.isNaN(k) || invalidMean(mean)) return Number.NaN;
  if (k < 0) return 0;
  if (mean === 0 || k === Number.POSITIVE_INFINITY) return 1;
  return regularizedGammaQ(Math.floor(k) + 1, mean);
}

/**
 * P(X ≥ k) = P(⌈k⌉, μ), the regularized lower incomplete gamma function, computed directly (not as
 * 1 − P(X ≤ k − 1)) so that the small upper tails that decide a signal keep all their digits.
 *
 * 1 for k ≤ 0; for μ = 0, 0 when k > 0.
 * Source: Abramowitz & Stegun 26.4.21.
 */
export function poissonUpperTail(k: number, mean: number): number {
  if (Number.isNaN(k) || invalidMean(mean)) return Number.NaN;
  const atLeast = Math.ceil(k);
  if (atLeast <= 0) return 1;
  if (mean === 0 || atLeast === Number.POSITIVE_INFINITY) return 0;
  return regularizedGammaP(atLeast, mean);
}

/**
 * The smallest k with P(X ≤ k) ≥ p, for 0 ≤ p ≤ 1 (+∞ at p = 1 when μ > 0).
 *
 * Start: the Cornish–Fisher guess k₀ = μ + √μ·(z + (z² − 1)/(6√μ)), z = Φ⁻¹(p); then exact checks
 * of P(X ≤ k) ≥ p, stepping 1, 2, 4, … away from k₀ and bisecting (smallestIntegerWhere): a few
 * evaluations, whatever μ is.
 * Source: Cornish & Fisher (1937) for the start; the search is exact.
 */
export function poissonQuantile(p: number, mean: number): number {
  if (Number.isNaN(p) || invalidMean(mean) || p < 0 || p > 1) return Number.NaN;
  if (mean === 0 || p === 0) return 0;
  if (p === 1) return Number.POSITIVE_INFINITY;
  const guess = cornishFisherGuess(p < 0.5 ? normalQuantile(p) : -normalQuantile(1 - p), mean);
  return smallestIntegerWhere((k) => poissonCdf(k, mean) >= p, guess);
}

/**
 * The smallest k with P(X > k) ≤ q, i.e. P(X ≥ k + 1) ≤ q, for 0 ≤ q ≤ 1 (+∞ at q = 0 when μ > 0).
 *
 * This is the upper control limit of an exact Poisson chart: UCL = poissonUpperQuantile(α/2, μ).
 * Every check uses the upper tail directly, so q = 0.00135 and far smaller tails are decided exactly
 * (1 − q would round them). Same search as poissonQuantile, started from the Cornish–Fisher guess
 * with z = Φ⁻¹(1 − q) = −Φ⁻¹(q).
 */
export function poissonUpperQuantile(q: number, mean: number): number {
  if (Number.isNaN(q) || invalidMean(mean) || q < 0 || q > 1) return Number.NaN;
  if (mean === 0 || q === 1) return 0;
  if (q === 0) return Number.POSITIVE_INFINITY;
  const guess = cornishFisherGuess(q < 0.5 ? -normalQuantile(q) : normalQuantile(1 - q), mean);
  return smallestIntegerWhere((k) => poissonUpperTail(k + 1, mean) <= q, guess);
}

function cornishFisherGuess(z: number, mean: number): number {
  const sigma = Math.sqrt(mean);
  const guess = mean + sigma * (z + (z * z - 1) / (6 * sigma));
  return Number.isFinite(guess) && guess > 0 ? guess : 0;
}
