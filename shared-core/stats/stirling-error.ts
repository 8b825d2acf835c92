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
const S7 = 3617 / 122400;

/** Below this the series is not yet accurate to double precision. */
const SERIES_FROM = 10;
/** Below this the step series converges slowly (t > ½); lnΓ is used instead. */
const RECURRENCE_FROM = 0.5;

/**
 * The error of Stirling's formula for n!, for real n > 0:
 *
 *   δ(n) = ln Γ(n + 1) − (n + ½)·ln n + n − ln √(2π)
 *        ≈ 1/(12n) − 1/(360n³) + 1/(1260n⁵) − 1/(1680n⁷) + 1/(1188n⁹) − 691/(360360n¹¹) + 1/(156n¹³)
 *          − 3617/(122400n¹⁵)
 *
 * The series is used for n ≥ 10, where its first omitted term,
 * 43867/(244188n¹⁷), is below 2e-18. For ½ ≤ n < 10 the
 * exact step δ(ν) − δ(ν + 1) = (ν + ½)·ln(1 + 1/ν) − 1 = Σ_{j≥1} t^{2j}/(2j + 1), t = 1/(2ν + 1)
 * (from Γ(ν + 2) = (ν + 1)·Γ(ν + 1)), carries the series down without cancellation. Below ½ the
 * definition is evaluated with lnΓ, where −½·ln n dominates and nothing significant cancels. The
 * absolute error is what matters: δ enters probabilities as a factor e^{−δ}.
 *
 * Source: C. Loader, "Fast and accurate computation of binomial probabilities" (2000), stirlerr;
 * the series: Abramowitz & Stegun 6.1.40.
 */
export function stirlingError(n: number): number {
  if (Number.isNaN(n) || n <= 0) return Number.NaN;
  if (n < RECURRENCE_FROM) return logGamma(n + 1) - (n + 0.5) * Math.log(n) + n - LOG_SQRT_TWO_PI;
  if (n < SERIES_FROM) {
    // δ(ν) = δ(ν + 1) + Σ_{j≥1} t^{2j}/(2j + 1), t = 1/(2ν + 1): every term positive, nothing cancels.
    let sum = 0;
    let v = n;
    for (; v < SERIES_FROM; v++) sum += stepDifference(v);
    return stirlingSeries(v) + sum;
  }
  return stirlingSeries(n);
}

function stirlingSeries(n: number): number {
  const nn = 1 / (n * n);
  return (S0 - nn * (S1 - nn * (S2 - nn * (S3 - nn * (S4 - nn * (S5 - nn * (S6 - nn * S7))))))) / n;
}

/** δ(ν) − δ(ν + 1) = (ν + ½)·ln(1 + 1/ν) − 1 = Σ_{j≥1} t^{2j}/(2j + 1), t = 1/(2ν + 1), for ν ≥ ½. */
function stepDifference(v: number): number {
  const t2 = 1 / ((2 * v + 1) * (2 * v + 1));
  let power = t2;
  let sum = 0;
  for (let j = 1; j < 100; j++) {
    const next = sum + power / (2 * j + 1);
    if (next === sum) break;
    sum = next;
    power *= t2;
  }
  return sum;
}
