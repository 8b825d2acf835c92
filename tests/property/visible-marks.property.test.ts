import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import type { PeriodStatus } from '../../shared-core/study/analysis-types.js';
import { visibleMarks } from '../../shared-core/view/visible-marks.js';

// Generated marks (invented positions, not data): many periods to a pixel, as in a long history.
const mark = fc.record({
  status: fc.constantFrom<PeriodStatus>('in', 'in', 'in', 'signal', 'excluded'),
  x: fc.double({ min: 0, max: 40, noNaN: true }),
  y: fc.double({ min: 0, max: 20, noNaN: true }),
});
const marks = fc.array(mark, { minLength: 0, maxLength: 400 });

function run(points: { status: PeriodStatus; x: number; y: number }[], selected: number | null) {
  return visibleMarks(
    points,
    points.map((p) => p.x),
    points.map((p) => p.y),
    selected,
  );
}

const samePixel = (a: { x: number; y: number }, b: { x: number; y: number }) =>
  Math.floor(a.x) === Math.floor(b.x) && Math.floor(a.y) === Math.floor(b.y);

describe('visibleMarks', () => {
  it('always keeps every signal, every exclusion and the selected period', () => {
    fc.assert(
      fc.property(marks, fc.nat(), (points, pick) => {
        const selected = points.length ? pick % points.length : null;
        const kept = new Set(run(points, selected));
        points.forEach((p, i) => {
          if (p.status !== 'in' || i === selected) expect(kept.has(i)).toBe(true);
        });
      }),
    );
  });

  it('drops an in-control mark only for an earlier kept in-control mark in the same pixel', () => {
    // Checked against a direct pairwise scan of the definition.
    fc.assert(
      fc.property(marks, (points) => {
        const kept = run(points, null);
        expect(kept).toEqual([...kept].sort((a, b) => a - b));
        const keptSet = new Set(kept);
        points.forEach((p, i) => {
          if (p.status !== 'in') return;
          const twin = kept.find((k) => k < i && points[k].status === 'in' && samePixel(points[k], p));
          // Kept exactly when no earlier kept in-control mark shares its pixel.
          expect(keptSet.has(i)).toBe(twin === undefined);
        });
      }),
    );
  });

  it('keeps every mark when no two in-control marks share a pixel', () => {
    const points = Array.from({ length: 50 }, (_, i) => ({ status: 'in' as const, x: i * 1.5, y: i % 7 }));
    expect(run(points, null)).toHaveLength(50);
  });

  it('draws one mark for a thousand periods on one pixel, plus the signal among them', () => {
    const points = Array.from({ length: 1000 }, (_, i) => ({
      status: (i === 500 ? 'signal' : 'in') as PeriodStatus,
      x: 10.2 + i * 1e-4,
      y: 5.5,
    }));
    expect(run(points, null)).toEqual([0, 500]);
  });
});
