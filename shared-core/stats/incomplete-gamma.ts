import { logGamma } from './log-gamma.js';
import { acklamNormalQuantile } from './acklam-normal-quantile.js';
import { logPoissonTerm, poissonTerm } from './poisson-term.js';

const EPSILON = Number.EPSILON;
const TINY = 1e-300;

/**
 * The regularized lower incomplete gamma function P(a, x) = γ(a, x)/Γ(a), for a > 0, x ≥ 0.
 *
 * For x < a + 1 the series (Abramowitz & Stegun 6.5.29)
 *
 *   P(a, x) = x^a·e^{−x}/Γ(a + 1) · Σ_{n≥0} xⁿ / ((a + 1)(a + 2)…(a + n));
 *
 * otherwise P = 1 − Q with Q from its continued fraction (regularizedGammaQ). The prefix
 * x^a·e^{−x}/Γ(a + 1) is Loader's Poisson term, accurate for a up to 1e8 and beyond. The work grows
 * like √a near x = a (about 9·√a terms at full precision) and is constant away from it.
 *
 * Sources: Abramowitz & Stegun 6.5.29; Numerical Recipes, 3rd ed., §6.2 (gser, gcf);
 * C. Loader (2000) for the prefix.
 */
export function regularizedGammaP(a: number, x: number): number {
  if (!validArguments(a, x)) return Number.NaN;
  if (x === 0) return 0;
  if (x === Number.POSITIVE_INFINITY) return 1;
  if (x < a + 1) return lowerSeries(a, x);
  return 1 - upperContinuedFraction(a, x);
}

/**
 * The regularized upper incomplete gamma function Q(a, x) = Γ(a, x)/Γ(a) = 1 − P(a, x), for a > 0,
 * x ≥ 0, computed directly where it is the smaller tail so that tiny values keep their digits.
 *
 * For x ≥ a + 1 the continued fraction (Abramowitz & Stegun 6.5.31), evaluated by the modified
 * Lentz method,
 *
 *   Q(a, x) = x^a·e^{−x}/Γ(a) · 1/(x + 1 − a − 1·(1 − a)/(x + 3 − a − 2·(2 − a)/(x + 5 − a − …)));
 *
 * otherwise Q = 1 − P with P from its series. For a ≥ 1 that complement is at least e^{−2}, so no
 * digits are lost; for a < 1 and x < a + 1 the result is accurate to about 1e-16 absolute.
 *
 * Sources: Abramowitz & Stegun 6.5.31; Numerical Recipes, 3rd ed., §6.2 and §5.2 (Lentz);
 * C. Loader (2000) for the prefix.
 */
export function regularizedGammaQ(a: number, x: number): number {
  if (!validArguments(a, x)) return Number.NaN;
  if (x === 0) return 1;
  if (x === Number.POSITIVE_INFINITY) return 0;
  if (x < a + 1) return 1 - lowerSeries(a, x);
  return upperContinuedFraction(a, x);
}

function validArguments(a: number, x: number): boolean {
  return !Number.isNaN(a) && !Number.isNaN(x) && a > 0 && a < Number.POSITIVE_INFINITY && x >= 0;
}

function lowerSeries(a: number, x: number): number {
  const prefix = poissonTerm(a, x);
  if (prefix === 0) return 0;
  let term = 1;
  let sum = 1;
  // The terms shrink from the first one on, since x < a + 1 ≤ a + n.
  for (let n = 1; n < maxIterations(a); n++) {
    term *= x / (a + n);
    const next = sum + term;
    if (next === sum) break;
    sum = next;
  }
  return Math.min(1, prefix * sum);
}

function upperContinuedFraction(a: number, x: number): number {
  // x^a·e^{−x}/Γ(a) = a·x^a·e^{−x}/Γ(a + 1)
  const prefix = a * poissonTerm(a, x);
  if (prefix === 0) return 0;
  return Math.min(1, prefix * gammaContinuedFraction(a, x));
}

/**
 * The continued fraction of Q(a, x) without its prefix, for x ≥ a + 1:
 *
 *   Q(a, x)·Γ(a)/(x^a·e^{−x}) = 1/(x + 1 − a − 1·(1 − a)/(x + 3 − a − 2·(2 − a)/(x + 5 − a − …)))
 *
 * evaluated by the modified Lentz method. Exposed so that a caller with a more precise prefix
 * (normalCdf) can supply its own.
 * Sources: Abramowitz & Stegun 6.5.31; Numerical Recipes, 3rd ed., §5.2 and §6.2 (gcf).
 */
export function gammaContinuedFraction(a: number, x: number): number {
  let b = x + 1 - a;
  let c = 1 / TINY;
  let d = 1 / b;
  let h = d;
  for (let i = 1; i < maxIterations(a); i++) {
    const an = -i * (i - a);
    b += 2;
    d = an * d + b;
    if (Math.abs(d) < TINY) d = TINY;
    c = b + an / c;
    if (Math.abs(c) < TINY) c = TINY;
    d = 1 / d;
    const delta = d * c;
    h *= delta;
    if (Math.abs(delta - 1) <= EPSILON) break;
  }
  return h;
}

