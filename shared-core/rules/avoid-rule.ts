import { windowAll, type RuleSeries } from './rule-series.js';

/**
 * `avoid`: the 8 periods ending at t all have |z| > 1, with at least one on each side (a mixture:
 * the points avoid the center). Source: Nelson (1984), JQT 16(4).
 */
export function avoidRule(series: RuleSeries, t: number, length = 8): boolean {
  if (!windowAll(series, t, length, (z) => Math.abs(z) > 1)) return false;
  let above = false;
  let below = false;
  for (let i = t - length + 1; i <= t; i++) {
    if (series.z[i] > 0) above = true;
    else below = true;
  }
  return above && below;
}
