// @vitest-environment jsdom
import { describe, expect, it } from 'vitest';
import { StudyState } from '../../src-renderer/state/study.svelte.js';
import type { Observation } from '../../shared-core/study/analysis-types.js';
import { verifyChain } from '../../shared-core/study/audit-chain.js';

// Invented periods (not a published example): a process that runs near 3 per unit for eight
// periods, then near 0.4 per unit after a known change at period 9. Units vary, so it is a u chart.
const counts = [33, 27, 37, 29, 32, 36, 26, 30, 4, 3, 5, 3, 5, 4, 3, 4];
const units = [10, 9, 12, 10, 11, 12, 9, 10, 10, 9, 11, 8, 12, 10, 9, 11];
const observations: Observation[] = counts.map((count, i) => ({
  label: `P${i + 1}`,
  row: i + 2,
  count,
  units: units[i],
}));

function opened(): StudyState {
  const state = new StudyState();
  state.load({ name: 'Segments', unit: 'panel', demo: false }, observations);
  return state;
}

/** ū = Σc / Σk over the included periods (Montgomery, Introduction to SQC, ch. 7, the u chart). */
function pooledRate(from: number, to: number, skip: number[] = []): number {
  let c = 0;
  let k = 0;
  for (let i = from; i < to; i++) {
    if (skip.includes(i)) continue;
    c += counts[i];
    k += units[i];
  }
  return c / k;
}

const cause = { category: 'Equipment', description: 'gauge out of calibration' };

describe('StudyState with segments', () => {
  it('analyzes each segment on its own: own ū and own limits ū ± 3√(ū/kᵢ)', () => {
    const state = opened();
    expect(state.split(8, 'second curing oven in use')).toBe(true);
    expect(state.segments.map((s) => [s.start, s.end])).toEqual([
      [0, 8],
      [8, 16],
    ]);
    const [first, second] = state.segments;
    expect(first.result.center).toBeCloseTo(pooledRate(0, 8), 12);
    expect(second.result.center).toBeCloseTo(pooledRate(8, 16), 12);
    // Limits on the rate scale, Montgomery ch. 7: ū ± 3√(ū/kᵢ), no LCL where it would be ≤ 0.
    const u1 = pooledRate(0, 8);
    const early = state.chartPeriods[2];
    expect(early.ucl).toBeCloseTo(u1 + 3 * Math.sqrt(u1 / units[2]), 10);
    expect(early.lcl).toBeCloseTo(u1 - 3 * Math.sqrt(u1 / units[2]), 10);
    const u2 = pooledRate(8, 16);
    const late = state.chartPeriods[11];
    expect(late.ucl).toBeCloseTo(u2 + 3 * Math.sqrt(u2 / units[11]), 10);
    expect(u2 - 3 * Math.sqrt(u2 / units[11])).toBeLessThan(0);
    expect(late.lcl).toBeNull();
    expect(second.reason).toBe('second curing oven in use');
  });

  it('keeps every period on the chart, and makes the last segment the current result', () => {
    const state = opened();
    const pooled = state.result!.center;
    expect(pooled).toBeCloseTo(pooledRate(0, 16), 12);
    state.split(8, 'second curing oven in use');
    expect(state.chartPeriods.map((p) => p.index)).toEqual(counts.map((_, i) => i));
    expect(state.result?.periods.map((p) => p.index)).toEqual([8, 9, 10, 11, 12, 13, 14, 15]);
    expect(state.result?.center).toBeCloseTo(pooledRate(8, 16), 12);
    expect(state.result?.m).toBe(8);
    expect(state.currentRange).toBe('P9–P16');
    expect(state.periodAt(3)?.center).toBeCloseTo(pooledRate(0, 8), 12);
    expect(state.segmentOf(3)?.start).toBe(0);
    expect(state.splitOf(8)?.reason).toBe('second curing oven in use');
    // Pooled across the change, the early periods signal high; split, they do not.
    expect(
      opened()
        .chartPeriods.slice(0, 8)
        .some((p) => p.status === 'signal'),
    ).toBe(true);
    expect(state.chartPeriods.some((p) => p.status === 'signal')).toBe(false);
  });

  it('applies an exclusion within its own segment only', () => {
    const state = opened();
    state.split(8, 'second curing oven in use');
    const firstCenter = state.segments[0].result.center;
    state.exclude(10, cause);
    expect(state.segments[0].result.center).toBe(firstCenter);
    expect(state.result?.center).toBeCloseTo(pooledRate(8, 16, [10]), 12);
    expect(state.result?.m).toBe(7);
    expect(state.periodAt(10)?.status).toBe('excluded');
  });

  it('refuses a split without a reason or at the first period, and says why', () => {
    const state = opened();
    expect(state.split(8, '   ')).toBe(false);
    expect(state.lastProblem).toMatch(/reason the process changed/);
    expect(state.split(0, 'new die')).toBe(false);
    expect(state.lastProblem).toMatch(/first period/);
    expect(state.segments).toHaveLength(1);
    expect(state.split(8, 'new die')).toBe(true);
    expect(state.split(8, 'again')).toBe(false);
    expect(state.lastProblem).toMatch(/already starts/);
  });

  it('undoes and redoes a split and its removal, recording each in the audit chain', () => {
    const state = opened();
    state.split(8, 'second curing oven in use');
    expect(state.undo()).toBe(true);
    expect(state.segments).toHaveLength(1);
    expect(state.result?.center).toBeCloseTo(pooledRate(0, 16), 12);
    expect(state.redo()).toBe(true);
    expect(state.segments).toHaveLength(2);
    expect(state.removeSplit(8)).toBe(true);
    expect(state.splits).toEqual([]);
    expect(state.result?.periods).toHaveLength(16);
    expect(state.undo()).toBe(true);
    expect(state.splits.map((s) => s.index)).toEqual([8]);
    expect(state.removeSplit(5)).toBe(false);
    expect(state.lastProblem).toMatch(/no segment starts/);
    const types = state.audit.map((e) => e.type);
    expect(types).toEqual(['created', 'imported', 'split-added', 'undo', 'redo', 'split-removed', 'undo']);
    expect(verifyChain(state.document!)).toEqual([]);
  });

  it('lists only the current segment in the recompute strip', () => {
    const state = opened();
    state.exclude(2, cause);
    expect(state.currentIterations.map((s) => s.step)).toEqual([0, 1]);
    state.split(8, 'second curing oven in use');
    state.exclude(12, cause);
    expect(state.currentIterations.map((s) => s.step)).toEqual([2, 3]);
    expect(state.currentIterations[1].iteration.center).toBeCloseTo(pooledRate(8, 16, [12]), 12);
    expect(state.currentIterations[1].iteration.excluded).toEqual(['P13']);
    state.undo();
    state.undo();
    // Back to one segment: the whole history's recomputes again, including the latest.
    expect(state.currentIterations.map((s) => s.step)).toEqual([0, 1, 5]);
  });
});
