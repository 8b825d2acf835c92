import { describe, expect, it } from 'vitest';
import { analyzePhaseOne } from '../../shared-core/study/phase-one.js';
import {
  defaultOptions,
  type AnalysisOptions,
  type Observation,
} from '../../shared-core/study/analysis-types.js';
import { laneySigmaZ } from '../../shared-core/charts/laney-sigma-z.js';
import { perPointAlpha, phaseOneFap } from '../../shared-core/charts/false-alarm.js';
import { probabilityLimits } from '../../shared-core/charts/probability-limits.js';
import { averageUnitsForDisplay } from '../../shared-core/charts/average-units.js';
import { unitsForLowerLimit } from '../../shared-core/charts/units-for-lower-limit.js';

const obs = (counts: number[], units: number[] | number = 1): Observation[] =>
  counts.map((count, i) => ({
    label: `P${i + 1}`,
    row: i + 2,
    count,
    units: Array.isArray(units) ? units[i] : units,
  }));
const cause = { category: 'material', description: 'wrong resin lot' };

function run(observations: Observation[], options: Partial<AnalysisOptions> = {}, excluded: number[] = []) {
  const result = analyzePhaseOne(
    observations,
    excluded.map((index) => ({ index, cause })),
    { ...defaultOptions, ...options },
  );
  if (!result.ok) throw new Error(result.findings[0].message);
  return result.value;
}

describe('probability limits', () => {
  it('μ = 4 at α = 0.0027 gives UCL 11 and no LCL (DESIGN.md check)', () => {
    expect(probabilityLimits(4, 1, 0.0027)).toEqual({ mean: 4, upper: 11, lower: null });
  });

  it('an LCL exists exactly when ū·k ≥ ln(2/α) (DESIGN.md: 6.61 at α = 0.0027)', () => {
    const threshold = Math.log(2 / 0.0027);
    expect(threshold).toBeCloseTo(6.61, 2);
    expect(probabilityLimits(threshold * 0.999, 1).lower).toBeNull();
    expect(probabilityLimits(threshold * 1.001, 1).lower).toBe(1);
    expect(unitsForLowerLimit('probability', 2, 3, 0.0027, null).units).toBeCloseTo(threshold / 2, 12);
  });

  it('reports rate limits as count limits divided by k', () => {
    const result = run(obs([3, 9, 4, 6], [2, 4, 2, 3]), { limits: 'probability' });
    for (const p of result.periods) {
      const counts = probabilityLimits(result.rate, p.units);
      expect(p.ucl).toBeCloseTo(counts.upper / p.units, 12);
    }
  });
});

describe('sigma limits', () => {
  it('reports a negative lower limit as none (null), never 0', () => {
    const result = run(obs([1, 2, 0, 3, 1]));
    expect(result.periods.every((p) => p.lcl === null)).toBe(true);
    expect(result.warnings.map((w) => w.code)).toContain('no-lower-limit');
  });

  it('uses a known rate instead of the estimate, with m degrees of freedom for dispersion', () => {
    const result = run(obs([4, 5, 6, 5]), { knownRate: 4 });
    expect(result.center).toBe(4);
    expect(result.rateSource).toBe('known');
    expect(result.dispersion.df).toBe(4);
    expect(run(obs([4, 5, 6, 5])).dispersion.df).toBe(3);
  });

  it('refuses ū = 0 with a message', () => {
    const result = analyzePhaseOne(obs([0, 0, 0]), [], defaultOptions);
    expect(result.ok).toBe(false);
    if (!result.ok) expect(result.findings[0].message).toMatch(/ū = 0/);
  });
});

