import { binomialTerm } from './binomial-term.js';
import { logGamma } from './log-gamma.js';

const EPSILON = Number.EPSILON;
const TINY = 1e-300;

export interface BetaTails {
  /** I_x(a, b) */
  lower: number;
  /** 1 − I_x(a, b) = I_y(b, a) */
  upper: number;
}

/**
 * The regularized incomplete beta function I_x(a, b) = B(x; a, b)/B(a, b), for a, b > 0 and
 * 0 ≤ x ≤ 1, and its complement, each computed directly where it is the smaller one.
 *
 *   I_x(a, b) = x^a·(1 − x)^b / (a·B(a, b)) · 1/(1 + d₁/(1 + d₂/(1 + …)))
 *   d_{2m+1} = −(a + m)(a + b + m)·x / ((a + 2m)(a + 2m + 1)),   d_{2m} = m(b − m)·x / ((a + 2m − 1)(a + 2m))
 *
 * (modified Lentz), used for x < (a + 1)/(a + b + 2) and otherwise on I_y(b, a) with y = 1 − x.
 * The caller passes both x and y so that a tiny y (a probability near 1) keeps its digits. The prefix
 * is Loader's binomial term: x^a·y^b/(a·B(a, b)) = b/(a + b) · C(a + b, a)·x^a·y^b.
 *
 * Sources: Abramowitz & Stegun 26.5.8; Numerical Recipes, 3rd ed., §6.4 (betai, betacf);
 * C. Loader (2000) for the prefix.
 */
export function regularizedBetaTails(x: number, y: number, a: number, b: number): BetaTails {
  const invalid = { lower: Number.NaN, upper: Number.NaN };
  if ([x, y, a, b].some(Number.isNaN) || !(a > 0) || !(b > 0) || !Number.isFinite(a) || !Number.isFinite(b)) {
    return invalid;
  }
  if (x < 0 || y < 0 || Math.abs(x + y - 1) > 4 * EPSILON) return invalid;
  if (x === 0) return { lower: 0, upper: 1 };
  if (y === 0) return { lower: 1, upper: 0 };
  if (x < (a + 1) / (a + b + 2)) {
    const lower = Math.min(1, (b / (a + b)) * binomialTerm(a, a + b, x, y) * betaContinuedFraction(x, a, b));
    return { lower, upper: 1 - lower };
  }
  const upper = Math.min(1, (a / (a + b)) * binomialTerm(b, a + b, y, x) * betaContinuedFraction(y, b, a));
  return { lower: 1 - upper, upper };
}

/** I_x(a, b); see regularizedBetaTails. */
export function regularizedBeta(x: number, a: number, b: number): number {
  return regularizedBetaTails(x, 1 - x, a, b).lower;
}

/** 1 − I_x(a, b), computed directly; see regularizedBetaTails. */
export function regularizedBetaComplement(x: number, a: number, b: number): number {
  return regularizedBetaTails(x, 1 - x, a, b).upper;
}

function betaContinuedFraction(x: number, a: number, b: number): number {
  const sum = a + b;
  let c = 1;
  let d = 1 - (sum * x) / (a + 1);
  if (Math.abs(d) < TINY) d = TINY;
  d = 1 / d;
  let h = d;
  const limit = 1000 + Math.ceil(40 * Math.sqrt(Math.max(a, b)));
  for (let m = 1; m < limit; m++) {
    const twice = 2 * m;
    let step = (m * (b - m) * x) / ((a - 1 + twice) * (a + twice));
    d = 1 + step * d;
    if (Math.abs(d) < TINY) d = TINY;
    c = 1 + step / c;
    if (Math.abs(c) < TINY) c = TINY;
    d = 1 / d;
    h *= d * c;
    step = (-(a + m) * (sum + m) * x) / ((a + twice) * (a + 1 + twice));
    d = 1 + step * d;
    if (Math.abs(d) < TINY) d = TINY;
    c = 1 + step / c;
    if (Math.abs(c) < TINY) c = TINY;
    d = 1 / d;
    const delta = d * c;
    h *= delta;
    if (Math.abs(delta - 1) <= EPSILON) break;
  }
  return h;
}

