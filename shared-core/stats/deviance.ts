/**
 * The deviance term of a Poisson or binomial probability, computed without cancellation:
 *
 *   bd0(x, m) = x·ln(x/m) + m − x          (x ≥ 0, m > 0)
 *
 * When x and m are close the direct form loses most of its digits; there, with v = (x − m)/(x + m),
 *
 *   bd0(x, m) = (x − m)·v + 2x·Σ_{j≥1} v^{2j+1}/(2j + 1)
 *
 * which is the series of x·ln((1 + v)/(1 − v)) rearranged, each term positive.
 *
 * Source: C. Loader, "Fast and accurate computation of binomial probabilities" (2000), bd0.
 */
export function deviance(x: number, m: number): number {
  if (Number.isNaN(x) || Number.isNaN(m) || x < 0 || m <= 0) return Number.NaN;
  if (x === 0) return m;
  const diff = x - m;
  if (Math.abs(diff) < 0.1 * (x + m)) {
    const v = diff / (x + m);
    const v2 = v * v;
    let sum = diff * v;
    let power = 2 * x * v;
    for (let j = 1; j < 1000; j++) {
      power *= v2;
      const next = sum + power / (2 * j + 1);
      if (next === sum) return next;
      sum = next;
    }
    return sum;
  }
  return x * Math.log(x / m) + m - x;
}
