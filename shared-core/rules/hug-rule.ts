import { windowAll, type RuleSeries } from './rule-series.js';

/**
 * `hug`: the 15 periods ending at t all have |z| < 1 (stratification: the points hug the center).
 * Source: Nelson (1984), JQT 16(4).
 */
export function hugRule(series: RuleSeries, t: number, length = 15): boolean {
  return windowAll(series, t, length, (z) => Math.abs(z) < 1);
}
