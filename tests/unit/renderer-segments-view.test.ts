// @vitest-environment jsdom
import { describe, expect, it } from 'vitest';
import { StudyState, study } from '../../src-renderer/state/study.svelte.js';
import { review } from '../../src-renderer/state/review.svelte.js';
import { handleGlobalKey } from '../../src-renderer/state/keyboard.js';
import { shortcuts } from '../../src-renderer/state/navigation.svelte.js';
import { segmentSeries, splitPositions } from '../../shared-core/view/segment-series.js';
import { segmentSummaries } from '../../shared-core/view/segment-summary.js';
import type { Observation } from '../../shared-core/study/analysis-types.js';

// Invented periods (not a published example), equal k = 4: a c chart, a level change at period 6.
const counts = [12, 10, 14, 11, 13, 3, 4, 2, 5, 3];
const observations: Observation[] = counts.map((count, i) => ({
  label: `D${i + 1}`,
  row: i + 2,
  count,
  units: 4,
}));

function split(): StudyState {
  const state = new StudyState();
  state.load({ name: 'View', unit: 'panel', demo: false }, observations);
  state.split(5, 'new die installed');
  return state;
}

describe('segmentSeries', () => {
  it('places each segment at its own positions and breaks the lines at the split', () => {
    const state = split();
    const series = segmentSeries(state.segments);
    expect(series.scale).toBe('count');
    expect(series.points.map((p) => p.x)).toEqual(counts.map((_, i) => i + 1));
    expect(series.points.map((p) => p.position)).toEqual(counts.map((_, i) => i));
    expect(series.points.map((p) => p.y)).toEqual(counts);
    // c̄ of each segment, the mean count (Montgomery, Introduction to SQC, ch. 7, the c chart).
    const c1 = (12 + 10 + 14 + 11 + 13) / 5;
    const c2 = (3 + 4 + 2 + 5 + 3) / 5;
    expect(series.center).toEqual([
      { x: 0.5, y: c1 },
      { x: 5.5, y: c1 },
      { x: 5.5, y: null },
      { x: 5.5, y: c2 },
      { x: 10.5, y: c2 },
    ]);
    expect(series.upper[1].y).toBeCloseTo(c1 + 3 * Math.sqrt(c1), 12);
    expect(series.upper[3].y).toBeCloseTo(c2 + 3 * Math.sqrt(c2), 12);
    expect(splitPositions(state.segments)).toEqual([5]);
  });

  it('standardizes each segment with its own center (z = (c − c̄)/√c̄)', () => {
    const state = split();
    const series = segmentSeries(state.segments, { standardized: true });
    const c2 = 17 / 5;
    expect(series.points[7].y).toBeCloseTo((2 - c2) / Math.sqrt(c2), 12);
  });
});

describe('segmentSummaries', () => {
  it('gives each segment its range, m, center, limits at k̄ and reason', () => {
    const [first, second] = segmentSummaries(split().segments);
    expect(first).toMatchObject({ first: 'D1', last: 'D5', m: 5, center: 12, reason: null, signals: 0 });
    expect(first.ucl).toBeCloseTo(12 + 3 * Math.sqrt(12), 12);
    expect(first.lcl).toBeCloseTo(12 - 3 * Math.sqrt(12), 12);
    expect(second).toMatchObject({ first: 'D6', last: 'D10', m: 5, reason: 'new die installed', lcl: null });
  });
});

describe('the N shortcut', () => {
  it('opens the new-segment form for the selected period and is listed among the keys', () => {
    study.load({ name: 'Keys', unit: 'panel', demo: false }, observations);
    study.selected = 0;
    handleGlobalKey(new KeyboardEvent('keydown', { key: 'n' }));
    expect(review.splitFormOpen).toBe(false); // the first period already starts the history
    study.selected = 5;
    handleGlobalKey(new KeyboardEvent('keydown', { key: 'n' }));
    expect(review.splitFormOpen).toBe(true);
    handleGlobalKey(new KeyboardEvent('keydown', { key: 'Escape' }));
    expect(review.splitFormOpen).toBe(false);
    expect(review.split(5, 'new die installed')).toBe(true);
    expect(study.segments).toHaveLength(2);
    expect(review.announcement).toMatch(/new segment starts at D6/);
    expect(shortcuts.some((s) => s.keys === 'N' && /new segment/.test(s.does))).toBe(true);
  });
});
