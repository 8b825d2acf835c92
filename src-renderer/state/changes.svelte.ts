import { approvedBaseline, type ApprovedBaseline } from '../../shared-core/changes/approved-baseline.js';
import { limitsAtUnits } from '../../shared-core/changes/average-run-length.js';
import { changePoint, type ChangePoint } from '../../shared-core/changes/change-point.js';
import { checkNewPeriods } from '../../shared-core/changes/new-periods-check.js';
import {
  draftChangeEvidence,
  firstNewPeriod,
  proposeChange,
  type DraftChangeEvidence,
} from '../../shared-core/changes/propose-change.js';
import { fail, type Finding, type Result } from '../../shared-core/result.js';
import { currentScope } from '../../shared-core/study/revision-scope.js';
import { defaultSiteSettings, SiteSettingsSchema } from '../../shared-core/settings/site-settings.js';
import type { PeriodResult } from '../../shared-core/study/analysis-types.js';
import { localTime } from '../../shared-core/study/local-time.js';
import {
  reasonForChangeList,
  type ReasonCategory,
  type Revision,
} from '../../shared-core/study/revision-schema.js';
import type { SignOffRule } from '../../shared-core/study/sign-off-rules.js';
import type { Study } from '../../shared-core/study/study-schema.js';
import { addPeriods, deriveState } from '../../shared-core/study/study-state.js';
import { arlCurve, type ArlCurve } from '../../shared-core/view/arl-curve.js';
import { beforeAfterSeries, type BeforeAfter } from '../../shared-core/view/change-chart.js';
import { DataImport, type ImportedData } from './data-import.svelte.js';
import { study } from './study.svelte.js';

function now(): string {
  return localTime(Date.now(), -new Date(Date.now()).getTimezoneOffset());
}

/** The latest approved revision of a study, or null. */
export function latestApproved(document: Study | null): Revision | null {
  const approved = (document?.revisions ?? []).filter((r) => r.status === 'approved');
  return approved.reduce<Revision | null>((a, b) => (a === null || b.number > a.number ? b : a), null);
}

/** The open draft that would replace approved limits (a proposed change), or null. */
export function openChange(document: Study | null): Revision | null {
  return [...(document?.revisions ?? [])].reverse().find((r) => r.status === 'draft' && r.supersedes) ?? null;
}

/** The sign-off rule recorded with the study (its site settings), else the defaults. */
export function signOffRuleOf(document: Study | null): SignOffRule {
  const parsed = SiteSettingsSchema.safeParse(document?.siteSettings);
  return (parsed.success ? parsed.data : defaultSiteSettings).signOff;
}

export const reasonWords = (category: ReasonCategory | undefined): string =>
  reasonForChangeList.find((r) => r.id === category)?.words ?? 'no reason category recorded';

/** A new period judged against the approved limits, with its index in the whole history. */
export type CheckedPeriod = PeriodResult & { globalIndex: number };

/**
 * The Changes screen: the approved revision frozen, new periods imported and judged against its
 * limits (no recomputation), a proposed change with its reason, and the evidence a manager signs.
 * Every decision goes through the core (addPeriods, proposeChange) and lands in the open study.
 */
class Changes {
  readonly document = $derived(study.document);
  readonly approved = $derived(latestApproved(this.document));
  readonly draft = $derived(openChange(this.document));
  readonly baseline: Result<ApprovedBaseline> | null = $derived(
    this.document && this.approved ? approvedBaseline(this.document) : null,
  );
  /** The first period after the approved revision's own. */
  readonly firstNew = $derived(this.document && this.approved ? firstNewPeriod(this.document) : 0);

  /** The periods after the approved ones, judged against the frozen limits with the revision's rules. */
  readonly checked: CheckedPeriod[] = $derived.by(() => {
    const baseline = this.baseline;
    if (!baseline?.ok || !this.document) return [];
    const later = deriveState(this.document).observations.slice(this.firstNew);
    if (later.length === 0) return [];
    return checkNewPeriods(baseline.value.analysis, later, baseline.value.revision.method.rules).map(
      (p, i) => ({
        ...p,
        globalIndex: this.firstNew + i,
      }),
    );
  });
  readonly signals = $derived(this.checked.filter((p) => p.status === 'signal'));

  /**
   * Before a change is proposed: one step over the approved periods (included) and the new ones,
   * as a proposal for where the new study starts. The user decides.
   */
  readonly suggestion: (ChangePoint & { firstIndex: number; lastBefore: string; firstAfter: string }) | null =
    $derived.by(() => {
      const baseline = this.baseline;
      if (!baseline?.ok || this.draft || this.checked.length === 0) return null;
      const history = [
        ...baseline.value.analysis.periods
          .filter((p) => p.status !== 'excluded')
          .map((p) => ({ count: p.count, units: p.units, label: p.label, index: p.index })),
        ...this.checked.map((p) => ({
          count: p.count,
          units: p.units,
          label: p.label,
          index: p.globalIndex,
        })),
      ];
      if (history.length < 3) return null;
      const found = changePoint(history);
      if (!found.ok) return null;
      const after = history[found.value.splitAfter + 1];
      return {
        ...found.value,
        firstIndex: after.index,
        lastBefore: history[found.value.splitAfter].label,
        firstAfter: after.label,
      };
    });

  // The proposal form.
  category = $state<ReasonCategory>('process-change');
  reason = $state('');
  who = $state('');
  /** The first period of the new study; null means the default, the first new period. */
  chosenFirst = $state<number | null>(null);
  readonly firstIndex = $derived(this.chosenFirst ?? this.firstNew);
  problem = $state('');
  message = $state('');
  /** The study document the message was written for: a later decision makes it stale. */
  messageFor = $state.raw<Study | null>(null);
  readonly shownMessage = $derived(this.messageFor === study.document ? this.message : '');

