import { analyzePhaseOne } from '../../shared-core/study/phase-one.js';
import {
  defaultOptions,
  type AnalysisOptions,
  type AnalysisResult,
  type AssignableCause,
  type Exclusion,
  type Iteration,
  type Observation,
} from '../../shared-core/study/analysis-types.js';
import type { Finding } from '../../shared-core/result.js';
import { iterationSnapshot } from '../../shared-core/study/iteration-history.js';
import type { StudyView } from '../../shared-core/api.js';

/** What one undoable step changes. */
interface Snapshot {
  exclusions: Exclusion[];
  options: AnalysisOptions;
  segmentStarts: number[];
}

export interface AuditEntry {
  at: string;
  who: string;
  action: string;
  detail: string;
}

export interface StudyMeta {
  name: string;
  /** The inspection unit as the user defines it ("one board", "50 m² of cloth"). */
  unit: string;
  /** True for the invented demo scenario. */
  demo: boolean;
  source?: { file: string; sha256?: string };
}

export interface ViewSettings {
  standardized: boolean;
  averageK: boolean;
}

/** The values in first-seen order without repeats (plain data, not reactive state). */
function distinct<T extends string | number>(values: T[]): T[] {
  const seen: Record<string, true> = {};
  return values.filter((value) => (seen[value] ? false : (seen[value] = true)));
}

/** A timestamp for the audit entry; it is a value, not reactive state. */
function nowIso(): string {
  return new globalThis.Date(Date.now()).toISOString();
}

function sameCause(a: AssignableCause, b: AssignableCause): boolean {
  return a.category === b.category && a.description === b.description && a.reference === b.reference;
}

/**
 * The open study as the screens see it: observations, decisions and the analysis they give. The
 * analysis is recomputed in the page from the pure core whenever a decision changes, so an exclusion
 * redraws without a round trip to the host.
 */
export class StudyState {
  meta = $state<StudyMeta>({ name: '', unit: 'inspection unit', demo: false });
  observations = $state.raw<Observation[]>([]);
  exclusions = $state.raw<Exclusion[]>([]);
  options = $state.raw<AnalysisOptions>({ ...defaultOptions });
  /** Positions (in period order) where a known process change starts a new segment. */
  segmentStarts = $state.raw<number[]>([]);
  view = $state<ViewSettings>({ standardized: false, averageK: false });
  /** The selected period, as its position in period order. */
  selected = $state<number | null>(null);
  audit = $state.raw<AuditEntry[]>([]);
  /** Every recompute of this session: the first is the study as opened. */
  iterations = $state.raw<Iteration[]>([]);
  user = $state('engineer');
  /** The study document as the host gave it (signing and exports send it back). */
  document = $state.raw<unknown>(null);
  readOnly = $state(false);
  openFindings = $state.raw<Finding[]>([]);
  /** When set, the chart shows only this category's nonconformities. */
  category = $state<string | null>(null);

  #past: Snapshot[] = [];
  #future: Snapshot[] = [];
  canUndo = $state(false);
  canRedo = $state(false);

  /** The observations as charted: all nonconformities, or one category's. */
  readonly charted: Observation[] = $derived(
    this.category === null
      ? this.observations
      : this.observations.map((o) => ({ ...o, count: o.categories?.[this.category!] ?? 0 })),
  );

  readonly categories: string[] = $derived(
    distinct(this.observations.flatMap((o) => Object.keys(o.categories ?? {}))),
  );

  readonly analysis: { ok: true; value: AnalysisResult } | { ok: false; findings: Finding[] } = $derived(
    this.observations.length === 0
      ? {
          ok: false as const,
          findings: [{ message: 'The study has no periods yet: import a history on the Data screen.' }],
        }
      : analyzePhaseOne(this.charted, this.exclusions, this.options),
  );

  readonly result: AnalysisResult | null = $derived(this.analysis.ok ? this.analysis.value : null);

  /** Opens a study the host handed over (the demo, an opened file, an import). */
  loadView(view: StudyView, demo = false): void {
    this.load(
      {
        name: view.title,
        unit: view.unitName,
        demo,
        source: view.file ? { file: view.file.fileName } : undefined,
      },
      view.observations,
      view.options,
    );
    this.exclusions = view.exclusions;
    this.document = view.document;
    this.readOnly = view.readOnly;
    this.openFindings = view.findings;
    if (view.exclusions.length > 0)
      this.iterations = [...this.iterations.slice(0, -1), ...this.#currentSnapshot()];
  }

  #currentSnapshot(): Iteration[] {
    const result = this.result;
    return result ? [iterationSnapshot(result)] : [];
  }

