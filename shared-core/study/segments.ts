import { fail, ok, type Result } from '../result.js';
import type {
  AnalysisOptions,
  AnalysisResult,
  Exclusion,
  Observation,
  PeriodResult,
} from './analysis-types.js';
import { analyzePhaseOne } from './phase-one.js';

/**
 * Segments: the history split at known process changes, each part with limits of its own.
 *
 * A Phase I study assumes one stable process. Where the process is known to have changed (a new
 * die, a new supplier, a changed inspection method), pooling the periods before and after gives
 * limits that describe neither; each segment is estimated on its own periods alone, and the
 * signal rules never run across a split (common practice).
 */

/** The history starts a new segment at period `index` (> 0), for `reason`. */
export interface Split {
  index: number;
  label: string;
  reason: string;
  /** The audit event that made the split, when it came from a study's chain. */
  seq?: number;
}

export interface SegmentResult {
  /** First period of the segment (index into the whole history). */
  start: number;
  /** One past the segment's last period. */
  end: number;
  /** Why the segment starts (null for the first). */
  reason: string | null;
  /** The segment's own Phase I analysis; its periods carry indices into the whole history. */
  result: AnalysisResult;
}

/**
 * Each segment analyzed on its own. The chart kind is chosen once for the whole history (c only
 * when every k is equal), so all segments plot on one scale.
 */
export function analyzeSegments(
  observations: readonly Observation[],
  exclusions: readonly Exclusion[],
  options: AnalysisOptions,
  splits: readonly Split[],
): Result<SegmentResult[]> {
  if (observations.length === 0) return fail({ message: 'there are no periods to analyze' });
  const starts = [0, ...splits.map((s) => s.index).filter((i) => i > 0 && i < observations.length)];
  const bounds = [...new Set(starts)].sort((a, b) => a - b);
  const reasons = new Map(splits.map((s) => [s.index, s.reason]));
  const sameUnits = observations.every((o) => o.units === observations[0].units);
  const chartOptions: AnalysisOptions = { ...options, chart: options.chart ?? (sameUnits ? 'c' : 'u') };

  const segments: SegmentResult[] = [];
  for (let s = 0; s < bounds.length; s++) {
    const start = bounds[s];
    const end = bounds[s + 1] ?? observations.length;
    const own = exclusions
      .filter((e) => e.index >= start && e.index < end)
      .map((e) => ({ index: e.index - start, cause: e.cause }));
    const analysis = analyzePhaseOne(observations.slice(start, end), own, chartOptions);
    if (!analysis.ok) {
      if (bounds.length === 1) return analysis;
      const first = observations[start].label;
      const last = observations[end - 1].label;
      return fail(
        ...analysis.findings.map((f) => ({ ...f, message: `segment ${first}–${last}: ${f.message}` })),
      );
    }
    const result = analysis.value;
    const periods =
      start === 0 ? result.periods : result.periods.map((p) => ({ ...p, index: p.index + start }));
    segments.push({ start, end, reason: reasons.get(start) ?? null, result: { ...result, periods } });
  }
  return ok(segments);
}

/** Every period of every segment in order, each with its own segment's center and limits. */
export function segmentPeriods(segments: readonly SegmentResult[]): PeriodResult[] {
  return segments.length === 1 ? segments[0].result.periods : segments.flatMap((s) => s.result.periods);
}

/** The segment period `index` belongs to (the last one for an index past the end). */
export function segmentOf(segments: readonly SegmentResult[], index: number): SegmentResult {
  return segments.find((s) => index >= s.start && index < s.end) ?? segments[segments.length - 1];
}
