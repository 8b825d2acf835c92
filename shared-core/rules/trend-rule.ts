import type { RuleSeries } from './rule-series.js';

/**
 * `trend`: the 6 periods ending at t are strictly increasing or strictly decreasing in z
 * (5 steps; a tie breaks it). Source: Nelson (1984), JQT 16(4).
 */
export function trendRule(series: RuleSeries, t: number, length = 6): boolean {
  if (t + 1 < length) return false;
  let up = true;
  let down = true;
  for (let i = t - length + 2; i <= t; i++) {
    const step = series.z[i] - series.z[i - 1];
    if (!(step > 0)) up = false;
    if (!(step < 0)) down = false;
  }
  return up || down;
}
