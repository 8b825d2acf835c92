// @vitest-environment jsdom
import { describe, expect, it } from 'vitest';
import { StudyState } from '../../src-renderer/state/study.svelte.js';
import { analyzePhaseOne } from '../../shared-core/study/phase-one.js';
import { defaultOptions, type Observation } from '../../shared-core/study/analysis-types.js';
import { verifyChain } from '../../shared-core/study/audit-chain.js';

// Invented periods (not a published example): period 4 is planted high.
const observations: Observation[] = [10, 12, 9, 40, 11, 8, 10, 13, 9, 11].map((count, i) => ({
  label: `L${i + 1}`,
  row: i + 2,
  count,
  units: 5,
}));

function opened(): StudyState {
  const state = new StudyState();
  state.load({ name: 'Test', unit: 'reel', demo: false }, observations);
  return state;
}

const cause = { category: 'Material', description: 'wrong resin lot', reference: 'CA-7' };

describe('StudyState', () => {
  it('recomputes with the core whenever a decision changes', () => {
    const state = opened();
    expect(state.result?.periods[3].status).toBe('signal');
    state.exclude(3, cause);
    const direct = analyzePhaseOne(observations, [{ index: 3, cause }], defaultOptions);
    expect(direct.ok && state.result?.center).toBe(direct.ok ? direct.value.center : NaN);
    expect(state.result?.periods[3].status).toBe('excluded');
    expect(state.result?.periods[3].cause).toEqual(cause);
  });

  it('refuses an exclusion without a category and description, and says why', () => {
    const state = opened();
    expect(state.exclude(3, { category: 'Material', description: '  ' })).toBe(false);
    expect(state.lastProblem).toMatch(/description of its assignable cause/);
    expect(state.exclusions).toEqual([]);
  });

  it('undoes and redoes exclusions, reinstatements and method changes, recording each as an entry', () => {
    const state = opened();
    const first = state.result!.center;
    state.exclude(3, cause);
    const second = state.result!.center;
    state.setOptions({ limits: 'probability' });
    expect(state.result?.limits).toBe('probability');
    state.undo();
    expect(state.result?.limits).toBe('sigma');
    expect(state.result?.center).toBe(second);
    state.undo();
    expect(state.result?.center).toBe(first);
    expect(state.canUndo).toBe(false);
    state.redo();
    expect(state.result?.center).toBe(second);
    expect(state.canRedo).toBe(true);
    state.reinstate(3);
    expect(state.canRedo).toBe(false);
    // Undo never erases: the audit chain only grows, with compensating events.
    expect(state.audit.map((e) => e.type)).toEqual([
      'created',
      'imported',
      'excluded',
      'method-changed',
      'undo',
      'undo',
      'redo',
      'reinstated',
    ]);
    expect(verifyChain(state.document!)).toEqual([]);
    expect(state.iterations).toHaveLength(7);
  });

  it('keeps a corrected value beside the original and recomputes with it', () => {
    const state = opened();
    expect(state.correct(3, 'count', 14, 'typed 40 for 14 on the tally sheet')).toBe(true);
    expect(state.observations[3].count).toBe(14);
    expect(state.document!.observations[3].count).toBe(40);
    expect(state.state?.corrections[0]).toMatchObject({ original: 40, value: 14 });
    expect(state.result?.periods[3].status).toBe('in');
  });

  it('records notes on periods in the audit chain, and undoes them like any decision', () => {
    const state = opened();
    expect(state.addNote(5, 'new supplier lot from here')).toBe(true);
    expect(state.notes).toMatchObject([{ index: 5, label: 'L6', text: 'new supplier lot from here' }]);
    expect(state.addNote(5, '   ')).toBe(false);
    state.undo();
    expect(state.notes).toEqual([]);
  });

  it('charts one category at a time when categories exist', () => {
    const state = new StudyState();
    state.load(
      { name: 'Test', unit: 'reel', demo: false },
      observations.map((o) => ({ ...o, categories: { scratch: o.count - 2, dent: 2 } })),
    );
    expect(state.categories).toEqual(['scratch', 'dent']);
    state.category = 'dent';
    expect(state.result?.totals.count).toBe(2 * observations.length);
  });
});
