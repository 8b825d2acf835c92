import { deviance } from './deviance.js';
import { logGamma } from './log-gamma.js';
import { stirlingError } from './stirling-error.js';

const LOG_TWO_PI = 1.8378770664093456; // ln(2π)
const MIN_NORMAL = 2.2250738585072014e-308;

/**
 * ln of the Poisson term at a real "count" a ≥ 0 with mean m ≥ 0:
 *
 *   ln( m^a·e^{−m} / Γ(a + 1) ) = −δ(a) − bd0(a, m) − ½·ln(2πa)
 *
 * with δ Stirling's error and bd0 the deviance term, so that nothing large cancels: the naive
 * a·ln m − m − ln Γ(a + 1) loses about eight digits at m = 1e7. For integer a this is the Poisson
 * log probability; for real a it is the prefix of the incomplete gamma function.
 *
 * Source: C. Loader, "Fast and accurate computation of binomial probabilities" (2000), dpois_raw.
 */
export function logPoissonTerm(a: number, m: number): number {
  if (Number.isNaN(a) || Number.isNaN(m) || a < 0 || m < 0) return Number.NaN;
  if (m === 0) return a === 0 ? 0 : Number.NEGATIVE_INFINITY;
  if (a === 0) return -m;
  if (!Number.isFinite(m) || !Number.isFinite(a)) return Number.NEGATIVE_INFINITY;
  // When m is negligible beside a, a/m in bd0 would overflow; the naive form has nothing to cancel.
  if (m < a * MIN_NORMAL) return a * Math.log(m) - m - logGamma(a + 1);
  return -stirlingError(a) - deviance(a, m) - 0.5 * (LOG_TWO_PI + Math.log(a));
}

/**
 * m^a·e^{−m} / Γ(a + 1) = e^{−δ(a) − bd0(a, m)} / √(2πa), see logPoissonTerm; the square root is
 * taken outside the exponential as Loader does, which keeps one rounding less.
 */
export function poissonTerm(a: number, m: number): number {
  if (Number.isNaN(a) || Number.isNaN(m) || a < 0 || m < 0) return Number.NaN;
  if (m === 0) return a === 0 ? 1 : 0;
  if (a === 0) return Math.exp(-m);
  if (!Number.isFinite(m) || !Number.isFinite(a)) return 0;
  if (m < a * MIN_NORMAL) return Math.exp(a * Math.log(m) - m - logGamma(a + 1));
  return Math.exp(-stirlingError(a) - deviance(a, m)) / Math.sqrt(2 * Math.PI * a);
}