/**
 * The x in [0, 1] with I_x(a, b) = p (0 at p = 0, 1 at p = 1): the quantile of the beta distribution.
 *
 * I_{½}(a, b) tells on which side of ½ the root lies. The iteration runs on whichever of x and
 * y = 1 − x is at most ½ (so that it, and not its rounded complement, carries full relative
 * precision), and matches whichever tail is at most ½. Start: where I_v(α, β) ≈ v^α/(α·B(α, β)),
 * v₀ = (t·α·B(α, β))^{1/α}, else ¼; then Newton's method on ln T as a function of ln v,
 *
 *   d ln I / d ln v = v^α·(1 − v)^{β−1} / (B(α, β)·I),
 *
 * applied as v ← v·e^{−step} inside the bracket (0, ½], falling back to bisection.
 * Sources: Numerical Recipes, 3rd ed., §6.14.11 (invbetai) for the Newton scheme; the log form is ours.
 */
export function inverseRegularizedBeta(p: number, a: number, b: number): number {
  if ([p, a, b].some(Number.isNaN) || p < 0 || p > 1 || !(a > 0) || !(b > 0)) return Number.NaN;
  if (!Number.isFinite(a) || !Number.isFinite(b)) return Number.NaN;
  if (p === 0) return 0;
  if (p === 1) return 1;
  const atHalf = regularizedBetaTails(0.5, 0.5, a, b).lower;
  if (p <= atHalf) return p <= 0.5 ? solveBelowHalf(p, a, b, 'lower') : solveBelowHalf(1 - p, a, b, 'upper');
  // Mirror: y = 1 − x solves I_y(b, a) = 1 − p.
  const y = p >= 0.5 ? solveBelowHalf(1 - p, b, a, 'lower') : solveBelowHalf(p, b, a, 'upper');
  return 1 - y;
}

/** v in (0, ½] with T(v) = t, T = I_v(α, β) (lower) or 1 − I_v(α, β) (upper), t ≤ ½. */
function solveBelowHalf(t: number, alpha: number, beta: number, tail: 'lower' | 'upper'): number {
  const logTarget = Math.log(t);
  const sign = tail === 'lower' ? 1 : -1;
  const logBeta = logGamma(alpha) + logGamma(beta) - logGamma(alpha + beta);
  const small = Math.exp((logTarget + Math.log(alpha) + logBeta) / alpha);
  let v = tail === 'lower' && small > 0 && small < 0.5 ? small : 0.25;
  let low = 0;
  let high = 0.5;
  let expansion = 1;
  for (let iteration = 0; iteration < 300; iteration++) {
    const tails = regularizedBetaTails(v, 1 - v, alpha, beta);
    const value = tail === 'lower' ? tails.lower : tails.upper;
    const h = sign * (Math.log(value) - logTarget);
    if (h === 0 || Number.isNaN(h)) return v;
    // The root lies below the smallest positive double: it underflows to 0.
    if (v === 0) return 0;
    if (h < 0) low = v;
    else high = v;
    // v^α·(1 − v)^{β−1}/B(α, β) = (α·β/(α + β))·C(α + β, α)·v^α·(1 − v)^β / (1 − v)
    const density =
      ((alpha * beta) / (alpha + beta)) * (binomialTerm(alpha, alpha + beta, v, 1 - v) / (1 - v));
    const slope = Number.isFinite(h) ? density / value : 0;
    let next = slope > 0 && Number.isFinite(slope) ? v * Math.exp(-h / slope) : Number.NaN;
    if (!(next > low && next < high)) {
      if (low > 0) next = Math.sqrt(low) * Math.sqrt(high);
      else {
        next = v * Math.exp(-expansion);
        expansion = Math.min(2 * expansion, 512);
      }
    }
    if (next === v || Math.abs(next - v) <= 2 * EPSILON * v) return next;
    v = next;
  }
  return v;
}
