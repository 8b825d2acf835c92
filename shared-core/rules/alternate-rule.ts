import type { RuleSeries } from './rule-series.js';

/**
 * `alternate`: the 14 periods ending at t alternate up and down (13 steps with alternating signs;
 * a tie breaks it). Source: Nelson (1984), JQT 16(4).
 */
export function alternateRule(series: RuleSeries, t: number, length = 14): boolean {
  if (t + 1 < length) return false;
  let previous = 0;
  for (let i = t - length + 2; i <= t; i++) {
    const step = Math.sign(series.z[i] - series.z[i - 1]);
    if (step === 0 || step === previous) return false;
    previous = step;
  }
  return true;
}
