import { stirlingError } from './stirling-error.js';

const LOG_SQRT_TWO_PI = 0.9189385332046728; // ln √(2π)

// Lanczos approximation with g = 607/128 and 15 terms (P. Godfrey's coefficients).
const LANCZOS_G = 607 / 128;
const LANCZOS = [
  0.9999999999999971, 57.15623566586292, -59.59796035547549, 14.136097974741746, -0.4919138160976202,
  3.399464998481189e-5, 4.652362892704858e-5, -9.837447530487956e-5, 0.0001580887032249125,
  -0.00021026444172410488, 0.00021743961811521265, -0.0001643181065367639, 8.441822398385275e-5,
  -2.6190838401581408e-5, 3.6899182659531625e-6,
];

/** (x − 1)! for x = 1 … 9, exact in double precision, so that ln Γ(1) = ln Γ(2) = 0 exactly. */
const FACTORIALS = [1, 1, 2, 6, 24, 120, 720, 5040, 40320];

/** From here on Stirling's series (through stirlingError) is used. */
const STIRLING_FROM = 10;

/**
 * ln Γ(x) for x > 0.
 *
 *   x < 10:  Lanczos, Γ(x) = √(2π)·(x + g − ½)^{x − ½}·e^{−(x + g − ½)}·A_g(x),
 *            A_g(x) = c₀ + Σₖ cₖ/(x − 1 + k),  g = 607/128
 *   x ≥ 10:  ln Γ(x) = (x − ½)·ln x − x + ln √(2π) + δ(x),  δ Stirling's error (stirlingError)
 *
 * Accurate to about 1e-15 relative away from the zeros at 1 and 2, and to about 1e-16 absolute near
 * them. Returns NaN for x ≤ 0 or NaN, +∞ for x = +∞.
 *
 * Sources: C. Lanczos, SIAM J. Numer. Anal. B 1 (1964); coefficients as in Numerical Recipes, 3rd ed.,
 * §6.1 (gammln); Abramowitz & Stegun 6.1.40 for the series.
 */
export function logGamma(x: number): number {
  if (Number.isNaN(x) || x <= 0) return Number.NaN;
  if (x === Number.POSITIVE_INFINITY) return x;
  if (x < STIRLING_FROM && Number.isInteger(x)) return Math.log(FACTORIALS[x - 1]);
  if (x >= STIRLING_FROM) return (x - 0.5) * Math.log(x) - x + LOG_SQRT_TWO_PI + stirlingError(x);
  // Γ(x) = Γ(x + 1)/x keeps the Lanczos sum in its accurate range for tiny x.
  if (x < 0.5) return logGamma(x + 1) - Math.log(x);
  const shifted = x - 1;
  let sum = LANCZOS[0];
  for (let k = 1; k < LANCZOS.length; k++) sum += LANCZOS[k] / (shifted + k);
  const t = shifted + LANCZOS_G + 0.5;
  return LOG_SQRT_TWO_PI + (shifted + 0.5) * Math.log(t) - t + Math.log(sum);
}
