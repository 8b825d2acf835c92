import { binomialTerm } from './binomial-term.js';
import { regularizedBetaTails } from './incomplete-beta.js';

/*
 * The binomial distribution: n trials, success probability p. Probabilities come from Loader's
 * saddle-point form and the regularized incomplete beta function, each tail computed directly.
 * NaN arguments, n not a non-negative integer, or p outside [0, 1] give NaN.
 */

function invalid(n: number, p: number): boolean {
  return Number.isNaN(n) || Number.isNaN(p) || n < 0 || !Number.isInteger(n) || p < 0 || p > 1;
}

/**
 * P(X = k) = C(n, k)·p^k·(1 − p)^{n−k}; 0 for k outside 0…n or non-integer k.
 * Source: C. Loader, "Fast and accurate computation of binomial probabilities" (2000), dbinom_raw.
 */
export function binomialPmf(k: number, n: number, p: number): number {
  if (Number.isNaN(k) || invalid(n, p)) return Number.NaN;
  if (!Number.isInteger(k) || k < 0 || k > n) return 0;
  return binomialTerm(k, n, p, 1 - p);
}

/**
 * P(X ≤ k) = I_{1−p}(n − ⌊k⌋, ⌊k⌋ + 1) for 0 ≤ k < n; 0 for k < 0, 1 for k ≥ n.
 * Source: Abramowitz & Stegun 26.5.24.
 */
export function binomialCdf(k: number, n: number, p: number): number {
  if (Number.isNaN(k) || invalid(n, p)) return Number.NaN;
  const atMost = Math.floor(k);
  if (atMost < 0) return 0;
  if (atMost >= n) return 1;
  return regularizedBetaTails(1 - p, p, n - atMost, atMost + 1).lower;
}

/**
 * P(X ≥ k) = I_p(⌈k⌉, n − ⌈k⌉ + 1) for 1 ≤ k ≤ n, computed directly (not 1 − cdf); 1 for k ≤ 0,
 * 0 for k > n.
 * Source: Abramowitz & Stegun 26.5.24.
 */
export function binomialUpperTail(k: number, n: number, p: number): number {
  if (Number.isNaN(k) || invalid(n, p)) return Number.NaN;
  const atLeast = Math.ceil(k);
  if (atLeast <= 0) return 1;
  if (atLeast > n) return 0;
  return regularizedBetaTails(p, 1 - p, atLeast, n - atLeast + 1).lower;
}
