import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { kthSmallest } from '../../shared-core/stats/order-statistic.js';

// The reference is an independent computation: the k-th entry of the sorted values (the engine's
// own numeric sort of a Float64Array, ECMA-262 §23.2.3.29).
describe('kthSmallest', () => {
  it('is the k-th entry of the sorted values (2,000 generated arrays, ties and orders included)', () => {
    const values = fc.oneof(
      fc.array(fc.double({ noNaN: true }), { minLength: 1, maxLength: 300 }),
      fc.array(fc.integer({ min: -3, max: 3 }), { minLength: 1, maxLength: 300 }),
      fc.array(fc.integer(), { minLength: 1, maxLength: 300 }).map((a) => [...a].sort((x, y) => x - y)),
      fc.array(fc.integer(), { minLength: 1, maxLength: 300 }).map((a) => [...a].sort((x, y) => y - x)),
    );
    fc.assert(
      fc.property(values, fc.nat(), (list, pick) => {
        const k = pick % list.length;
        const sorted = Float64Array.from(list).sort();
        const input = Float64Array.from(list);
        expect(Object.is(kthSmallest(input, k), sorted[k]) || kthSmallest(input, k) === sorted[k]).toBe(true);
        // In place, but a rearrangement: the same values.
        expect(input.sort()).toEqual(sorted);
      }),
      { numRuns: 2000 },
    );
  });

  it('takes the median of a long array of few distinct values', () => {
    const values = Float64Array.from({ length: 100_001 }, (_, i) => (i * 7919) % 13);
    const sorted = Float64Array.from(values).sort();
    expect(kthSmallest(values, 50_000)).toBe(sorted[50_000]);
  });

  it('refuses an index outside the values', () => {
    expect(() => kthSmallest(new Float64Array(3), 3)).toThrow(RangeError);
    expect(() => kthSmallest(new Float64Array(0), 0)).toThrow(RangeError);
    expect(() => kthSmallest(new Float64Array(3), 1.5)).toThrow(RangeError);
  });
});
