import {
  inverseRegularizedGammaP,
  inverseRegularizedGammaQ,
  regularizedGammaP,
  regularizedGammaQ,
} from './incomplete-gamma.js';

/**
 * The chi-square distribution function with df > 0 degrees of freedom:
 *
 *   F(x; ν) = P(ν/2, x/2)   (regularized lower incomplete gamma; 0 for x ≤ 0)
 *
 * Source: Abramowitz & Stegun 26.4.19.
 */
export function chiSquareCdf(x: number, df: number): number {
  if (Number.isNaN(x) || !validDegrees(df)) return Number.NaN;
  if (x <= 0) return 0;
  return regularizedGammaP(df / 2, x / 2);
}

/** 1 − F(x; ν) = Q(ν/2, x/2), computed directly so small upper tails keep their digits. */
export function chiSquareSurvival(x: number, df: number): number {
  if (Number.isNaN(x) || !validDegrees(df)) return Number.NaN;
  if (x <= 0) return 1;
  return regularizedGammaQ(df / 2, x / 2);
}

/** The x with F(x; ν) = p: 2·P⁻¹(ν/2, p). 0 at p = 0, +∞ at p = 1. */
export function chiSquareQuantile(p: number, df: number): number {
  if (!validDegrees(df)) return Number.NaN;
  return 2 * inverseRegularizedGammaP(df / 2, p);
}

/** The x with 1 − F(x; ν) = q: 2·Q⁻¹(ν/2, q), for small upper-tail probabilities given directly. */
export function chiSquareUpperQuantile(q: number, df: number): number {
  if (!validDegrees(df)) return Number.NaN;
  return 2 * inverseRegularizedGammaQ(df / 2, q);
}

function validDegrees(df: number): boolean {
  return df > 0 && Number.isFinite(df);
}
