import { iterationHistory } from '../../../shared-core/study/iteration-history.js';
import type { Iteration } from '../../../shared-core/study/analysis-types.js';
import type { Revision } from '../../../shared-core/study/revision-schema.js';
import { deriveState } from '../../../shared-core/study/study-state.js';
import type { Study } from '../../../shared-core/study/study-schema.js';
import type { AuditEvent } from '../../../shared-core/study/audit-event.js';
import { fail, ok, type Result } from '../../../shared-core/result.js';
import { revisionAnalysis, signOffStates } from '../signing/sign-off.js';
import type { ChangeContent, PacketContent } from './packet-content.js';
import type { AnalysisResult } from '../../../shared-core/study/analysis-types.js';
import { approvedBaseline } from '../../../shared-core/changes/approved-baseline.js';
import { changeEvidence } from '../../../shared-core/changes/change-evidence.js';
import { reasonForChangeList } from '../../../shared-core/study/revision-schema.js';
import { limitsAtUnits } from '../../../shared-core/changes/average-run-length.js';
import { arlCurve } from '../../../shared-core/view/arl-curve.js';

/**
 * The revision a packet is made for: an open change (a draft that supersedes approved limits, the
 * thing a manager is asked to decide), else the latest approved one, else the latest draft, else
 * the latest.
 */
export function packetRevision(study: Study): Revision | undefined {
  const revisions = [...study.revisions].reverse();
  return (
    revisions.find((r) => r.status === 'draft' && r.supersedes !== undefined) ??
    revisions.find((r) => r.status === 'approved') ??
    revisions.find((r) => r.status === 'draft') ??
    revisions[0]
  );
}

export interface PacketSource {
  study: Study;
  revision: Revision;
  /** The study file's bytes as read, embedded unchanged in the PDF. */
  studyBytes: Uint8Array;
  studyFileName: string;
  generatedAt: string;
}

/**
 * Everything the packet shows, computed from the study as the revision stands: the analysis at
 * the revision's anchor with its method, the exclusions with who and when, the iterations, the
 * sign-offs checked again, and the audit trail in words.
 */
export function packetContent(source: PacketSource): Result<PacketContent> {
  const { study, revision } = source;
  const analysis = revisionAnalysis(study, revision);
  if (!analysis.ok) return analysis;
  const anchored = anchoredEvents(study, revision);
  const state = deriveState(study, revision.chainHead);
  const excludedBy = new Map<number, AuditEvent>();
  for (const event of anchored) if (event.type === 'excluded') excludedBy.set(event.payload.index, event);
  // A revision of a later segment shows only the recomputations made since that segment began.
  const start = revision.segmentStart ?? 0;
  const segmentBegan =
    start > 0 ? anchored.findLastIndex((e) => e.type === 'split-added' && e.payload.index === start) : -1;
  const recorded = anchored.slice(segmentBegan + 1).filter((e) => e.type === 'iteration');
  let iterations: Iteration[] = recorded.map((e) => {
    const p = (e as Extract<AuditEvent, { type: 'iteration' }>).payload;
    return { excluded: p.excluded, center: p.center, lcl: p.lcl, ucl: p.ucl, signals: p.signals };
  });
  if (iterations.length === 0) {
    const end = start + analysis.value.periods.length;
    const own = state.exclusions
      .filter((e) => e.index >= start && e.index < end)
      .map((e) => ({ index: e.index - start, cause: e.cause }));
    const steps = own.length > 0 ? [[], own] : [[]];
    const history = iterationHistory(state.observations.slice(start, end), steps, revision.method);
    if (!history.ok) return fail(...history.findings);
    iterations = history.value;
  }
  const change = revision.supersedes ? changeContent(study, revision, analysis.value) : undefined;
  if (change && !change.ok) return change;
  const identity = study.identity;
  const title =
    [identity.part, identity.processStep, identity.characteristic].filter((s) => s.trim()).join(' · ') ||
    study.id;
  return ok({
    studyId: study.id,
    title,
    identity,
    source: { file: study.source.file, sha256: study.source.sha256 },
    revision: {
      number: revision.number,
      status: revision.status,
      ...(revision.effectiveDate ? { effectiveDate: revision.effectiveDate } : {}),
      ...(revision.reviewDate ? { reviewDate: revision.reviewDate } : {}),
      ...(revision.reactionPlan ? { reactionPlan: revision.reactionPlan } : {}),
    },
    options: revision.method,
    result: analysis.value,
    iterations,
    exclusions: state.exclusions.map((exclusion) => {
      const event = excludedBy.get(exclusion.index);
      return {
        label: study.observations[exclusion.index]?.label ?? `#${exclusion.index + 1}`,
        cause: exclusion.cause,
        who: event?.who ?? '',
        when: event?.time ?? '',
      };
    }),
    signOffs: signOffStates(study, revision),
    audit: study.events.map((event) => ({
      seq: event.seq,
      time: event.time,
      who: event.who,
      what: eventWords(event),
      hash: event.hash,
    })),
    ...(change ? { change: change.value } : {}),
    generatedAt: source.generatedAt,
    studyDocument: { fileName: source.studyFileName, bytes: source.studyBytes },
  });
}

