import type { CountLimits } from './count-limits.js';

/**
 * Shewhart sigma limits for the count of nonconformities in k inspection units at rate ū.
 *
 *   μ = ū·k,  UCL = μ + L·σ·√μ,  LCL = μ − L·σ·√μ  (none when ≤ 0)
 *
 * On the rate scale this is ū ± L·√(ū/k) (the u chart), and with k = 1 the c chart c̄ ± L·√c̄.
 * `spreadFactor` is 1 for Poisson sigma limits and σz for Laney u′ limits.
 *
 * Source: Montgomery, Introduction to Statistical Quality Control, ch. 7 (c and u charts);
 * Laney (2002), "Improved control charts for attributes", Quality Engineering 14(4).
 */
export function sigmaLimits(rate: number, units: number, multiplier = 3, spreadFactor = 1): CountLimits {
  const mean = rate * units;
  const spread = multiplier * spreadFactor * Math.sqrt(mean);
  const lower = mean - spread;
  return { mean, upper: mean + spread, lower: lower > 0 ? lower : null };
}
