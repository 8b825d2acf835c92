import { appendEvent, sealStudy } from './audit-chain.js';
import { canonicalJson } from './canonical-json.js';
import { isUndoable, type AuditEvent, type EventDraft, type UndoableEvent } from './audit-event.js';
import { methodSchema } from './method-schema.js';
import { fail, ok, type Result } from '../result.js';
import type {
  AnalysisOptions,
  AssignableCause,
  Exclusion,
  Iteration,
  Observation,
} from './analysis-types.js';
import type { Study } from './study-schema.js';
import type { StudyProblem } from './study-problem.js';
import type { Split } from './segments.js';
import { observationsHash } from './new-study.js';

/**
 * The study as its decisions leave it: the audit chain folded, undo and redo applied.
 *
 * Undo and redo are compensating events, never deletions: `undo` names the decision it takes back,
 * `redo` names the undo it takes back. They behave as a stack: undo takes back the latest decision
 * still in force; redo is possible until a new decision is made.
 */

export interface StudyNote {
  seq: number;
  index: number;
  label: string;
  text: string;
  who: string;
  time: string;
}

export interface Correction {
  seq: number;
  index: number;
  label: string;
  field: 'count' | 'units' | 'date';
  original: number | string | null;
  value: number | string;
  reason: string;
  who: string;
  time: string;
}

export interface StudyState {
  /** The observations with corrections applied (the study's `observations` keep the originals). */
  observations: Observation[];
  /** In index order, as analyzePhaseOne takes them. */
  exclusions: Exclusion[];
  corrections: Correction[];
  method: AnalysisOptions;
  notes: StudyNote[];
  /** Where the history starts a new segment with its own limits, by index. */
  splits: Split[];
  /** Seqs of the undoable decisions in force, oldest first: the undo stack. */
  decisionsInForce: number[];
  /** Seq of the decision `undo` would take back, or null. */
  undoable: number | null;
  /** Seq of the undo event `redo` would take back, or null. */
  redoable: number | null;
  /** Decisions the fold could not apply (only in files edited outside the program). */
  problems: StudyProblem[];
}

/** Folds the chain, or its prefix up to and including the event whose hash is `throughHash`. */
export function deriveState(study: Study, throughHash?: string): StudyState {
  const problems: StudyProblem[] = [];
  const events = prefix(study.events, throughHash);
  const known = periodsKnown(events, study.observations.length);
  const bySeq = new Map(events.map((event) => [event.seq, event]));
  const inForce: number[] = [];
  const undone: number[] = [];
  let method: AnalysisOptions = study.method;

  for (const event of events) {
    if (event.type === 'created') method = event.payload.method;
    else if (isUndoable(event)) {
      inForce.push(event.seq);
      undone.length = 0;
    } else if (event.type === 'undo') {
      if (inForce.at(-1) !== event.payload.target) {
        problems.push(
          invalid(
            event,
            `undo names event ${event.payload.target}, which is not the latest decision in force`,
          ),
        );
      } else {
        inForce.pop();
        undone.push(event.seq);
      }
    } else if (event.type === 'redo') {
      const undo = bySeq.get(event.payload.target);
      if (undone.at(-1) !== event.payload.target || undo?.type !== 'undo') {
        problems.push(
          invalid(event, `redo names event ${event.payload.target}, which is not the latest undo`),
        );
      } else {
        undone.pop();
        inForce.push(undo.payload.target);
      }
    }
  }

  // Copied only where a correction applies: the study's own observations stay the originals.
  const observations = study.observations.slice(0, known);
  const excluded = new Map<number, AssignableCause>();
  const splits = new Map<number, Split>();
  const corrections: Correction[] = [];
  const notes: StudyNote[] = [];
  for (const seq of inForce) {
    const event = bySeq.get(seq) as UndoableEvent;
    if (event.type === 'method-changed') {
      method = event.payload.to;
      continue;
    }
    const { index } = event.payload;
    if (index >= observations.length) {
      problems.push(invalid(event, `names period ${index + 1}, but the study has ${observations.length}`));
      continue;
    }
    if (event.type === 'split-added')
      splits.set(index, { index, label: event.payload.label, reason: event.why, seq: event.seq });
    else if (event.type === 'split-removed') splits.delete(index);
    else if (event.type === 'excluded') excluded.set(index, event.payload.cause);
    else if (event.type === 'reinstated') excluded.delete(index);
    else if (event.type === 'note-added')
      notes.push({ ...pick(event), index, label: event.payload.label, text: event.payload.text });
    else {
      const { field, original, value, label } = event.payload;
      observations[index] = { ...observations[index], [field]: value };
      corrections.push({ ...pick(event), index, label, field, original, value, reason: event.why });
    }
  }

  return {
    observations,
    exclusions: [...excluded].sort(([a], [b]) => a - b).map(([index, cause]) => ({ index, cause })),
    corrections,
    method,
    notes,
    splits: [...splits.values()].sort((a, b) => a.index - b.index),
    decisionsInForce: inForce,
    undoable: inForce.at(-1) ?? null,
    redoable: undone.at(-1) ?? null,
    problems,
  };
}

