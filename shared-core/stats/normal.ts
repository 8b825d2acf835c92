import { acklamNormalQuantile } from './acklam-normal-quantile.js';
import { gammaContinuedFraction, regularizedGammaP, regularizedGammaQ } from './incomplete-gamma.js';

const SQRT_TWO_PI = 2.5066282746310007; // √(2π)

/** Where the continued fraction takes over from the series: z²/2 ≥ a + 1 with a = ½. */
const CONTINUED_FRACTION_FROM = Math.sqrt(3);
const SPLIT = 65536; // 2¹⁶: z rounded to a multiple of 2⁻¹⁶ has an exact square for |z| < 2¹⁰

/**
 * The standard normal density φ(z) = e^{−z²/2}/√(2π), with z² split as zₕ² + z_l·(2zₕ + z_l)
 * (zₕ = z rounded to 16 fraction bits, so zₕ² is exact) so that the large exponent carries no
 * rounding error and φ keeps full relative precision far into the tails.
 * Source: the splitting is the one W. J. Cody uses for erfc (Math. Comp. 23, 1969).
 */
export function normalDensity(z: number): number {
  if (Math.abs(z) > 1024) return Math.exp(-0.5 * z * z) / SQRT_TWO_PI;
  const high = Math.round(z * SPLIT) / SPLIT;
  const low = z - high;
  return (Math.exp(-0.5 * high * high) * Math.exp(-low * (high + 0.5 * low))) / SQRT_TWO_PI;
}

/**
 * The standard normal distribution function Φ(z) = P(Z ≤ z), accurate in relative terms far into
 * the lower tail (Φ(−37) ≈ 5.7e-300 keeps its digits).
 *
 *   Φ(z) = ½·erfc(−z/√2),  erf(t) = P(½, t²),  erfc(t) = Q(½, t²)  (t ≥ 0)
 *
 * In the tails (|z| ≥ √3) Q(½, z²/2) = (z²/2)^{½}·e^{−z²/2}/Γ(½)·CF = |z|·φ(z)·CF, with CF the
 * incomplete gamma continued fraction and φ computed without rounding in its exponent.
 *
 * Sources: Abramowitz & Stegun 26.2.29 and 6.5.16 (erf through the incomplete gamma function).
 */
export function normalCdf(z: number): number {
  if (Number.isNaN(z)) return Number.NaN;
  if (z <= -CONTINUED_FRACTION_FROM) return lowerTailFraction(z);
  if (z >= CONTINUED_FRACTION_FROM) return 1 - lowerTailFraction(-z);
  const square = 0.5 * z * z;
  if (z < 0) return 0.5 * regularizedGammaQ(0.5, square);
  return 0.5 + 0.5 * regularizedGammaP(0.5, square);
}

/** Φ(z) for z ≤ −√3: ½·Q(½, z²/2) = ½·|z|·φ(z)·CF(½, z²/2), with φ computed precisely. */
function lowerTailFraction(z: number): number {
  const density = normalDensity(z);
  if (density === 0) return 0;
  return 0.5 * -z * density * gammaContinuedFraction(0.5, 0.5 * z * z);
}

/** The standard normal survival function 1 − Φ(z) = Φ(−z), computed directly (accurate for large z). */
export function normalSurvival(z: number): number {
  return normalCdf(-z);
}

/**
 * The standard normal quantile Φ⁻¹(p) for 0 ≤ p ≤ 1 (−∞ at 0, +∞ at 1), to about 1e-15 relative.
 *
 * Acklam's rational approximation (relative error ≤ 1.2e-9) gives a start x₀ in the lower tail
 * q = min(p, 1 − p) (1 − p is exact for p ≥ ½); Halley's method on Φ(x) − q, with
 * t = (Φ(x) − q)/φ(x),
 *
 *   x ← x − t / (1 + x·t/2),
 *
 * converges cubically, so one or two steps reach full precision. For q ≥ ¼ the residual is taken as
 * −½·erf(|x|/√2) − (q − ½) (x < 0 there), which keeps its relative precision as x → 0.
 *
 * Sources: P. J. Acklam (2003) for the start, with its refinement step; E. Halley (1694).
 */
export function normalQuantile(p: number): number {
  if (Number.isNaN(p) || p < 0 || p > 1) return Number.NaN;
  if (p === 0) return Number.NEGATIVE_INFINITY;
  if (p === 1) return Number.POSITIVE_INFINITY;
  if (p === 0.5) return 0;
  const lowerTail = Math.min(p, 1 - p);
  // Near the center Φ(x) − q would cancel; ½·erf(x/√2) − (q − ½) does not (q − ½ is exact there).
  const central = lowerTail >= 0.25;
  const offset = lowerTail - 0.5;
  const residual = central
    ? (x: number) => -0.5 * regularizedGammaP(0.5, 0.5 * x * x) - offset
    : (x: number) => normalCdf(x) - lowerTail;
  let x = acklamNormalQuantile(lowerTail);
  for (let step = 0; step < 4; step++) {
    const density = normalDensity(x);
    if (density === 0) break;
    const t = residual(x) / density;
    const next = x - t / (1 + (x * t) / 2);
    if (next === x) break;
    const settled = Math.abs(next - x) <= 4 * Number.EPSILON * Math.abs(x);
    x = next;
    if (settled) break;
  }
  return p < 0.5 ? x : -x;
}
