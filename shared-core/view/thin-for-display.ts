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
  let column = -1;
  let first = -1;
  let low = -1;
  let high = -1;
  let last = -1;
  const flush = () => {
    for (const index of [first, low, high, last]) if (index >= 0) keep[index] = 1;
  };
  points.forEach((point, index) => {
    const y = point.y;
    if (y === null) {
      keep[index] = 1;
      if (index > 0) keep[index - 1] = 1;
      if (index + 1 < points.length) keep[index + 1] = 1;
      return;
    }
    const at = Math.min(columns - 1, Math.max(0, Math.floor(((point.x - range.from) / span) * columns)));
    if (at !== column) {
      flush();
      column = at;
      first = low = high = last = index;
      return;
    }
    last = index;
    if (y < (points[low].y as number)) low = index;
    if (y > (points[high].y as number)) high = index;
  });
  flush();
  return points.filter((_, index) => keep[index] === 1);
}
