import type { RuleSeries } from './rule-series.js';

/**
 * `hits` of the `length` periods ending at t have z beyond `bound` on the same side, and t is one
 * of them (strict inequality: z > bound or z < −bound).
 */
function zoneRule(series: RuleSeries, t: number, length: number, hits: number, bound: number): boolean {
  if (t + 1 < length) return false;
  const zt = series.z[t];
  const side = zt > bound ? 1 : zt < -bound ? -1 : 0;
  if (side === 0) return false;
  let count = 0;
  for (let i = t - length + 1; i <= t; i++) if (side * series.z[i] > bound) count++;
  return count >= hits;
}

/**
 * `zone-a`: 2 of the 3 periods ending at t have z > 2 on the same side, and t is one of them.
 * Source: Western Electric Handbook (1956); Nelson (1984), JQT 16(4).
 */
export function zoneARule(series: RuleSeries, t: number): boolean {
  return zoneRule(series, t, 3, 2, 2);
}

/**
 * `zone-b`: 4 of the 5 periods ending at t have z > 1 on the same side, and t is one of them.
 * Source: Western Electric Handbook (1956); Nelson (1984), JQT 16(4).
 */
export function zoneBRule(series: RuleSeries, t: number): boolean {
  return zoneRule(series, t, 5, 4, 1);
}
