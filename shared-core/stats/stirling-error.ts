import { logGamma } from './log-gamma.js';

const LOG_SQRT_TWO_PI = 0.9189385332046728; // ln √(2π)

// Coefficients B₂ⱼ / (2j(2j − 1)) of the Stirling series, B the Bernoulli numbers.
const S0 = 1 / 12;
const S1 = 1 / 360;
const S2 = 1 / 1260;
const S3 = 1 / 1680;
const S4 = 1 / 1188;
const S5 = 691 / 360360;
const S6 = 1 / 156;

/** Below this the series is not yet accurate to double precision; lnΓ is used instead. */
const SERIES_FROM = 10;

/**
 * The error of Stirling's formula for n!, for real n > 0:
 *
 *   δ(n) = ln Γ(n + 1) − (n + ½)·ln n + n − ln √(2π)
 *        ≈ 1/(12n) − 1/(360n³) + 1/(1260n⁵) − 1/(1680n⁷) + 1/(1188n⁹) − 691/(360360n¹¹) + 1/(156n¹³)
 *
 * The series is used for n ≥ 10, where its first omitted term is below 3e-17; below 10 the
 * definition is evaluated with lnΓ (an absolute error of a few ulps, which is what matters: δ
 * enters probabilities as a factor e^{−δ}).
 *
 * Source: C. Loader, "Fast and accurate computation of binomial probabilities" (2000), stirlerr;
 * the series: Abramowitz & Stegun 6.1.40.
 */
export function stirlingError(n: number): number {
  if (Number.isNaN(n) || n <= 0) return Number.NaN;
  if (n < SERIES_FROM) return logGamma(n + 1) - (n + 0.5) * Math.log(n) + n - LOG_SQRT_TWO_PI;
  const nn = 1 / (n * n);
  return (S0 - nn * (S1 - nn * (S2 - nn * (S3 - nn * (S4 - nn * (S5 - nn * S6)))))) / n;
}
