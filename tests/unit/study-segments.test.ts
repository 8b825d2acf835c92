import { describe, expect, it } from 'vitest';
import { analyzeSegments, segmentOf, segmentPeriods } from '../../shared-core/study/segments.js';
import { analyzePhaseOne } from '../../shared-core/study/phase-one.js';
import { defaultOptions, type Observation } from '../../shared-core/study/analysis-types.js';
import {
  deriveState,
  exclude,
  redo,
  removeSplit,
  splitAt,
  undo,
} from '../../shared-core/study/study-state.js';
import { verifyStudy } from '../../shared-core/study/verify-study.js';
import type { Result } from '../../shared-core/result.js';
import { at, sampleStudy } from '../integration/fixtures/study-sample.js';

const value = <T>(result: Result<T>): T => {
  if (!result.ok) throw new Error(result.findings.map((finding) => finding.message).join('; '));
  return result.value;
};

/** Invented counts: 10 periods near 2 per unit, then 10 near 6 per unit (a known process change). */
const history: Observation[] = [
  ...[2, 3, 1, 2, 4, 2, 3, 1, 2, 2].map((count, i) => ({ label: `A${i + 1}`, row: i + 2, count, units: 1 })),
  ...[6, 5, 7, 6, 8, 5, 6, 7, 4, 6].map((count, i) => ({ label: `B${i + 1}`, row: i + 12, count, units: 1 })),
];

describe('segments: each part of the history with limits of its own', () => {
  it('estimates each segment from its own periods only: ū = Σx/Σk within the segment (common practice)', () => {
    const split = { index: 10, label: 'B1', reason: 'new mould' };
    const segments = value(analyzeSegments(history, [], defaultOptions, [split]));
    expect(segments.map((s) => [s.start, s.end, s.reason])).toEqual([
      [0, 10, null],
      [10, 20, 'new mould'],
    ]);
    // Hand sums of the invented counts above.
    expect(segments[0].result.center).toBeCloseTo(22 / 10, 12);
    expect(segments[1].result.center).toBeCloseTo(60 / 10, 12);
    // c chart, 3-sigma: UCL = c̄ + 3√c̄ (Montgomery, Introduction to Statistical Quality Control, ch. 7).
    expect(segments[1].result.periods[0].ucl).toBeCloseTo(6 + 3 * Math.sqrt(6), 12);
    expect(segments[1].result.periods.map((p) => p.index)).toEqual([...Array(10).keys()].map((i) => i + 10));
    expect(segmentPeriods(segments).map((p) => p.label)).toEqual(history.map((o) => o.label));
    expect(segmentOf(segments, 12).start).toBe(10);
  });

  it('pooled, the same history signals the change; split, it does not', () => {
    const pooled = value(analyzePhaseOne(history, [], { ...defaultOptions, rules: ['beyond', 'run:8'] }));
    expect(pooled.periods.some((p) => p.status === 'signal')).toBe(true);
    const split = value(
      analyzeSegments(history, [], { ...defaultOptions, rules: ['beyond', 'run:8'] }, [
        { index: 10, label: 'B1', reason: 'new mould' },
      ]),
    );
    expect(split.flatMap((s) => s.result.periods).filter((p) => p.status === 'signal')).toEqual([]);
  });

  it('maps exclusions into their segment and keeps the first segment when there is no split', () => {
    const cause = { category: 'Material', description: 'wet lot' };
    const segments = value(
      analyzeSegments(history, [{ index: 14, cause }], defaultOptions, [
        { index: 10, label: 'B1', reason: 'new mould' },
      ]),
    );
    expect(segments[1].result.periods[4]).toMatchObject({ index: 14, status: 'excluded', cause });
    expect(segments[1].result.center).toBeCloseTo((60 - 8) / 9, 12);
    const whole = value(analyzeSegments(history, [], defaultOptions, []));
    expect(whole).toHaveLength(1);
    expect(whole[0].result.center).toBeCloseTo(82 / 20, 12);
  });
});

describe('splits in the study record', () => {
  const who = 'A. Tester';
  it('records a split with its reason, folds it, and undo and redo act on it', () => {
    const study = value(splitAt(sampleStudy(), { who, why: 'new powder supplier', index: 6 }, at(1)));
    expect(deriveState(study).splits).toEqual([
      { index: 6, label: 'L007', reason: 'new powder supplier', seq: 3 },
    ]);
    expect(verifyStudy(study)).toEqual([]);
    const undone = value(undo(study, who, at(2)));
    expect(deriveState(undone).splits).toEqual([]);
    expect(deriveState(value(redo(undone, who, at(3)))).splits).toHaveLength(1);
    const removed = value(removeSplit(study, { who, index: 6 }, at(4)));
    expect(deriveState(removed).splits).toEqual([]);
    expect(verifyStudy(removed)).toEqual([]);
  });

  it('refuses a split without a reason, at the first period, twice, or where none is to remove', () => {
    const study = sampleStudy();
    expect(splitAt(study, { who, why: ' ', index: 4 }, at(1)).ok).toBe(false);
    expect(splitAt(study, { who, why: 'x', index: 0 }, at(1)).ok).toBe(false);
    expect(splitAt(study, { who, why: 'x', index: 99 }, at(1)).ok).toBe(false);
    const once = value(splitAt(study, { who, why: 'x', index: 4 }, at(1)));
    expect(splitAt(once, { who, why: 'y', index: 4 }, at(2)).ok).toBe(false);
    expect(removeSplit(study, { who, index: 4 }, at(2)).ok).toBe(false);
    const excluded = value(
      exclude(once, { who, index: 5, cause: { category: 'c', description: 'd' } }, at(3)),
    );
    expect(deriveState(excluded).splits).toHaveLength(1);
  });
});