/** How many periods the chain had seen by its last event: the import, then any periods added. */
function periodsKnown(events: AuditEvent[], stored: number): number {
  let known: number | null = null;
  for (const event of events) {
    if (event.type === 'imported') known = event.payload.observationCount;
    else if (event.type === 'periods-added')
      known = event.payload.firstIndex + event.payload.observationCount;
  }
  return Math.min(known ?? stored, stored);
}

function prefix(events: AuditEvent[], throughHash: string | undefined): AuditEvent[] {
  if (throughHash === undefined) return events;
  const end = events.findIndex((event) => event.hash === throughHash);
  return end < 0 ? [] : events.slice(0, end + 1);
}

const pick = (event: AuditEvent) => ({ seq: event.seq, who: event.who, time: event.time });

function invalid(event: AuditEvent, what: string): StudyProblem {
  return {
    level: 'error',
    code: 'invalid-decision',
    seq: event.seq,
    message: `event ${event.seq} (${event.type}) ${what}`,
  };
}

/** Appends a decision and keeps `method` in step with the fold. */
function record(study: Study, draft: EventDraft, now: string): Study {
  const next = appendEvent(study, draft, now);
  const method = deriveState(next).method;
  return canonicalJson(method) === canonicalJson(next.method) ? next : sealStudy({ ...next, method });
}

function period(study: Study, index: number): Result<Observation> {
  const observation = study.observations[index];
  return Number.isInteger(index) && observation
    ? ok(observation)
    : fail({ message: `there is no period ${index + 1}: the study has ${study.observations.length}` });
}

interface Actor {
  who: string;
  why?: string;
}

/** Leaves period `index` out of the estimate for an assignable cause. */
export function exclude(
  study: Study,
  input: Actor & { index: number; cause: AssignableCause },
  now: string,
): Result<Study> {
  const found = period(study, input.index);
  if (!found.ok) return found;
  const { category, description, reference } = input.cause;
  if (!category.trim())
    return fail({ column: 'category', message: 'an exclusion needs the category of its assignable cause' });
  if (!description.trim())
    return fail({
      column: 'description',
      message: 'an exclusion needs a description of its assignable cause',
    });
  if (deriveState(study).exclusions.some((exclusion) => exclusion.index === input.index)) {
    return fail({ message: `period ${found.value.label} is already excluded` });
  }
  const cause = {
    category: category.trim(),
    description: description.trim(),
    ...(reference?.trim() ? { reference: reference.trim() } : {}),
  };
  return ok(
    record(
      study,
      {
        type: 'excluded',
        who: input.who,
        why: input.why,
        payload: { index: input.index, label: found.value.label, cause },
      },
      now,
    ),
  );
}

/** Brings an excluded period back into the estimate. */
export function reinstate(study: Study, input: Actor & { index: number }, now: string): Result<Study> {
  const found = period(study, input.index);
  if (!found.ok) return found;
  if (!deriveState(study).exclusions.some((exclusion) => exclusion.index === input.index)) {
    return fail({ message: `period ${found.value.label} is not excluded` });
  }
  return ok(
    record(
      study,
      {
        type: 'reinstated',
        who: input.who,
        why: input.why,
        payload: { index: input.index, label: found.value.label },
      },
      now,
    ),
  );
}

/** Puts a mistyped value right; the imported value stays on record and the reason is required. */
export function correct(
  study: Study,
  input: { who: string; index: number; field: Correction['field']; value: number | string; reason: string },
  now: string,
): Result<Study> {
  const found = period(study, input.index);
  if (!found.ok) return found;
  const { field, value } = input;
  const where = { row: found.value.row, column: field, value: String(value) };
  if (!input.reason.trim()) return fail({ ...where, message: 'a correction needs a reason' });
  if (field === 'count' && !(typeof value === 'number' && Number.isInteger(value) && value >= 0)) {
    return fail({ ...where, message: 'is not a whole, non-negative number of nonconformities' });
  }
  if (field === 'units' && !(typeof value === 'number' && Number.isFinite(value) && value > 0)) {
    return fail({ ...where, message: 'is not a positive number of inspection units' });
  }
  if (field === 'date' && !(typeof value === 'string' && value.trim() !== ''))
    return fail({ ...where, message: 'is not a date' });
  const current = deriveState(study).observations[input.index][field] ?? null;
  if (current === value) return fail({ ...where, message: 'is already the value on record' });
  return ok(
    record(
      study,
      {
        type: 'corrected',
        who: input.who,
        why: input.reason.trim(),
        payload: { index: input.index, label: found.value.label, field, original: current, value },
      },
      now,
    ),
  );
}

