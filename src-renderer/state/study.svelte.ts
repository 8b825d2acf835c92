import {
  analyzeSegments,
  segmentPeriods,
  segmentOf,
  type SegmentResult,
  type Split,
} from '../../shared-core/study/segments.js';
import {
  defaultOptions,
  type AnalysisOptions,
  type AnalysisResult,
  type AssignableCause,
  type Iteration,
  type Observation,
  type PeriodResult,
} from '../../shared-core/study/analysis-types.js';
import type { Finding, Result } from '../../shared-core/result.js';
import { iterationSnapshot } from '../../shared-core/study/iteration-history.js';
import type { StudyView } from '../../shared-core/api.js';
import type { Study } from '../../shared-core/study/study-schema.js';
import type { AuditEvent } from '../../shared-core/study/audit-event.js';
import { studySchema } from '../../shared-core/study/study-schema.js';
import { newStudy, observationsHash } from '../../shared-core/study/new-study.js';
import { localTime } from '../../shared-core/study/local-time.js';
import * as decisions from '../../shared-core/study/study-state.js';

export interface StudyMeta {
  name: string;
  /** The inspection unit as the user defines it ("one board", "50 m² of cloth"). */
  unit: string;
  /** True for the invented demo scenario. */
  demo: boolean;
  source?: { file: string };
}

export interface ViewSettings {
  standardized: boolean;
  averageK: boolean;
}

/** The values in first-seen order without repeats (plain data, not reactive state). */
function distinct<T extends string | number>(values: T[]): T[] {
  const seen: Record<string, true> = {};
  return values.filter((value) => (seen[String(value)] ? false : (seen[String(value)] = true)));
}

/** True when both arrays hold the very same elements in the same order. */
function sameElements<T>(a: readonly T[], b: readonly T[]): boolean {
  if (a === b) return true;
  if (a.length !== b.length) return false;
  for (let i = 0; i < a.length; i++) if (a[i] !== b[i]) return false;
  return true;
}

/** The local clock's reading as audit events record it; a value, not reactive state. */
function now(): string {
  const offset = -new globalThis.Date(Date.now()).getTimezoneOffset();
  return localTime(Date.now(), offset);
}

function withoutUndefined<T extends object>(value: T): T {
  return Object.fromEntries(Object.entries(value).filter(([, v]) => v !== undefined)) as T;
}

/**
 * The open study as the screens see it. The record is the study document with its audit chain;
 * every decision (exclusion, reinstatement, correction, method change, split, undo, redo) is
 * appended to it through the core's study-state functions, and the analysis is recomputed in the
 * page from the pure core, so an exclusion redraws without a round trip to the host.
 *
 * A split history is analyzed segment by segment: the chart and table show every segment with its
 * own limits (`chartPeriods`), while `result` is the current (last) segment alone.
 */
export class StudyState {
  meta = $state<StudyMeta>({ name: '', unit: 'inspection unit', demo: false });
  document = $state.raw<Study | null>(null);
  view = $state<ViewSettings>({ standardized: false, averageK: false });
  /** The selected period, as its position in period order. */
  selected = $state<number | null>(null);
  /** Every recompute of this session: the first is the study as opened. */
  iterations = $state.raw<Iteration[]>([]);
  /** The first period of the segment each recompute in `iterations` was of (same order). */
  iterationStarts = $state.raw<number[]>([]);
  user = $state('engineer');
  readOnly = $state(false);
  openFindings = $state.raw<Finding[]>([]);
  /** The last refusal of a decision, for the screens to show. */
  lastProblem = $state('');
  /** When set, the chart shows only this category's nonconformities. */
  category = $state<string | null>(null);
  /** The document as it was opened or started, before any decision of this session. */
  openedDocument = $state.raw<Study | null>(null);

  /** The decisions folded: corrected observations, exclusions in force, method, undo and redo. */
  readonly state = $derived(this.document ? decisions.deriveState(this.document) : null);
  /**
   * The observations with corrections applied. Most decisions (an exclusion, a note, a split)
   * leave every observation as it was: the fold then gives the same observations in a new array,
   * and this keeps the array before it, so what depends on the observations alone (the categories,
   * the period labels, the chart kind's units check) is not worked out again.
   */
  readonly observations: Observation[] = $derived.by(() => {
    const now = this.state?.observations ?? [];
    const before = this.#lastObservations;
    if (sameElements(before, now)) return before;
    this.#lastObservations = now;
    return now;
  });
  /** The observations last handed out (plain, not reactive: it only remembers). */
  #lastObservations: Observation[] = [];
  readonly exclusions = $derived(this.state?.exclusions ?? []);
  readonly options: AnalysisOptions = $derived(this.state?.method ?? defaultOptions);
  readonly audit: AuditEvent[] = $derived(this.document?.events ?? []);
  readonly notes = $derived(this.state?.notes ?? []);
  readonly canUndo = $derived(!this.readOnly && this.state?.undoable != null);
  readonly canRedo = $derived(!this.readOnly && this.state?.redoable != null);

