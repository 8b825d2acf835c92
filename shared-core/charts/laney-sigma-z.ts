/**
 * Laney's between-period spread σz: the average moving range of the standardized values over pairs
 * of included periods that are adjacent in period order, divided by d₂ = 1.128.
 *
 *   σz = mean(|zᵢ − zᵢ₋₁|) / 1.128
 *
 * A moving range never bridges an excluded period, and σz below 1 is kept (DESIGN.md), so the limits
 * may come out narrower than Poisson ones when the data are under-dispersed.
 *
 * Source: Laney (2002), "Improved control charts for attributes", Quality Engineering 14(4),
 * 531–537; d₂ = 1.128 for subgroups of 2 (ASTM E2587, table of control chart constants).
 *
 * @param z standardized values in period order
 * @param included whether each period is included
 * @returns σz, or null when no two adjacent periods are both included
 */
export function laneySigmaZ(z: ArrayLike<number>, included: readonly boolean[]): number | null {
  let sum = 0;
  let pairs = 0;
  for (let i = 1; i < z.length; i++) {
    if (included[i] && included[i - 1]) {
      sum += Math.abs(z[i] - z[i - 1]);
      pairs++;
    }
  }
  return pairs === 0 ? null : sum / pairs / 1.128;
}
