import type { PeriodStatus } from '../study/analysis-types.js';

/**
 * The point marks worth drawing at the plot's resolution, as indices into `points` in their order.
 * Every signal, every excluded period and the selected period is always kept, exactly where it is.
 * An in-control mark is dropped only when an in-control mark already kept has its center in the
 * same device pixel: the two would cover the same pixels to within one, so the picture stays as
 * it was while a long history (many periods to a pixel column) draws fewer marks.
 *
 * `pixelX`/`pixelY` are the marks' centers in device pixels (same order as `points`). Display only:
 * statuses, rules and the table always use every period.
 */
export function visibleMarks(
  points: readonly { status: PeriodStatus }[],
  pixelX: ArrayLike<number>,
  pixelY: ArrayLike<number>,
  selected: number | null = null,
): number[] {
  const kept: number[] = [];
  const taken = new Set<number>();
  for (let index = 0; index < points.length; index++) {
    if (points[index].status !== 'in' || index === selected) {
      kept.push(index);
      continue;
    }
    // A pixel as one number: a canvas is far less than 2^20 pixels wide or high.
    const cell = Math.floor(pixelX[index]) * 1_048_576 + Math.floor(pixelY[index]);
    if (taken.has(cell)) continue;
    taken.add(cell);
    kept.push(index);
  }
  return kept;
}
