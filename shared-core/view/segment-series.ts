import type { SegmentResult } from '../study/segments.js';
import { chartSeries, type ChartSeries, type SeriesOptions, type StepVertex } from './chart-series.js';

/**
 * The chart of a split history: each segment's series drawn with its own center, limits and (in the
 * standardized view) its own rate, placed at its periods' positions in the whole history.
 *
 * The center and limit lines break at every split (a vertex with `y: null`), so a step from one
 * segment's limits to the next is never drawn as if the limits had moved within one process.
 */
export function segmentSeries(segments: readonly SegmentResult[], options: SeriesOptions = {}): ChartSeries {
  if (segments.length === 1) return chartSeries(segments[0].result, options);
  const parts = segments.map((segment) => ({
    start: segment.start,
    series: chartSeries(segment.result, options),
  }));
  const joined = (line: 'center' | 'upper' | 'lower'): StepVertex[] =>
    parts.flatMap(({ start, series }, i) => {
      const shifted = series[line].map((v) => ({ x: v.x + start, y: v.y }));
      return i === 0 ? shifted : [{ x: start + 0.5, y: null }, ...shifted];
    });
  return {
    scale: parts[0].series.scale,
    points: parts.flatMap(({ start, series }) =>
      series.points.map((p) => ({ ...p, x: p.x + start, position: p.position + start })),
    ),
    center: joined('center'),
    upper: joined('upper'),
    lower: joined('lower'),
  };
}

/** The positions where a segment starts after the first: where the chart draws a divider. */
export function splitPositions(segments: readonly SegmentResult[]): number[] {
  return segments.slice(1).map((segment) => segment.start);
}
