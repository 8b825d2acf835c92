import type { RulePoint } from './rule-point.js';

/**
 * `alternate`: the 14 periods ending at t alternate up and down (13 steps with alternating signs;
 * a tie breaks it). Source: Nelson (1984), JQT 16(4).
 */
export function alternateRule(points: readonly RulePoint[], t: number, length = 14): boolean {
  if (t + 1 < length) return false;
  let previous = 0;
  for (let i = t - length + 2; i <= t; i++) {
    const step = Math.sign(points[i].z - points[i - 1].z);
    if (step === 0 || step === previous) return false;
    previous = step;
  }
  return true;
}