  /** The observations as charted: all nonconformities, or one category's. */
  readonly charted: Observation[] = $derived(
    this.category === null
      ? this.observations
      : this.observations.map((o) => ({ ...o, count: o.categories?.[this.category!] ?? 0 })),
  );

  readonly categories: string[] = $derived(
    distinct(this.observations.flatMap((o) => Object.keys(o.categories ?? {}))),
  );

  /** Where the history starts a new segment with limits of its own (a known process change). */
  readonly splits: Split[] = $derived(this.state?.splits ?? []);

  /** Each segment analyzed on its own (one segment when the history has no split). */
  readonly segmentAnalysis: Result<SegmentResult[]> = $derived(
    this.charted.length === 0
      ? {
          ok: false as const,
          findings: [{ message: 'The study has no periods yet: import a history on the Data screen.' }],
        }
      : analyzeSegments(this.charted, this.exclusions, this.options, this.splits),
  );

  readonly segments: SegmentResult[] = $derived(this.segmentAnalysis.ok ? this.segmentAnalysis.value : []);

  /** Every period of the history in order, each with its own segment's center and limits. */
  readonly chartPeriods: PeriodResult[] = $derived(
    this.segments.length === 0 ? [] : segmentPeriods(this.segments),
  );

  /**
   * The current segment's analysis: the last segment, the process as it now runs. It is what a
   * revision approves, what the checks judge and what sign-off signs; with no split it is the whole
   * history.
   */
  readonly analysis: Result<AnalysisResult> = $derived(
    this.segmentAnalysis.ok
      ? { ok: true as const, value: this.segmentAnalysis.value[this.segmentAnalysis.value.length - 1].result }
      : this.segmentAnalysis,
  );

  readonly result: AnalysisResult | null = $derived(this.analysis.ok ? this.analysis.value : null);

  /** The current segment (the last), or null when nothing could be analyzed. */
  readonly currentSegment: SegmentResult | null = $derived(this.segments.at(-1) ?? null);

  /**
   * The recomputes of the current segment, with their place in `iterations`: the recompute strip
   * follows the current segment, never comparing limits of different segments.
   */
  readonly currentIterations: { iteration: Iteration; step: number }[] = $derived(
    this.iterations
      .map((iteration, step) => ({ iteration, step }))
      .filter(({ step }) => this.iterationStarts[step] === (this.currentSegment?.start ?? 0)),
  );

  /** The current segment's first and last period labels ("W14–W26"), or '' without a segment. */
  readonly currentRange: string = $derived(
    this.result ? `${this.result.periods[0].label}–${this.result.periods.at(-1)!.label}` : '',
  );

  /** The period at a position of the whole history (positions and indices coincide). */
  periodAt(position: number | null): PeriodResult | undefined {
    return position === null ? undefined : this.chartPeriods[position];
  }

  /** The segment a period belongs to. */
  segmentOf(index: number): SegmentResult | undefined {
    return this.segments.length === 0 ? undefined : segmentOf(this.segments, index);
  }

  /** The split that starts a segment at period `index`, if there is one. */
  splitOf(index: number): Split | undefined {
    return this.splits.find((split) => split.index === index);
  }

