// Rational approximations of P. J. Acklam (2003) for the central region and the two tails.
const A = [
  -3.969683028665376e1, 2.209460984245205e2, -2.759285104469687e2, 1.38357751867269e2, -3.066479806614716e1,
  2.506628277459239,
];
const B = [
  -5.447609879822406e1, 1.615858368580409e2, -1.556989798598866e2, 6.680131188771972e1, -1.328068155288572e1,
];
const C = [
  -7.784894002430293e-3, -3.223964580411365e-1, -2.400758277161838, -2.549732539343734, 4.374664141464968,
  2.938163982698783,
];
const D = [7.784695709041462e-3, 3.224671290700398e-1, 2.445134137142996, 3.754408661907416];
const TAIL = 0.02425;

/**
 * A starting value for the standard normal quantile Φ⁻¹(p), 0 < p < 1, with relative error below
 * about 1.2e-9: good enough to start a Newton or Halley iteration, not a final answer
 * (normalQuantile refines it to full precision).
 *
 *   central (0.02425 ≤ p ≤ 0.97575):  r = (p − ½)²,  x = (p − ½)·A(r)/B(r)
 *   tails:                             q = √(−2 ln p),  x = C(q)/D(q)   (mirrored for p > ½)
 *
 * Source: P. J. Acklam, "An algorithm for computing the inverse normal cumulative distribution
 * function" (2003); coefficients from memory, which is safe here because the result is only a start.
 */
export function acklamNormalQuantile(p: number): number {
  if (Number.isNaN(p) || p < 0 || p > 1) return Number.NaN;
  if (p === 0) return Number.NEGATIVE_INFINITY;
  if (p === 1) return Number.POSITIVE_INFINITY;
  if (p < TAIL) return tail(Math.sqrt(-2 * Math.log(p)));
  if (p > 1 - TAIL) return -tail(Math.sqrt(-2 * Math.log1p(-p)));
  const q = p - 0.5;
  const r = q * q;
  const numerator = ((((A[0] * r + A[1]) * r + A[2]) * r + A[3]) * r + A[4]) * r + A[5];
  const denominator = ((((B[0] * r + B[1]) * r + B[2]) * r + B[3]) * r + B[4]) * r + 1;
  return (q * numerator) / denominator;
}

function tail(q: number): number {
  const numerator = ((((C[0] * q + C[1]) * q + C[2]) * q + C[3]) * q + C[4]) * q + C[5];
  const denominator = (((D[0] * q + D[1]) * q + D[2]) * q + D[3]) * q + 1;
  return numerator / denominator;
}
