import { deviance } from './deviance.js';
import { logGamma } from './log-gamma.js';
import { stirlingError } from './stirling-error.js';

const MIN_NORMAL = 2.2250738585072014e-308;

/**
 * The binomial term C(n, k)·p^k·q^{n−k} for real 0 ≤ k ≤ n and p + q = 1, given both p and q so
 * that a tiny p or q keeps its digits (1 − p would round them away):
 *
 *   C(n, k)·p^k·q^{n−k} = e^{δ(n) − δ(k) − δ(n − k) − bd0(k, np) − bd0(n − k, nq)} · √(n / (2π·k·(n − k)))
 *
 * with δ Stirling's error and bd0 the deviance term: no large terms cancel, so it stays accurate for
 * n in the millions. The end points are  q^n = e^{−bd0(n, nq) − np}  (k = 0, p < 0.1; n·ln q
 * otherwise) and the mirror image at k = n. Real k and n are allowed: the incomplete beta function
 * uses this as its prefix.
 *
 * Source: C. Loader, "Fast and accurate computation of binomial probabilities" (2000), dbinom_raw.
 */
export function binomialTerm(k: number, n: number, p: number, q: number): number {
  if ([k, n, p, q].some(Number.isNaN) || n < 0 || p < 0 || q < 0) return Number.NaN;
  if (p === 0) return k === 0 ? 1 : 0;
  if (q === 0) return k === n ? 1 : 0;
  if (k < 0 || k > n) return 0;
  if (k === 0) {
    if (n === 0) return 1;
    return Math.exp(p < 0.1 ? -deviance(n, n * q) - n * p : n * Math.log(q));
  }
  if (k === n) return Math.exp(q < 0.1 ? -deviance(n, n * p) - n * q : n * Math.log(p));
  // When np or nq is subnormal, k/(np) in bd0 would overflow; the plain form has nothing to cancel.
  if (n * p < k * MIN_NORMAL || n * q < (n - k) * MIN_NORMAL) {
    return Math.exp(
      logGamma(n + 1) - logGamma(k + 1) - logGamma(n - k + 1) + k * Math.log(p) + (n - k) * Math.log(q),
    );
  }
  const exponent =
    stirlingError(n) - stirlingError(k) - stirlingError(n - k) - deviance(k, n * p) - deviance(n - k, n * q);
  return Math.exp(exponent) * Math.sqrt(n / (2 * Math.PI * k * (n - k)));
}
