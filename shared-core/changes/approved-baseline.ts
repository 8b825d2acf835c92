import { fail, ok, type Result } from '../result.js';
import type { AnalysisResult, Exclusion, Observation } from '../study/analysis-types.js';
import { revisionAnalysis, scopeIn } from '../study/revision-scope.js';
import type { Revision } from '../study/revision-schema.js';
import type { Study } from '../study/study-schema.js';
import { deriveState } from '../study/study-state.js';

/** The frozen baseline of an approved revision: its periods, exclusions and the analysis it signed. */
export interface ApprovedBaseline {
  revision: Revision;
  /** The periods of the revision's segment, as they stood when it was put forward. */
  observations: Observation[];
  /** Its exclusions, indexed into `observations` (the analysis's periods keep whole-history indices). */
  exclusions: Exclusion[];
  analysis: AnalysisResult;
}

/**
 * The latest approved revision of a study (or the approved revision `revisionId`), recomputed from the study as it stood when the revision
 * was put forward (the chain folded up to the revision's anchored head) with the revision's own
 * method. A revision whose recomputed center differs from the one it signed is refused: the limits
 * a change is judged against must be the limits that were approved, not a new computation.
 */
export function approvedBaseline(study: Study, revisionId?: string): Result<ApprovedBaseline> {
  const approved = study.revisions.filter(
    (r) => r.status === 'approved' && (revisionId === undefined || r.id === revisionId),
  );
  if (approved.length === 0)
    return fail({
      message:
        revisionId === undefined
          ? 'the study has no approved revision: approve its limits before comparing against them'
          : `the study has no approved revision ${revisionId}`,
    });
  const revision = approved.reduce((latest, r) => (r.number > latest.number ? r : latest));
  if (!study.events.some((event) => event.hash === revision.chainHead))
    return fail({
      message: `revision ${revision.number} is anchored at an event that is no longer in the chain; the study cannot serve as a baseline`,
    });
  const state = deriveState(study, revision.chainHead);
  const analysis = revisionAnalysis(study, revision);
  if (!analysis.ok) return analysis;
  const center = analysis.value.center;
  if (Math.abs(center - revision.center) > 1e-9 * Math.max(1, Math.abs(revision.center)))
    return fail({
      message: `revision ${revision.number} signed a center of ${revision.center}, but its periods recompute to ${center}; the study cannot serve as a baseline`,
    });
  const { start, end } = scopeIn(state, revision.segmentStart ?? 0);
  return ok({
    revision,
    observations: state.observations.slice(start, end),
    exclusions: state.exclusions
      .filter((e) => e.index >= start && e.index < end)
      .map((e) => ({ index: e.index - start, cause: e.cause })),
    analysis: analysis.value,
  });
}