  /** Opens a new study (nothing to undo before it). */
  load(meta: StudyMeta, observations: Observation[], options: Partial<AnalysisOptions> = {}): void {
    this.meta = meta;
    this.observations = observations;
    this.exclusions = [];
    this.options = { ...defaultOptions, ...options };
    this.segmentStarts = [];
    this.category = null;
    this.document = null;
    this.readOnly = false;
    this.openFindings = [];
    this.selected = null;
    this.#past = [];
    this.#future = [];
    this.#syncHistoryFlags();
    this.audit = [];
    this.iterations = [];
    this.#record('Open', meta.demo ? `${meta.name} (invented demo data)` : meta.name);
  }

  exclude(index: number, cause: AssignableCause): void {
    const observation = this.observations[index];
    if (!observation) return;
    if (cause.category.trim() === '' || cause.description.trim() === '') {
      throw new Error('An exclusion needs an assignable cause: a category and a description.');
    }
    const clean: AssignableCause = {
      category: cause.category.trim(),
      description: cause.description.trim(),
      ...(cause.reference && cause.reference.trim() !== '' ? { reference: cause.reference.trim() } : {}),
    };
    const existing = this.exclusions.find((e) => e.index === index);
    if (existing && sameCause(existing.cause, clean)) return;
    this.#change(
      { exclusions: [...this.exclusions.filter((e) => e.index !== index), { index, cause: clean }] },
      'Exclude',
      `${observation.label}: ${clean.category}: ${clean.description}${clean.reference ? ` (${clean.reference})` : ''}`,
    );
  }

  reinstate(index: number, reason = ''): void {
    const observation = this.observations[index];
    if (!observation || !this.exclusions.some((e) => e.index === index)) return;
    this.#change(
      { exclusions: this.exclusions.filter((e) => e.index !== index) },
      'Reinstate',
      `${observation.label}${reason ? `: ${reason}` : ''}`,
    );
  }

  setOptions(change: Partial<AnalysisOptions>): void {
    const next = { ...this.options, ...change };
    const described = Object.entries(change)
      .map(([key, value]) => `${key} = ${Array.isArray(value) ? value.join(', ') : String(value)}`)
      .join('; ');
    this.#change({ options: next }, 'Change method', described);
  }

  setSegmentStarts(starts: number[]): void {
    const sorted = distinct(starts)
      .filter((s) => s > 0 && s < this.observations.length)
      .sort((a, b) => a - b);
    this.#change(
      { segmentStarts: sorted },
      'Split history',
      sorted.length ? `segments start at ${sorted.map((s) => s + 1).join(', ')}` : 'one segment',
    );
  }

  undo(): void {
    const previous = this.#past.pop();
    if (!previous) return;
    this.#future.push(this.#snapshot());
    this.#restore(previous);
    this.#record('Undo', 'the last decision is reversed by a compensating entry');
  }

  redo(): void {
    const next = this.#future.pop();
    if (!next) return;
    this.#past.push(this.#snapshot());
    this.#restore(next);
    this.#record('Redo', 'the reversed decision is applied again');
  }

  /** The exclusion of an observation, if it has one. */
  exclusionOf(index: number): Exclusion | undefined {
    return this.exclusions.find((e) => e.index === index);
  }

  #snapshot(): Snapshot {
    return { exclusions: this.exclusions, options: this.options, segmentStarts: this.segmentStarts };
  }

  #restore(snapshot: Snapshot): void {
    this.exclusions = snapshot.exclusions;
    this.options = snapshot.options;
    this.segmentStarts = snapshot.segmentStarts;
    this.#syncHistoryFlags();
  }

  #change(change: Partial<Snapshot>, action: string, detail: string): void {
    this.#past.push(this.#snapshot());
    this.#future = [];
    this.#restore({ ...this.#snapshot(), ...change });
    this.#record(action, detail);
  }

  #syncHistoryFlags(): void {
    this.canUndo = this.#past.length > 0;
    this.canRedo = this.#future.length > 0;
  }

  #record(action: string, detail: string): void {
    this.audit = [...this.audit, { at: nowIso(), who: this.user, action, detail }];
    const result = this.result;
    if (result) this.iterations = [...this.iterations, iterationSnapshot(result)];
  }
}

export const study = new StudyState();
