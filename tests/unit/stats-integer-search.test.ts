import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { smallestIntegerWhere } from '../../shared-core/stats/integer-search.js';

describe('smallestIntegerWhere', () => {
  it('finds the threshold from any guess, in about 2·log₂(distance) + 3 evaluations', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 0, max: 1e12 }),
        fc.integer({ min: 0, max: 1e12 }),
        (threshold, guess) => {
          let evaluations = 0;
          const found = smallestIntegerWhere((k) => {
            evaluations++;
            return k >= threshold;
          }, guess);
          expect(found).toBe(threshold);
          const distance = Math.abs(threshold - guess) + 1;
          expect(evaluations).toBeLessThanOrEqual(2 * Math.ceil(Math.log2(distance)) + 3);
        },
      ),
      { numRuns: 500, seed: 20261201 },
    );
  });
  it('respects the floor, and returns the floor when the predicate holds everywhere', () => {
    expect(smallestIntegerWhere(() => true, 50)).toBe(0);
    expect(smallestIntegerWhere(() => true, 50, 7)).toBe(7);
    expect(smallestIntegerWhere((k) => k >= 3, -20)).toBe(3);
  });
  it('returns +∞ when the predicate never holds below 2⁵³', () => {
    expect(smallestIntegerWhere(() => false, 10)).toBe(Number.POSITIVE_INFINITY);
  });
});
