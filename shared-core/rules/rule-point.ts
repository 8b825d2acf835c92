/** What a signal rule sees of an included period, in period order. */
export interface RulePoint {
  /** Standardized value (divided by σz for Laney limits). */
  z: number;
  /** The count is beyond the period's reported limit (above UCL, or below an LCL that exists). */
  beyond: boolean;
}

/** True when `test` holds for every point of the window of `length` points ending at t. */
export function windowAll(
  points: readonly RulePoint[],
  t: number,
  length: number,
  test: (p: RulePoint) => boolean,
): boolean {
  if (t + 1 < length) return false;
  for (let i = t - length + 1; i <= t; i++) if (!test(points[i])) return false;
  return true;
}
