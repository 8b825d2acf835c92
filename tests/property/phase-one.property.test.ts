import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { analyzePhaseOne } from '../../shared-core/study/phase-one.js';
import {
  defaultOptions,
  type LimitsMethod,
  type Observation,
} from '../../shared-core/study/analysis-types.js';
import { probabilityLimits } from '../../shared-core/charts/probability-limits.js';
import { sigmaLimits } from '../../shared-core/charts/sigma-limits.js';

const period = fc.record({
  count: fc.integer({ min: 0, max: 200 }),
  units: fc.double({ min: 0.5, max: 40, noNaN: true }),
});
const history = fc.array(period, { minLength: 3, maxLength: 40 }).filter((ps) => ps.some((p) => p.count > 0));
const method = fc.constantFrom<LimitsMethod>('sigma', 'probability', 'laney');
const asObservations = (ps: { count: number; units: number }[]): Observation[] =>
  ps.map((p, i) => ({ label: `P${i + 1}`, row: i + 2, count: p.count, units: p.units }));

describe('Phase I engine properties', () => {
  it('the estimate is Σx/Σk of the included periods', () => {
    fc.assert(
      fc.property(history, fc.array(fc.nat(), { maxLength: 5 }), (ps, picks) => {
        const excluded = [...new Set(picks.map((p) => p % ps.length))];
        const included = ps.filter((_, i) => !excluded.includes(i));
        fc.pre(included.some((p) => p.count > 0));
        const result = analyzePhaseOne(
          asObservations(ps),
          excluded.map((index) => ({ index, cause: { category: 'c', description: 'd' } })),
          { ...defaultOptions, chart: 'u' },
        );
        expect(result.ok).toBe(true);
        if (!result.ok) return;
        const expected =
          included.reduce((s, p) => s + p.count, 0) / included.reduce((s, p) => s + p.units, 0);
        expect(result.value.rate).toBeCloseTo(expected, 10);
        expect(result.value.m).toBe(included.length);
      }),
      { numRuns: 300 },
    );
  });

  it('excluding a period never changes another period’s count, units or place', () => {
    fc.assert(
      fc.property(history, fc.nat(), method, (ps, pick, limits) => {
        const index = pick % ps.length;
        const before = analyzePhaseOne(asObservations(ps), [], { ...defaultOptions, limits });
        const after = analyzePhaseOne(
          asObservations(ps),
          [{ index, cause: { category: 'c', description: 'd' } }],
          { ...defaultOptions, limits },
        );
        fc.pre(before.ok && after.ok);
        if (!before.ok || !after.ok) return;
        after.value.periods.forEach((p, i) => {
          expect([p.label, p.count, p.units]).toEqual([
            before.value.periods[i].label,
            before.value.periods[i].count,
            before.value.periods[i].units,
          ]);
          expect(p.status === 'excluded').toBe(i === index);
        });
      }),
      { numRuns: 300 },
    );
  });

  it('limits are monotone in k: count limits widen and rate limits narrow as k grows', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 1e-3, max: 50, noNaN: true }),
        fc.double({ min: 0.1, max: 100, noNaN: true }),
        fc.double({ min: 1.01, max: 10, noNaN: true }),
        (rate, k, factor) => {
          const small = sigmaLimits(rate, k);
          const large = sigmaLimits(rate, k * factor);
          expect(large.upper).toBeGreaterThan(small.upper);
          expect(large.upper / (k * factor)).toBeLessThan(small.upper / k);
          const pSmall = probabilityLimits(rate, k);
          const pLarge = probabilityLimits(rate, k * factor);
          expect(pLarge.upper).toBeGreaterThanOrEqual(pSmall.upper);
          expect(pLarge.lower ?? 0).toBeGreaterThanOrEqual(pSmall.lower ?? 0);
        },
      ),
      { numRuns: 500 },
    );
  });
});
