import type { RuleSeries } from './rule-series.js';

/**
 * `beyond`: the count at t is beyond its reported limit (above UCL, or below an LCL that exists).
 * Source: Western Electric, Statistical Quality Control Handbook (1956); Nelson (1984), JQT 16(4).
 */
export function beyondRule(series: RuleSeries, t: number): boolean {
  return series.beyond[t];
}
