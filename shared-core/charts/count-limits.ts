/**
 * Control limits of one period on the count scale (nonconformities in kᵢ units), where every
 * method's signal test is made: a count x signals high when x > upper and low when x < lower.
 * Working on counts keeps the rate-scale limits (count limits ÷ kᵢ) and the signal test from
 * disagreeing through rounding.
 */
export interface CountLimits {
  /** Expected count μᵢ = ū·kᵢ. */
  mean: number;
  upper: number;
  /** null: no lower limit exists (a negative sigma limit, or a probability LCL of 0). */
  lower: number | null;
}

/** The smallest count that signals high: floor(upper) + 1. */
export function firstHighSignal(limits: CountLimits): number {
  return Math.floor(limits.upper) + 1;
}

/** The largest count that signals low (x < lower), or null when no count can. */
export function lastLowSignal(limits: CountLimits): number | null {
  if (limits.lower === null) return null;
  const last = Math.ceil(limits.lower) - 1;
  return last >= 0 ? last : null;
}

export function signalsHigh(count: number, limits: CountLimits): boolean {
  return count > limits.upper;
}

export function signalsLow(count: number, limits: CountLimits): boolean {
  return limits.lower !== null && count < limits.lower;
}
