import { windowAll, type RulePoint } from './rule-point.js';

/**
 * `hug`: the 15 periods ending at t all have |z| < 1 (stratification: the points hug the center).
 * Source: Nelson (1984), JQT 16(4).
 */
export function hugRule(points: readonly RulePoint[], t: number, length = 15): boolean {
  return windowAll(points, t, length, (p) => Math.abs(p.z) < 1);
}
