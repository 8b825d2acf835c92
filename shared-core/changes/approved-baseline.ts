import { fail, ok, type Result } from '../result.js';
import type { AnalysisResult, Exclusion, Observation } from '../study/analysis-types.js';
import { analyzePhaseOne } from '../study/phase-one.js';
import type { Revision } from '../study/revision-schema.js';
import type { Study } from '../study/study-schema.js';
import { deriveState } from '../study/study-state.js';

/** The frozen baseline of an approved revision: its periods, exclusions and the analysis it signed. */
export interface ApprovedBaseline {
  revision: Revision;
  observations: Observation[];
  exclusions: Exclusion[];
  analysis: AnalysisResult;
}

/**
 * The latest approved revision of a study, recomputed from the study as it stood when the revision
 * was put forward (the chain folded up to the revision's anchored head) with the revision's own
 * method. A revision whose recomputed center differs from the one it signed is refused: the limits
 * a change is judged against must be the limits that were approved, not a new computation.
 */
export function approvedBaseline(study: Study): Result<ApprovedBaseline> {
  const approved = study.revisions.filter((r) => r.status === 'approved');
  if (approved.length === 0)
    return fail({
      message: 'the study has no approved revision: approve its limits before comparing against them',
    });
  const revision = approved.reduce((latest, r) => (r.number > latest.number ? r : latest));
  if (!study.events.some((event) => event.hash === revision.chainHead))
    return fail({
      message: `revision ${revision.number} is anchored at an event that is no longer in the chain; the study cannot serve as a baseline`,
    });
  const state = deriveState(study, revision.chainHead);
  const analysis = analyzePhaseOne(state.observations, state.exclusions, revision.method);
  if (!analysis.ok) return analysis;
  const center = analysis.value.center;
  if (Math.abs(center - revision.center) > 1e-9 * Math.max(1, Math.abs(revision.center)))
    return fail({
      message: `revision ${revision.number} signed a center of ${revision.center}, but its periods recompute to ${center}; the study cannot serve as a baseline`,
    });
  return ok({
    revision,
    observations: state.observations,
    exclusions: state.exclusions,
    analysis: analysis.value,
  });
}
