import type { SegmentResult } from '../study/segments.js';
import { iterationSnapshot } from '../study/iteration-history.js';

/** One segment as the Review screen lists it. */
export interface SegmentSummary {
  start: number;
  end: number;
  /** Labels of its first and last periods. */
  first: string;
  last: string;
  /** Periods in its estimate (not excluded). */
  m: number;
  center: number;
  /** Limits at k̄, as the recompute strip shows them (null: no LCL). */
  lcl: number | null;
  ucl: number;
  signals: number;
  /** The process change it starts at (null for the first segment). */
  reason: string | null;
}

/** Each segment's range, size, center and limits at k̄: the figures a reviewer compares across a split. */
export function segmentSummaries(segments: readonly SegmentResult[]): SegmentSummary[] {
  return segments.map(({ start, end, reason, result }) => {
    const atMean = iterationSnapshot(result);
    return {
      start,
      end,
      first: result.periods[0].label,
      last: result.periods[result.periods.length - 1].label,
      m: result.m,
      center: result.center,
      lcl: atMean.lcl,
      ucl: atMean.ucl,
      signals: atMean.signals.length,
      reason,
    };
  });
}