/**
 * The change section of a revision that supersedes an approved one: the reason, the approved
 * revision as it was frozen (recomputed at its anchor by approvedBaseline, which refuses one whose
 * periods no longer give the center it signed), and the evidence comparing the two studies.
 */
function changeContent(study: Study, revision: Revision, proposed: AnalysisResult): Result<ChangeContent> {
  const baseline = approvedBaseline(study, revision.supersedes);
  if (!baseline.ok) return baseline;
  const approved = baseline.value.revision;
  const evidence = changeEvidence({
    approved: baseline.value.analysis,
    approvedRules: approved.method.rules,
    proposed,
    proposedRules: revision.method.rules,
  });
  if (!evidence.ok) return evidence;
  const units = evidence.value.arl?.units;
  const curve =
    units === undefined
      ? null
      : arlCurve(
          { at: limitsAtUnits(baseline.value.analysis, units), rules: approved.method.rules },
          { at: limitsAtUnits(proposed, units), rules: revision.method.rules },
        );
  const words = reasonForChangeList.find((r) => r.id === revision.reasonCategory)?.words;
  return ok({
    ...(revision.reasonCategory ? { reasonCategory: revision.reasonCategory } : {}),
    ...(words ? { reasonWords: words } : {}),
    reason: revision.reasonForChange ?? '',
    approved: {
      id: approved.id,
      number: approved.number,
      ...(approved.effectiveDate ? { effectiveDate: approved.effectiveDate } : {}),
      ...(approved.reviewDate ? { reviewDate: approved.reviewDate } : {}),
      options: approved.method,
      result: baseline.value.analysis,
      signOffs: signOffStates(study, approved),
    },
    evidence: evidence.value,
    arlCurve: curve?.ok ? curve.value : null,
  });
}

function anchoredEvents(study: Study, revision: Revision): AuditEvent[] {
  const end = study.events.findIndex((e) => e.hash === revision.chainHead);
  return end < 0 ? study.events : study.events.slice(0, end + 1);
}

function eventWords(event: AuditEvent): string {
  const why = event.why ? ` (${event.why})` : '';
  switch (event.type) {
    case 'excluded':
      return `excluded ${event.payload.label}: ${event.payload.cause.category}, ${event.payload.cause.description}${why}`;
    case 'reinstated':
      return `reinstated ${event.payload.label}${why}`;
    case 'corrected':
      return `corrected ${event.payload.field} of ${event.payload.label} from ${event.payload.original} to ${event.payload.value}${why}`;
    case 'note-added':
      return `note on ${event.payload.label}: ${event.payload.text}`;
    case 'undo':
      return `undid event ${event.payload.target}${why}`;
    case 'redo':
      return `redid event ${event.payload.target}${why}`;
    default:
      return `${event.type}${'payload' in event && event.payload && 'revisionId' in event.payload ? ` ${String(event.payload.revisionId)}` : ''}${why}`;
  }
}