describe('Laney u′ (Laney 2002, Quality Engineering 14(4))', () => {
  it('averages moving ranges over adjacent included pairs only and divides by 1.128', () => {
    // Worked by hand: ranges |1.128 − 0| and |0 − 1.128| → mean 1.128 → σz = 1.
    expect(laneySigmaZ([0, 1.128, 0], [true, true, true])).toBeCloseTo(1, 12);
    // The middle period is excluded: no pair is adjacent, so nothing bridges it.
    expect(laneySigmaZ([0, 1.128, 0], [true, false, true])).toBeNull();
    // Only the pair (3, 4) counts: |0.5 − (−0.064)| = 0.564 → σz = 0.5 (kept below 1).
    expect(laneySigmaZ([5, 9, -0.064, 0.5], [true, false, true, true])).toBeCloseTo(0.5, 12);
  });

  it('widens the limits by σz and standardizes z by σz', () => {
    const data = obs([12, 30, 8, 25, 10, 28, 9, 31], 2);
    const sigma = run(data);
    const laney = run(data, { limits: 'laney' });
    expect(laney.sigmaZ).toBeGreaterThan(1);
    const spread = (p: { ucl: number; center: number }) => p.ucl - p.center;
    expect(spread(laney.periods[0]) / spread(sigma.periods[0])).toBeCloseTo(laney.sigmaZ!, 12);
    expect(laney.periods[1].z * laney.sigmaZ!).toBeCloseTo(sigma.periods[1].z, 12);
  });
});

describe('Phase I engine conventions (DESIGN.md)', () => {
  it('estimates ū as Σx/Σk of the included periods, not the mean of the rates', () => {
    const data = obs([1, 10], [1, 10]);
    expect(run(data).rate).toBeCloseTo(11 / 11, 12);
    const skewed = obs([2, 10], [1, 10]);
    expect(run(skewed).rate).toBeCloseTo(12 / 11, 12);
  });

  it('keeps excluded periods on the chart with their limits but out of the estimate and the rules', () => {
    const data = obs([5, 6, 30, 5, 4, 6]);
    const result = run(data, { rules: ['beyond', 'run:8'] }, [2]);
    expect(result.m).toBe(5);
    expect(result.rate).toBeCloseTo(26 / 5, 12);
    expect(result.periods[2]).toMatchObject({ status: 'excluded', rules: [], count: 30, cause });
    expect(result.periods[2].ucl).toBeCloseTo(result.periods[0].ucl, 12);
  });

  it('runs the rules over included periods only: an excluded period neither extends nor breaks a run', () => {
    const counts = [9, 9, 9, 9, 1, 9, 9, 9, 9, 1, 1, 1, 1, 1, 1, 1];
    const result = run(obs(counts), { rules: ['run:8'] }, [4]);
    const fired = result.periods.filter((p) => p.rules.includes('run:8')).map((p) => p.label);
    expect(fired).toEqual(['P9']); // P1–P4 and P6–P9 form 8 above the center once P5 is skipped
  });

  it('converts --fap into per-point α over the included periods, and reports the Phase I FAP exactly', () => {
    expect(perPointAlpha(0.05, 25)).toBeCloseTo(1 - 0.95 ** (1 / 25), 15);
    expect(phaseOneFap([0.01, 0.02])).toBeCloseTo(1 - 0.99 * 0.98, 15);
    const result = run(obs([5, 7, 4, 6, 5, 8, 3, 6, 5, 7]), { limits: 'probability', fap: 0.05 });
    expect(result.alpha).toBeCloseTo(perPointAlpha(0.05, 10), 15);
    expect(result.fap).toBeLessThanOrEqual(0.05); // discrete limits can only be more conservative
  });

  it('offers average-k limits only when every k is within ±25 % of k̄ (common practice)', () => {
    expect(averageUnitsForDisplay([10, 12, 8.5])).toBeCloseTo(30.5 / 3, 12);
    expect(averageUnitsForDisplay([10, 12, 7])).toBeNull();
  });

  it('warns about few periods and many exclusions', () => {
    const result = run(obs([5, 6, 30, 5, 4, 6]), {}, [2]);
    const codes = result.warnings.map((w) => w.code);
    expect(codes).toContain('few-periods');
    expect(codes).toContain('many-excluded');
  });

  it('refuses an exclusion that names no period', () => {
    const result = analyzePhaseOne(obs([1, 2]), [{ index: 5, cause }], defaultOptions);
    expect(result.ok).toBe(false);
  });
});
