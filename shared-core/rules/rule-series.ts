/**
 * What the signal rules see of the included periods, in period order: one list per quantity, so
 * that a long history needs no object per period.
 */
export interface RuleSeries {
  /** Standardized values (divided by σz for Laney limits). */
  readonly z: ArrayLike<number>;
  /** Whether each count is beyond its period's reported limit (above UCL, or below an LCL that exists). */
  readonly beyond: ArrayLike<boolean>;
}

/** True when `test` holds for the z of every period of the window of `length` periods ending at t. */
export function windowAll(
  series: RuleSeries,
  t: number,
  length: number,
  test: (z: number) => boolean,
): boolean {
  if (t + 1 < length) return false;
  for (let i = t - length + 1; i <= t; i++) if (!test(series.z[i])) return false;
  return true;
}