/** Both expansions need O(√a) steps near x = a; this bound is far above what they use. */
function maxIterations(a: number): number {
  return 1000 + Math.ceil(40 * Math.sqrt(a));
}

/** x > 0 with P(a, x) = p; 0 for p = 0, +∞ for p = 1. See invertTail for the method. */
export function inverseRegularizedGammaP(a: number, p: number): number {
  if (Number.isNaN(a) || Number.isNaN(p) || !(a > 0) || !Number.isFinite(a) || p < 0 || p > 1) {
    return Number.NaN;
  }
  if (p === 0) return 0;
  if (p === 1) return Number.POSITIVE_INFINITY;
  return p <= 0.5 ? invertTail(a, p, 'lower') : invertTail(a, 1 - p, 'upper');
}

/** x > 0 with Q(a, x) = q; +∞ for q = 0, 0 for q = 1. See invertTail for the method. */
export function inverseRegularizedGammaQ(a: number, q: number): number {
  if (Number.isNaN(a) || Number.isNaN(q) || !(a > 0) || !Number.isFinite(a) || q < 0 || q > 1) {
    return Number.NaN;
  }
  if (q === 0) return Number.POSITIVE_INFINITY;
  if (q === 1) return 0;
  return q <= 0.5 ? invertTail(a, q, 'upper') : invertTail(a, 1 - q, 'lower');
}

/**
 * Solves T(a, x) = t for x, T the lower (P) or upper (Q) tail, t ≤ ½ so that the tail being matched
 * is the smaller one and keeps its relative precision (1 − t is exact for t ≥ ½).
 *
 * Start: Wilson–Hilferty, x₀ = a·(1 − 1/(9a) + z/(3√a))³ with z the normal quantile of the lower
 * tail probability; for small x, where P(a, x) ≈ x^a/Γ(a + 1), x₀ = (t·Γ(a + 1))^{1/a}.
 * Then Newton's method on ln T as a function of ln x,
 *
 *   d ln T / d ln x = ± x·x^{a−1}e^{−x}/(Γ(a)·T) = ± a·(x^a e^{−x}/Γ(a + 1))/T,
 *
 * applied as x ← x·e^{−step} so that x keeps full relative precision at any magnitude, inside a
 * bracket that falls back to bisection (in ln x) whenever a step would leave it.
 *
 * Sources: Wilson & Hilferty, PNAS 17 (1931); Numerical Recipes, 3rd ed., §6.2.1 (invgammp) for the
 * Newton scheme; the log-log form is ours.
 */
function invertTail(a: number, t: number, tail: 'lower' | 'upper'): number {
  const logTarget = Math.log(t);
  const tailAt = tail === 'lower' ? regularizedGammaP : regularizedGammaQ;
  // h(x) = ±(ln T(x) − ln t) increases with x for both tails.
  const sign = tail === 'lower' ? 1 : -1;
  let x = startingPoint(a, t, tail);
  let low = 0; // h(low) < 0 (0 means not yet found)
  let high = Number.POSITIVE_INFINITY; // h(high) > 0
  let expansion = 1;
  for (let iteration = 0; iteration < 200; iteration++) {
    const value = tailAt(a, x);
    const h = sign * (Math.log(value) - logTarget);
    if (h === 0 || Number.isNaN(h)) return x;
    // The root lies below the smallest positive double: it underflows to 0.
    if (x === 0) return 0;
    if (h < 0) low = x;
    else high = x;
    // |h| = ∞ when the tail underflowed: no slope to use, move by bracket or by expanding steps.
    const slope = Number.isFinite(h) ? Math.exp(Math.log(a) + logPoissonTerm(a, x) - Math.log(value)) : 0;
    let next = slope > 0 ? x * Math.exp(-h / slope) : Number.NaN;
    if (!(next > low && next < high)) {
      if (low > 0 && high < Number.POSITIVE_INFINITY) next = Math.sqrt(low) * Math.sqrt(high);
      else {
        next = h < 0 ? x * Math.exp(expansion) : x * Math.exp(-expansion);
        expansion = Math.min(2 * expansion, 512);
      }
    }
    if (next === x || Math.abs(next - x) <= 2 * EPSILON * x) return next;
    if (low > 0 && high < Number.POSITIVE_INFINITY && high - low <= 2 * EPSILON * high) return next;
    x = next;
  }
  return x;
}

function startingPoint(a: number, t: number, tail: 'lower' | 'upper'): number {
  const zLower = tail === 'lower' ? acklamNormalQuantile(t) : -acklamNormalQuantile(t);
  const cube = 1 - 1 / (9 * a) + zLower / (3 * Math.sqrt(a));
  const wilsonHilferty = cube > 0 ? a * cube * cube * cube : 0;
  if (tail === 'lower' && (a < 1 || wilsonHilferty <= 0 || zLower < -Math.sqrt(a))) {
    const small = Math.exp((Math.log(t) + logGamma(a + 1)) / a);
    if (small > 0 && Number.isFinite(small)) return small;
  }
  if (wilsonHilferty > 0 && Number.isFinite(wilsonHilferty)) return wilsonHilferty;
  return tail === 'lower' ? Math.max(TINY, a * Math.exp(zLower / Math.sqrt(a))) : a + 1 - Math.log(t);
}
