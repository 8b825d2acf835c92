import { fail, ok, type Result } from '../result.js';
import type { AnalysisOptions, AnalysisResult } from './analysis-types.js';
import type { Revision } from './revision-schema.js';
import { analyzeSegments, segmentOf } from './segments.js';
import type { Study } from './study-schema.js';
import { deriveState, type StudyState } from './study-state.js';

/**
 * What a revision covers. Limits are approved for one segment of the history: the last one when
 * the revision is drafted (the process as it now runs). A revision without `segmentStart` covers
 * the history from its first period.
 */

export interface Scope {
  /** First period of the segment (index into the whole history). */
  start: number;
  /** One past its last period. */
  end: number;
}

/** The segment that starts at or contains period `start`, in a folded state. */
export function scopeIn(state: Pick<StudyState, 'observations' | 'splits'>, start: number): Scope {
  const starts = [0, ...state.splits.map((s) => s.index)].filter((i) => i <= start);
  const first = Math.max(...starts);
  const next = state.splits.map((s) => s.index).find((i) => i > first);
  return { start: first, end: next ?? state.observations.length };
}

/** The segment the next revision would cover: the last segment as the study now stands. */
export function currentScope(study: Study): Scope {
  const state = deriveState(study);
  return scopeIn(state, state.observations.length - 1);
}

/** The Phase I analysis of the segment at `start`, in a folded state, with `method`. */
export function scopeAnalysis(
  state: StudyState,
  method: AnalysisOptions,
  start: number,
): Result<AnalysisResult & { scope: Scope }> {
  const segments = analyzeSegments(state.observations, state.exclusions, method, state.splits);
  if (!segments.ok) return segments;
  const segment = segmentOf(segments.value, start);
  if (segment.start !== scopeIn(state, start).start)
    return fail({ message: `no segment of the study starts at period ${start + 1}` });
  return ok({ ...segment.result, scope: { start: segment.start, end: segment.end } });
}

/**
 * The analysis a revision stands for: the study's decisions up to the revision's anchor, with the
 * revision's method, over the revision's segment only.
 */
export function revisionAnalysis(study: Study, revision: Revision): Result<AnalysisResult> {
  const state = deriveState(study, revision.chainHead);
  const analysis = scopeAnalysis(state, revision.method, revision.segmentStart ?? 0);
  if (!analysis.ok) return analysis;
  const { scope: _scope, ...result } = analysis.value;
  return ok(result);
}

/** The analysis the next sign-off would approve: the last segment as the study now stands. */
export function currentAnalysis(study: Study): Result<AnalysisResult & { scope: Scope }> {
  const state = deriveState(study);
  return scopeAnalysis(state, state.method, state.observations.length - 1);
}
