import type { RulePoint } from './rule-point.js';

/**
 * `beyond`: the count at t is beyond its reported limit (above UCL, or below an LCL that exists).
 * Source: Western Electric, Statistical Quality Control Handbook (1956); Nelson (1984), JQT 16(4).
 */
export function beyondRule(points: readonly RulePoint[], t: number): boolean {
  return points[t].beyond;
}