  /** The importer of the Data screen, delivering into the open study instead of a new one. */
  readonly importer = new DataImport((imported) => this.append(imported));

  /** The importer, ready for a file of new periods: they are counted in the study's own inspection unit. */
  newPeriodsImporter(): DataImport {
    this.importer.mapping.unitName = study.meta.unit;
    return this.importer;
  }

  /**
   * The evidence for the open draft. When the split where its new study starts was undone, the last
   * segment is no longer the draft's study: the comparison would mix approved and new periods, so
   * it is refused with what to do instead.
   */
  readonly evidence: Result<DraftChangeEvidence> | null = $derived.by(() => {
    const document = this.document;
    const draft = this.draft;
    if (!document || !draft) return null;
    const start = draft.segmentStart ?? 0;
    if (currentScope(document).start !== start) {
      const label = deriveState(document).observations[start]?.label ?? `period ${start + 1}`;
      return fail({
        message: `the history is no longer split at ${label}, where the new study of revision ${draft.number} starts (the split was undone): redo it (Ctrl+Y), or start a new segment at ${label} on Review, to see the evidence again`,
      });
    }
    return draftChangeEvidence(document);
  });

  readonly beforeAfter: BeforeAfter | null = $derived(
    this.evidence?.ok
      ? beforeAfterSeries(this.evidence.value.approved.analysis, this.evidence.value.proposed)
      : null,
  );

  readonly curve: Result<ArlCurve> | null = $derived.by(() => {
    const evidence = this.evidence;
    if (!evidence?.ok || !evidence.value.arl) return null;
    const units = evidence.value.arl.units;
    return arlCurve(
      {
        at: limitsAtUnits(evidence.value.approved.analysis, units),
        rules: evidence.value.approved.revision.method.rules,
      },
      { at: limitsAtUnits(evidence.value.proposed, units), rules: evidence.value.arl.proposed.rules },
    );
  });

  readonly rule = $derived(signOffRuleOf(this.document));
  /** Who signed the open draft as prepared, when anyone did. */
  readonly preparer = $derived(this.draft?.signOffs.find((s) => s.meaning === 'prepared') ?? null);

  /**
   * Why `printedName` may not approve the open draft: the site requires separate people and the
   * same person prepared it (the host refuses it too, by key and by name). Null when nothing stands in the way.
   */
  separateRolesRefusal(printedName: string, meaning: string): string | null {
    const preparer = this.preparer;
    if (!this.rule.separatePeople || !preparer || meaning !== 'approved') return null;
    if (printedName.trim().toLowerCase() !== preparer.printedName.trim().toLowerCase()) return null;
    return `${preparer.printedName} prepared this draft: the site does not let the person who prepared a change approve it. Ask the approver to sign with their own key.`;
  }

  /** Appends imported periods after the history (an audited event); the check follows from it. */
  append(imported: ImportedData): Finding[] {
    const document = study.document;
    if (!document) return [{ message: 'open a study with approved limits first' }];
    if (study.readOnly) return [{ message: 'this study is read-only: its audit chain is broken' }];
    if (!this.approved)
      return [{ message: 'the study has no approved revision to judge new periods against' }];
    const next = addPeriods(
      document,
      {
        who: this.who.trim() || study.user,
        file: imported.file,
        sourceSha256: /^[0-9a-f]{64}$/.test(imported.sha256) ? imported.sha256 : '0'.repeat(64),
        observations: imported.observations,
      },
      now(),
    );
    if (!next.ok) return next.findings.map((f) => ({ ...f, message: `${imported.file}: ${f.message}` }));
    study.replaceDocument(next.value);
    this.importer.pasted = '';
    this.#say(`${imported.observations.length} new periods from ${imported.file} added after the history.`);
    return [];
  }

  /** Starts the change at a signalling period ("propose a change from here"). */
  startFrom(globalIndex: number): void {
    this.chosenFirst = globalIndex;
    this.problem = '';
  }

  acceptSuggestion(): void {
    if (this.suggestion) this.chosenFirst = this.suggestion.firstIndex;
  }

  propose(): boolean {
    const document = study.document;
    this.message = '';
    const missing: string[] = [];
    if (!this.who.trim()) missing.push('your name');
    if (!this.reason.trim()) missing.push('the reason for the change, in words');
    if (missing.length > 0) {
      this.problem = `Still needed to propose a change: ${missing.join(' and ')}.`;
      return false;
    }
    if (!document) return false;
    if (study.readOnly) {
      this.problem = 'This study is read-only: its audit chain is broken.';
      return false;
    }
    const next = proposeChange(
      document,
      { who: this.who.trim(), category: this.category, reason: this.reason, firstIndex: this.firstIndex },
      now(),
    );
    if (!next.ok) {
      this.problem = next.findings.map((f) => f.message).join('; ');
      return false;
    }
    this.problem = '';
    study.replaceDocument(next.value);
    this.chosenFirst = null;
    this.reason = '';
    const draft = openChange(next.value);
    this.#say(
      `Revision ${draft?.number ?? ''} is drafted: its own Phase I is the last segment, from ${
        deriveState(next.value).observations[draft?.segmentStart ?? 0]?.label ?? ''
      }.`,
    );
    return true;
  }

  #say(message: string): void {
    this.message = message;
    this.messageFor = study.document;
  }
}

export const changes = new Changes();
