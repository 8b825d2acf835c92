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
  // The rows taken in each pixel column. Marks come in period order, so a column's marks mostly
  // follow each other and the column's short list is looked up once for all of them.
  const columns = new Map<number, number[]>();
  let column = Number.NaN;
  let rows: number[] = [];
  for (let index = 0; index < points.length; index++) {
    if (points[index].status !== 'in' || index === selected) {
      kept.push(index);
      continue;
    }
    const x = Math.floor(pixelX[index]);
    const y = Math.floor(pixelY[index]);
    if (x !== column) {
      column = x;
      rows = columns.get(x) ?? [];
      if (rows.length === 0) columns.set(x, rows);
    }
    if (rows.includes(y)) continue;
    rows.push(y);
    kept.push(index);
  }
  return kept;
}
