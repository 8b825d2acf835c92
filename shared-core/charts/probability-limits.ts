import { poissonCdf, poissonQuantile, poissonUpperQuantile } from '../stats/poisson.js';
import type { CountLimits } from './count-limits.js';

/**
 * Exact Poisson probability limits for a count with mean μ = ū·k and per-point α (two-sided).
 *
 * A count x signals high when P(X ≥ x) ≤ α/2 and low when P(X ≤ x) ≤ α/2. The limits are the most
 * extreme counts that do not signal:
 *   UCL = smallest u with P(X > u) ≤ α/2   (= qpois(1 − α/2, μ), found through the upper tail)
 *   LCL = smallest l with P(X ≤ l) > α/2   (LCL = 0 means no lower limit: null)
 *
 * Check (DESIGN.md): μ = 4, α = 0.0027 gives UCL 11 and no LCL.
 * Source: the definition of probability limits, e.g. Montgomery, Introduction to Statistical
 * Quality Control, ch. 7; Ryan, Statistical Methods for Quality Improvement, ch. 8.
 */
export function probabilityLimits(rate: number, units: number, alpha = 0.0027): CountLimits {
  const mean = rate * units;
  const tail = alpha / 2;
  const upper = poissonUpperQuantile(tail, mean);
  let lower = poissonQuantile(tail, mean);
  if (poissonCdf(lower, mean) <= tail) lower += 1;
  return { mean, upper, lower: lower > 0 ? lower : null };
}
