/**
 * The smallest integer k ≥ floor with holds(k), for a predicate that is false below some point and
 * true from it on; +∞ when it holds nowhere below 2⁵³.
 *
 * From the guess it steps away by 1, 2, 4, … until the answer is bracketed, then bisects, so a guess
 * that is off by d costs about 2·log₂(d) + 2 evaluations.
 */
export function smallestIntegerWhere(holds: (k: number) => boolean, guess: number, floor = 0): number {
  const start = Math.max(floor, Math.round(guess));
  let low: number; // holds(low) is false (or low = floor − 1)
  let high: number; // holds(high) is true
  if (holds(start)) {
    high = start;
    let step = 1;
    for (;;) {
      const candidate = high - step;
      if (candidate < floor) {
        low = floor - 1;
        break;
      }
      if (!holds(candidate)) {
        low = candidate;
        break;
      }
      high = candidate;
      step *= 2;
    }
  } else {
    low = start;
    let step = 1;
    for (;;) {
      const candidate = low + step;
      if (candidate > Number.MAX_SAFE_INTEGER) return Number.POSITIVE_INFINITY;
      if (holds(candidate)) {
        high = candidate;
        break;
      }
      low = candidate;
      step *= 2;
    }
  }
  while (high - low > 1) {
    const middle = low + Math.floor((high - low) / 2);
    if (holds(middle)) high = middle;
    else low = middle;
  }
  return high;
}
