import type { RulePoint } from './rule-point.js';

/**
 * `hits` of the `length` periods ending at t have z beyond `bound` on the same side, and t is one
 * of them (strict inequality: z > bound or z < −bound).
 */
function zoneRule(
  points: readonly RulePoint[],
  t: number,
  length: number,
  hits: number,
  bound: number,
): boolean {
  if (t + 1 < length) return false;
  const zt = points[t].z;
  const side = zt > bound ? 1 : zt < -bound ? -1 : 0;
  if (side === 0) return false;
  let count = 0;
  for (let i = t - length + 1; i <= t; i++) if (side * points[i].z > bound) count++;
  return count >= hits;
}

/**
 * `zone-a`: 2 of the 3 periods ending at t have z > 2 on the same side, and t is one of them.
 * Source: Western Electric Handbook (1956); Nelson (1984), JQT 16(4).
 */
export function zoneARule(points: readonly RulePoint[], t: number): boolean {
  return zoneRule(points, t, 3, 2, 2);
}

/**
 * `zone-b`: 4 of the 5 periods ending at t have z > 1 on the same side, and t is one of them.
 * Source: Western Electric Handbook (1956); Nelson (1984), JQT 16(4).
 */
export function zoneBRule(points: readonly RulePoint[], t: number): boolean {
  return zoneRule(points, t, 5, 4, 1);
}
