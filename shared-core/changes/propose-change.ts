import { appendEvent, chainHead, sealStudy } from '../study/audit-chain.js';
import { fail, ok, type Result } from '../result.js';
import type { AnalysisResult } from '../study/analysis-types.js';
import { limitsTable } from '../study/revision-limits.js';
import { currentAnalysis, scopeIn } from '../study/revision-scope.js';
import { reasonForChangeList, type ReasonCategory, type Revision } from '../study/revision-schema.js';
import type { Study } from '../study/study-schema.js';
import { deriveState, splitAt } from '../study/study-state.js';
import { approvedBaseline, type ApprovedBaseline } from './approved-baseline.js';
import { changeEvidence, type ChangeEvidence } from './change-evidence.js';
import type { ChangePointOptions } from './change-point.js';

/**
 * A limit change starts here: the approved revision stays frozen, the history is split at the
 * first period of the new study, and a draft revision is opened with the reason for the change.
 * The draft's Phase I is the last segment, worked like any study (exclusions, method); the sign-off
 * signs it as it then stands, and the evidence compares it with the approved revision.
 */

export interface ChangeProposal {
  who: string;
  category: ReasonCategory;
  /** What changed and why the approved limits no longer serve, in the proposer's words. */
  reason: string;
  /** The first period of the new study (index into the history). */
  firstIndex: number;
}

/** The latest approved revision, or undefined. */
function latestApproved(study: Study): Revision | undefined {
  return study.revisions
    .filter((r) => r.status === 'approved')
    .reduce<Revision | undefined>((a, b) => (a === undefined || b.number > a.number ? b : a), undefined);
}

/** The first period after the approved revision's own: where new production starts. */
export function firstNewPeriod(study: Study): number {
  const approved = latestApproved(study);
  if (!approved) return 0;
  const state = deriveState(study, approved.chainHead);
  return scopeIn(state, approved.segmentStart ?? 0).end;
}

export function proposeChange(study: Study, proposal: ChangeProposal, now: string): Result<Study> {
  const approved = latestApproved(study);
  if (!approved)
    return fail({ message: 'the study has no approved revision: a change needs approved limits to replace' });
  if (study.revisions.some((r) => r.status === 'draft'))
    return fail({
      message: 'a draft revision is already open: sign it or let it be voided before proposing another',
    });
  if (!reasonForChangeList.some((r) => r.id === proposal.category))
    return fail({ column: 'category', message: `"${proposal.category}" is not a reason for a change` });
  const reason = proposal.reason.trim();
  if (!reason) return fail({ column: 'reason', message: 'a change needs its reason in words' });
  const who = proposal.who.trim();
  if (!who) return fail({ message: 'a change needs the name of the person proposing it' });
  const { firstIndex } = proposal;
  const count = study.observations.length;
  if (!Number.isInteger(firstIndex) || firstIndex < 0 || firstIndex >= count)
    return fail({ message: `there is no period ${firstIndex + 1}: the study has ${count}` });

  let current = study;
  const splits = deriveState(current).splits;
  if (firstIndex > 0 && !splits.some((s) => s.index === firstIndex)) {
    const split = splitAt(current, { who, why: `limit change proposed: ${reason}`, index: firstIndex }, now);
    if (!split.ok) return split;
    current = split.value;
  }
  const later = deriveState(current).splits.find((s) => s.index > firstIndex);
  if (later)
    return fail({
      message: `a segment starts later, at period ${later.label}: the new study must be the last segment (remove that split first)`,
    });
  const analysis = currentAnalysis(current);
  if (!analysis.ok) return analysis;

  const number = current.revisions.reduce((max, r) => Math.max(max, r.number), 0) + 1;
  const id = `rev-${number}`;
  current = appendEvent(
    current,
    { type: 'revision-drafted', who, why: reason, payload: { revisionId: id, supersedes: approved.id } },
    now,
  );
  const result = analysis.value;
  const draft: Revision = {
    id,
    number,
    status: 'draft',
    reasonCategory: proposal.category,
    reasonForChange: reason,
    segmentStart: result.scope.start,
    supersedes: approved.id,
    method: deriveState(current).method,
    center: result.center,
    limits: limitsTable(result),
    included: labels(result, true),
    excluded: labels(result, false),
    chainHead: chainHead(current),
    signOffs: [],
  };
  return ok(sealStudy({ ...current, revisions: [...current.revisions, draft] }));
}

const labels = (result: AnalysisResult, included: boolean) =>
  result.periods.filter((p) => (p.status !== 'excluded') === included).map((p) => p.label);

/**
 * Why a change's draft no longer stands for its own study, or null: the split that starts its
 * study was undone or removed, so its last segment would mix approved and new periods.
 */
export function changeScopeProblem(study: Study, draft: Revision, scopeStart: number): string | null {
  if (!draft.supersedes || scopeStart === (draft.segmentStart ?? 0)) return null;
  const label = study.observations[draft.segmentStart ?? 0]?.label ?? '?';
  return `revision ${draft.number} is a change whose study starts at period ${label}, but the history no longer starts a segment there (the split was undone or removed): redo or restore the split, so that approved and new periods are not mixed`;
}

export interface DraftChangeEvidence extends ChangeEvidence {
  approved: ApprovedBaseline;
  proposed: AnalysisResult;
  draft: Revision;
}

/**
 * The evidence for the open draft change as the study now stands (the draft's segment with the
 * current decisions), against the approved revision it would replace.
 */
export function draftChangeEvidence(
  study: Study,
  options: { shifts?: readonly number[]; changePoint?: ChangePointOptions } = {},
): Result<DraftChangeEvidence> {
  const draft = [...study.revisions].reverse().find((r) => r.status === 'draft' && r.supersedes);
  if (!draft)
    return fail({
      message: 'no change is proposed: there is no open draft revision replacing approved limits',
    });
  const baseline = approvedBaseline(study, draft.supersedes);
  if (!baseline.ok) return baseline;
  const proposed = currentAnalysis(study);
  if (!proposed.ok) return proposed;
  const { scope, ...result } = proposed.value;
  const moved = changeScopeProblem(study, draft, scope.start);
  if (moved) return fail({ message: moved });
  const evidence = changeEvidence({
    approved: baseline.value.analysis,
    approvedRules: baseline.value.revision.method.rules,
    proposed: result,
    proposedRules: deriveState(study).method.rules,
    ...options,
  });
  if (!evidence.ok) return evidence;
  return ok({ ...evidence.value, approved: baseline.value, proposed: result, draft });
}
