// @vitest-environment jsdom
import { describe, expect, it } from 'vitest';
import { StudyState } from '../../src-renderer/state/study.svelte.js';
import type { Observation } from '../../shared-core/study/analysis-types.js';

// Invented periods (not a published example): period 4 is planted high.
const observations: Observation[] = [10, 12, 9, 40, 11, 8, 10, 13, 9, 11].map((count, i) => ({
  label: `L${i + 1}`,
  row: i + 2,
  count,
  units: 5,
}));

const cause = { category: 'Material', description: 'wrong resin lot' };

describe('StudyState observations', () => {
  it('keeps the same observations through decisions that change none of them', () => {
    const state = new StudyState();
    state.load({ name: 'Test', unit: 'reel', demo: false }, observations);
    const opened = state.observations;
    expect(state.exclude(3, cause)).toBe(true);
    expect(state.addNote(5, 'new reel stock')).toBe(true);
    expect(state.split(6, 'new die')).toBe(true);
    expect(state.observations).toBe(opened);
    expect(state.chartPeriods[3].status).toBe('excluded');
  });

  it('hands out new observations when a correction changes one, and the originals after its undo', () => {
    const state = new StudyState();
    state.load({ name: 'Test', unit: 'reel', demo: false }, observations);
    const opened = state.observations;
    expect(state.correct(3, 'count', 14, 'typed 40 for 14')).toBe(true);
    const corrected = state.observations;
    expect(corrected).not.toBe(opened);
    expect(corrected.map((o) => o.count)).toEqual([10, 12, 9, 14, 11, 8, 10, 13, 9, 11]);
    expect(state.undo()).toBe(true);
    expect(state.observations).not.toBe(corrected);
    expect(state.observations.map((o) => o.count)).toEqual(observations.map((o) => o.count));
  });
});