  /** Opens a study the host handed over (the demo, an opened file, an import). */
  loadView(view: StudyView, demo = false): void {
    const parsed = studySchema.safeParse(view.document);
    const document = parsed.success
      ? parsed.data
      : this.#freshDocument(
          view.title,
          view.unitName,
          view.observations,
          { ...defaultOptions, ...view.options },
          demo,
        );
    this.#open(
      {
        name: view.title,
        unit: view.unitName,
        demo,
        source: view.file ? { file: view.file.fileName } : undefined,
      },
      document,
    );
    this.readOnly = view.readOnly;
    this.openFindings = view.findings;
  }

  /** Starts a study from an import: the source file's hash, settings and report are bound by its first events. */
  loadImport(input: {
    title: string;
    unit: string;
    file: string;
    sha256: string;
    observations: Observation[];
    importSettings: Record<string, unknown>;
    importReport: Record<string, unknown>;
  }): void {
    const document = newStudy({
      id: globalThis.crypto.randomUUID(),
      identity: {
        part: input.title,
        processStep: '',
        characteristic: '',
        inspectionUnit: input.unit,
        owner: this.user,
      },
      source: {
        file: input.file,
        sha256: /^[0-9a-f]{64}$/.test(input.sha256) ? input.sha256 : observationsHash(input.observations),
        importSettings: JSON.parse(JSON.stringify(input.importSettings)),
        importReport: JSON.parse(JSON.stringify(input.importReport)),
      },
      observations: input.observations,
      method: withoutUndefined({ ...defaultOptions }),
      who: this.user,
      now: now(),
    });
    this.#open({ name: input.title, unit: input.unit, demo: false, source: { file: input.file } }, document);
  }

  /** Opens observations that have no document yet (a new study made in the page). */
  load(meta: StudyMeta, observations: Observation[], options: Partial<AnalysisOptions> = {}): void {
    this.#open(
      meta,
      this.#freshDocument(meta.name, meta.unit, observations, { ...defaultOptions, ...options }, meta.demo),
    );
  }

  /** Takes the document back from the host after it signed it (its chain is checked like any other). */
  replaceDocument(document: Study): void {
    this.document = document;
  }

  exclude(index: number, cause: AssignableCause): boolean {
    return this.#apply((doc) => decisions.exclude(doc, { who: this.user, index, cause }, now()));
  }

  reinstate(index: number, reason?: string): boolean {
    return this.#apply((doc) =>
      decisions.reinstate(doc, { who: this.user, index, ...(reason ? { why: reason } : {}) }, now()),
    );
  }

  correct(index: number, field: 'count' | 'units' | 'date', value: number | string, reason: string): boolean {
    return this.#apply((doc) =>
      decisions.correct(doc, { who: this.user, index, field, value, reason }, now()),
    );
  }

  setOptions(change: Partial<AnalysisOptions>): boolean {
    const method = withoutUndefined({ ...this.options, ...change });
    return this.#apply((doc) => decisions.changeMethod(doc, { who: this.user, method }, now()));
  }

  addNote(index: number, text: string): boolean {
    return this.#apply((doc) => decisions.addNote(doc, { who: this.user, index, text }, now()));
  }

  /** Starts a new segment at period `index`: a known process change, for `reason`. */
  split(index: number, reason: string): boolean {
    return this.#apply((doc) => decisions.splitAt(doc, { who: this.user, why: reason, index }, now()));
  }

  /** Joins the segment starting at period `index` to the one before it. */
  removeSplit(index: number, reason?: string): boolean {
    return this.#apply((doc) =>
      decisions.removeSplit(doc, { who: this.user, index, ...(reason ? { why: reason } : {}) }, now()),
    );
  }

  undo(): boolean {
    return this.#apply((doc) => decisions.undo(doc, this.user, now()));
  }

  redo(): boolean {
    return this.#apply((doc) => decisions.redo(doc, this.user, now()));
  }

  /** The exclusion of an observation, if it has one. */
  exclusionOf(index: number) {
    return this.exclusions.find((e) => e.index === index);
  }

  #apply(decide: (doc: Study) => Result<Study>): boolean {
    const doc = this.document;
    if (!doc) return false;
    if (this.readOnly) {
      this.lastProblem = 'This study is read-only: its audit chain is broken. Save a copy to keep working.';
      return false;
    }
    const next = decide(doc);
    if (!next.ok) {
      this.lastProblem = next.findings.map((f) => f.message).join('; ');
      return false;
    }
    this.lastProblem = '';
    this.document = next.value;
    this.#snapshot();
    return true;
  }

  #open(meta: StudyMeta, document: Study): void {
    this.meta = meta;
    this.document = document;
    this.openedDocument = document;
    this.category = null;
    this.readOnly = false;
    this.openFindings = [];
    this.lastProblem = '';
    this.selected = null;
    this.iterations = [];
    this.iterationStarts = [];
    this.#snapshot();
  }

  #snapshot(): void {
    const result = this.result;
    if (!result) return;
    this.iterations = [...this.iterations, iterationSnapshot(result)];
    this.iterationStarts = [...this.iterationStarts, this.currentSegment?.start ?? 0];
  }

  #freshDocument(
    title: string,
    unit: string,
    observations: Observation[],
    method: AnalysisOptions,
    demo: boolean,
  ): Study {
    return newStudy({
      id: globalThis.crypto.randomUUID(),
      identity: {
        part: title,
        processStep: '',
        characteristic: '',
        inspectionUnit: unit,
        owner: this.user,
        ...(demo ? { demo } : {}),
      },
      source: { file: title, sha256: observationsHash(observations), importSettings: {}, importReport: {} },
      observations,
      method: withoutUndefined(method),
      who: this.user,
      now: now(),
    });
  }
}

export const study = new StudyState();
