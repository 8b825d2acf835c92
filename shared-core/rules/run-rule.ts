import { windowAll, type RuleSeries } from './rule-series.js';

/**
 * `run:N`: the N periods ending at t all have z > 0, or all have z < 0 (z = 0 breaks a run).
 * N = 8 (Western Electric Handbook, 1956) or 9 (Nelson 1984, JQT 16(4)).
 */
export function runRule(series: RuleSeries, t: number, length: number): boolean {
  return windowAll(series, t, length, (z) => z > 0) || windowAll(series, t, length, (z) => z < 0);
}