/** Changes the limits method, multiplier, α, rules or known rate. */
export function changeMethod(
  study: Study,
  input: Actor & { method: AnalysisOptions },
  now: string,
): Result<Study> {
  const parsed = methodSchema.safeParse(input.method);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    return fail({ column: issue.path.join('.'), message: issue.message });
  }
  const from = deriveState(study).method;
  if (canonicalJson(from) === canonicalJson(parsed.data)) return fail({ message: 'the method is unchanged' });
  return ok(
    record(
      study,
      { type: 'method-changed', who: input.who, why: input.why, payload: { from, to: parsed.data } },
      now,
    ),
  );
}

/** Attaches a note to a period, e.g. "new supplier lot from here". */
export function addNote(
  study: Study,
  input: { who: string; index: number; text: string },
  now: string,
): Result<Study> {
  const found = period(study, input.index);
  if (!found.ok) return found;
  if (!input.text.trim()) return fail({ message: 'a note needs some text' });
  return ok(
    record(
      study,
      {
        type: 'note-added',
        who: input.who,
        payload: { index: input.index, label: found.value.label, text: input.text.trim() },
      },
      now,
    ),
  );
}

/** Records a recomputation's outcome (from the engine's iteration history) as a snapshot. */
export function recordIteration(
  study: Study,
  input: { who: string; iteration: Iteration },
  now: string,
): Study {
  const number = study.events.filter((event) => event.type === 'iteration').length + 1;
  const { excluded, center, lcl, ucl, signals } = input.iteration;
  return appendEvent(
    study,
    { type: 'iteration', who: input.who, payload: { number, excluded, center, lcl, ucl, signals } },
    now,
  );
}

/**
 * Starts a new segment at period `index`: a known process change after which the history gets limits
 * of its own. The reason is required; the first period cannot start a segment (it already does).
 */
export function splitAt(
  study: Study,
  input: { who: string; why: string; index: number },
  now: string,
): Result<Study> {
  const found = period(study, input.index);
  if (!found.ok) return found;
  if (input.index === 0)
    return fail({ message: 'the first period already starts the history; choose a later period' });
  if (!input.why.trim())
    return fail({ column: 'reason', message: 'a new segment needs the reason the process changed' });
  if (deriveState(study).splits.some((split) => split.index === input.index))
    return fail({ message: `a segment already starts at period ${found.value.label}` });
  return ok(
    record(
      study,
      {
        type: 'split-added',
        who: input.who,
        why: input.why.trim(),
        payload: { index: input.index, label: found.value.label },
      },
      now,
    ),
  );
}

/** Joins the segment starting at period `index` to the one before it. */
export function removeSplit(study: Study, input: Actor & { index: number }, now: string): Result<Study> {
  const found = period(study, input.index);
  if (!found.ok) return found;
  if (!deriveState(study).splits.some((split) => split.index === input.index))
    return fail({ message: `no segment starts at period ${found.value.label}` });
  return ok(
    record(
      study,
      {
        type: 'split-removed',
        who: input.who,
        why: input.why,
        payload: { index: input.index, label: found.value.label },
      },
      now,
    ),
  );
}

/**
 * Appends new periods after the history (e.g. production since the limits were approved). The
 * event binds their source file's hash and the appended observations, so a revision anchored
 * before it keeps exactly the periods it was computed on.
 */
export function addPeriods(
  study: Study,
  input: { who: string; file: string; sourceSha256: string; observations: Observation[] },
  now: string,
): Result<Study> {
  if (input.observations.length === 0) return fail({ message: 'there are no new periods to add' });
  const known = new Set(study.observations.map((o) => o.label));
  const repeated = input.observations.find((o) => o.label && !o.label.startsWith('#') && known.has(o.label));
  if (repeated)
    return fail({
      row: repeated.row,
      column: 'label',
      value: repeated.label,
      message: `period ${repeated.label} is already in the study: add only periods after the history`,
    });
  const firstIndex = study.observations.length;
  const observations = [...study.observations, ...input.observations];
  const appended = appendEvent(
    { ...study, observations },
    {
      type: 'periods-added',
      who: input.who,
      payload: {
        file: input.file,
        sourceSha256: input.sourceSha256,
        firstIndex,
        observationCount: input.observations.length,
        observationsSha256: observationsHash(input.observations),
      },
    },
    now,
  );
  return ok(appended);
}

/** The decisions undo would take back, latest first (what an undo menu lists). */
export function undoableEvents(study: Study): UndoableEvent[] {
  const bySeq = new Map(study.events.map((event) => [event.seq, event]));
  return deriveState(study)
    .decisionsInForce.toReversed()
    .map((seq) => bySeq.get(seq) as UndoableEvent);
}

/** Takes back the latest decision still in force, as a compensating event. */
export function undo(study: Study, who: string, now: string): Result<Study> {
  const target = deriveState(study).undoable;
  if (target === null) return fail({ message: 'there is nothing to undo' });
  return ok(record(study, { type: 'undo', who, payload: { target } }, now));
}

/** Takes back the latest undo, as a compensating event. */
export function redo(study: Study, who: string, now: string): Result<Study> {
  const target = deriveState(study).redoable;
  if (target === null) return fail({ message: 'there is nothing to redo' });
  return ok(record(study, { type: 'redo', who, payload: { target } }, now));
}
