/**
 * Fewer vertices for drawing, the same picture: when a series has many more points than the plot
 * has pixel columns, keep in each column only the first, lowest, highest and last point (min-max
 * decimation, common practice for time-series plots). A `y: null` vertex breaks a line, so it and
 * its neighbours are always kept. Input must be in increasing x; the kept points stay in order.
 *
 * Display only: statuses, rules and the table always use every period.
 */
export function thinForDisplay<T extends { x: number; y: number | null }>(
  points: readonly T[],
  range: { from: number; to: number },
  columns: number,
): T[] {
  if (columns < 1 || points.length <= 4 * columns) return [...points];
  const span = range.to - range.from || 1;
  const keep = new Uint8Array(points.length);
  // Plain loops and no array per column: this runs for every line of a 5,000-period chart at each redraw.
  let column = -1;
  let first = -1;
  let low = -1;
  let high = -1;
  let last = -1;
  let lowY = 0;
  let highY = 0;
  for (let index = 0; index < points.length; index++) {
    const y = points[index].y;
    if (y === null) {
      keep[index] = 1;
      if (index > 0) keep[index - 1] = 1;
      if (index + 1 < points.length) keep[index + 1] = 1;
      continue;
    }
    const at = Math.min(
      columns - 1,
      Math.max(0, Math.floor(((points[index].x - range.from) / span) * columns)),
    );
    if (at !== column) {
      if (first >= 0) keep[first] = keep[low] = keep[high] = keep[last] = 1;
      column = at;
      first = low = high = last = index;
      lowY = highY = y;
      continue;
    }
    last = index;
    if (y < lowY) {
      low = index;
      lowY = y;
    }
    if (y > highY) {
      high = index;
      highY = y;
    }
  }
  if (first >= 0) keep[first] = keep[low] = keep[high] = keep[last] = 1;
  const kept: T[] = [];
  for (let index = 0; index < points.length; index++) if (keep[index] === 1) kept.push(points[index]);
  return kept;
}
