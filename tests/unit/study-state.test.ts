import { describe, expect, it } from 'vitest';
import {
  addNote,
  changeMethod,
  correct,
  deriveState,
  exclude,
  recordIteration,
  redo,
  reinstate,
  undo,
  undoableEvents,
} from '../../shared-core/study/study-state.js';
import { verifyStudy } from '../../shared-core/study/verify-study.js';
import type { Result } from '../../shared-core/result.js';
import type { Study } from '../../shared-core/study/study-schema.js';
import { at, sampleStudy } from '../integration/fixtures/study-sample.js';

const value = <T>(result: Result<T>): T => {
  if (!result.ok) throw new Error(result.findings.map((finding) => finding.message).join('; '));
  return result.value;
};

const cause = { category: 'Material', description: 'wet powder lot', reference: 'CA-17' };
const who = 'A. Tester';

describe('the study state folded from its chain', () => {
  it('records an exclusion with its cause and takes it out of the analysis', () => {
    const study = value(exclude(sampleStudy(), { who, index: 3, cause }, at(1)));
    expect(deriveState(study).exclusions).toEqual([{ index: 3, cause }]);
    expect(study.events.at(-1)).toMatchObject({
      type: 'excluded',
      who,
      payload: { index: 3, label: 'L004', cause },
    });
    expect(verifyStudy(study)).toEqual([]);
  });

  it('refuses an exclusion without a cause, a second exclusion, and a period that is not there', () => {
    const study = sampleStudy();
    expect(exclude(study, { who, index: 1, cause: { category: ' ', description: 'x' } }, at(1)).ok).toBe(
      false,
    );
    expect(exclude(study, { who, index: 1, cause: { category: 'x', description: '' } }, at(1)).ok).toBe(
      false,
    );
    expect(exclude(study, { who, index: 99, cause }, at(1)).ok).toBe(false);
    const once = value(exclude(study, { who, index: 1, cause }, at(1)));
    expect(exclude(once, { who, index: 1, cause }, at(2)).ok).toBe(false);
    expect(reinstate(study, { who, index: 1 }, at(2)).ok).toBe(false);
  });

  it('keeps the imported value when a mistyped one is corrected, and needs a reason', () => {
    const study = sampleStudy();
    expect(correct(study, { who, index: 2, field: 'count', value: 4, reason: '' }, at(1)).ok).toBe(false);
    expect(correct(study, { who, index: 2, field: 'count', value: 2.5, reason: 'typo' }, at(1)).ok).toBe(
      false,
    );
    expect(correct(study, { who, index: 2, field: 'units', value: 0, reason: 'typo' }, at(1)).ok).toBe(false);
    const corrected = value(
      correct(
        study,
        { who, index: 2, field: 'count', value: 4, reason: 'typed 3 for 4 (traveller 118)' },
        at(1),
      ),
    );
    const state = deriveState(corrected);
    expect(corrected.observations[2].count).toBe(study.observations[2].count);
    expect(state.observations[2].count).toBe(4);
    expect(state.corrections).toEqual([
      expect.objectContaining({
        index: 2,
        field: 'count',
        original: study.observations[2].count,
        value: 4,
        reason: 'typed 3 for 4 (traveller 118)',
      }),
    ]);
  });

  it('undoes and redoes as compensating events, in stack order, with nothing deleted', () => {
    let study = sampleStudy();
    study = value(exclude(study, { who, index: 1, cause }, at(1)));
    study = value(addNote(study, { who, index: 5, text: 'new supplier lot from here' }, at(2)));
    study = value(exclude(study, { who, index: 7, cause }, at(3)));
    expect(undoableEvents(study).map((event) => event.seq)).toEqual([5, 4, 3]);

    study = value(undo(study, who, at(4)));
    expect(study.events.at(-1)).toMatchObject({ type: 'undo', payload: { target: 5 } });
    expect(deriveState(study).exclusions.map((exclusion) => exclusion.index)).toEqual([1]);
    study = value(undo(study, who, at(5)));
    expect(deriveState(study).notes).toEqual([]);
    study = value(redo(study, who, at(6)));
    expect(study.events.at(-1)).toMatchObject({ type: 'redo', payload: { target: 7 } });
    expect(deriveState(study).notes.map((note) => note.text)).toEqual(['new supplier lot from here']);
    expect(deriveState(study).redoable).toBe(6);

    // A new decision ends the redo stack, as in any editor.
    study = value(reinstate(study, { who, index: 1 }, at(7)));
    expect(deriveState(study).redoable).toBeNull();
    expect(redo(study, who, at(8)).ok).toBe(false);
    expect(deriveState(study).exclusions).toEqual([]);

    study = value(undo(study, who, at(8)));
    study = value(undo(study, who, at(9)));
    study = value(undo(study, who, at(10)));
    expect(deriveState(study).exclusions).toEqual([]);
    expect(deriveState(study).notes).toEqual([]);
    expect(undo(study, who, at(11)).ok).toBe(false);
    expect(study.events).toHaveLength(12);
    expect(verifyStudy(study)).toEqual([]);
  });

  it('keeps the document method in step with method changes and their undo', () => {
    const first = sampleStudy();
    const changed = value(
      changeMethod(
        first,
        { who, why: 'counts look over-dispersed', method: { ...first.method, limits: 'laney' } },
        at(1),
      ),
    );
    expect(changed.method.limits).toBe('laney');
    expect(changeMethod(changed, { who, method: { ...changed.method } }, at(2)).ok).toBe(false);
    expect(changeMethod(changed, { who, method: { ...changed.method, alpha: 2 } }, at(2)).ok).toBe(false);
    const undone = value(undo(changed, who, at(2)));
    expect(undone.method.limits).toBe('sigma');
    expect(verifyStudy(undone)).toEqual([]);
    expect(value(redo(undone, who, at(3))).method.limits).toBe('laney');
  });

  it('records iteration snapshots, numbered, without making them undoable', () => {
    let study: Study = sampleStudy();
    study = recordIteration(
      study,
      { who, iteration: { excluded: [], center: 0.2, lcl: null, ucl: 0.5, signals: ['L004'] } },
      at(1),
    );
    study = recordIteration(
      study,
      { who, iteration: { excluded: ['L004'], center: 0.18, lcl: null, ucl: 0.45, signals: [] } },
      at(2),
    );
    expect(
      study.events.filter((event) => event.type === 'iteration').map((event) => event.payload),
    ).toMatchObject([{ number: 1 }, { number: 2 }]);
    expect(undoableEvents(study)).toEqual([]);
  });
});
