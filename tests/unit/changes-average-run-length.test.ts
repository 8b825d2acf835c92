import { describe, expect, it } from 'vitest';
import poissonCdf from '@stdlib/stats-base-dists-poisson-cdf';
import {
  averageRunLength,
  countSymbolProbabilities,
  limitsAtUnits,
} from '../../shared-core/changes/average-run-length.js';
import { averageRunLengthOfChain, runLengthChain } from '../../shared-core/changes/run-length-chain.js';
import { probabilityLimits } from '../../shared-core/charts/probability-limits.js';
import { sigmaLimits } from '../../shared-core/charts/sigma-limits.js';
import { ruleCatalog } from '../../shared-core/rules/rule-catalog.js';
import type { RuleSeries } from '../../shared-core/rules/rule-series.js';
import { seededRandom, type Random } from '../../shared-core/stats/random.js';
import { standardizedValue } from '../../shared-core/charts/standardized-value.js';
import { analyzePhaseOne } from '../../shared-core/study/phase-one.js';
import { defaultOptions, type RuleId } from '../../shared-core/study/analysis-types.js';

// μ = 4 per period (k = 2 units at 2 per unit): 3-sigma limits 4 ± 6 → UCL 10, no LCL.
const at = { rate: 2, units: 2, limits: sigmaLimits(2, 2, 3) };

/** Poisson draws by inversion of the cdf, one uniform each (test-only sampler). */
function poissonDraw(random: Random, mean: number): number {
  const u = random.nextUniform();
  let x = 0;
  let term = Math.exp(-mean);
  let cdf = term;
  while (u >= cdf && x < 10_000) {
    x++;
    term *= mean / x;
    cdf += term;
  }
  return x;
}

/** Run lengths from periods simulated one by one and judged by the app's own rule functions. */
function simulatedArl(
  rules: RuleId[],
  shift: number,
  runs: number,
  seed: number,
): { mean: number; se: number } {
  const random = seededRandom(seed);
  const mean = shift * at.rate * at.units;
  const lengths: number[] = [];
  for (let r = 0; r < runs; r++) {
    const series = { z: [] as number[], beyond: [] as boolean[] } satisfies RuleSeries;
    let length = 0;
    for (;;) {
      const count = poissonDraw(random, mean);
      series.z.push(standardizedValue(count / at.units, at.rate, at.units));
      series.beyond.push(count > at.limits.upper || (at.limits.lower !== null && count < at.limits.lower));
      length++;
      // The rules look back at most 15 periods: keep the last 16 so that long runs stay cheap.
      if (series.z.length > 16) {
        series.z.shift();
        series.beyond.shift();
      }
      const t = series.z.length - 1;
      if (rules.some((id) => ruleCatalog[id].firesAt(series, t))) break;
    }
    lengths.push(length);
  }
  const average = lengths.reduce((a, b) => a + b, 0) / runs;
  const variance = lengths.reduce((a, b) => a + (b - average) ** 2, 0) / (runs - 1);
  return { mean: average, se: Math.sqrt(variance / runs) };
}

describe('average run length of Poisson counts', () => {
  it('is 1/p for the one-point rule, p from an independent Poisson cdf (@stdlib)', () => {
    const result = averageRunLength(at, ['beyond'], [1.25, 1.5, 2]);
    expect(result.ok).toBe(true);
    if (!result.ok) return;
    expect(result.value.method).toBe('closed form');
    expect(result.value.points.map((p) => p.shift)).toEqual([1, 1.25, 1.5, 2]);
    for (const point of result.value.points) {
      const p = 1 - poissonCdf(10, point.shift * 4);
      expect(point.beyondProbability).toBeCloseTo(p, 14);
      expect(point.arl).toBeCloseTo(1 / p, 8);
    }
  });

  it('is 1/p for probability limits with a lower limit (μ = 30, α = 0.0027)', () => {
    const limits = probabilityLimits(3, 10, 0.0027);
    expect(limits.lower).not.toBeNull();
    const result = averageRunLength({ rate: 3, units: 10, limits }, ['beyond'], [2]);
    if (!result.ok) throw new Error('no result');
    const [inControl, doubled] = result.value.points;
    const p = (mean: number) =>
      1 - poissonCdf(limits.upper, mean) + poissonCdf((limits.lower as number) - 1, mean);
    expect(inControl.arl).toBeCloseTo(1 / p(30), 6);
    expect(doubled.arl).toBeCloseTo(1 / p(60), 10);
  });

  it('the chain of the one-point rule equals the closed form', () => {
    const probabilities = countSymbolProbabilities(at, 1.5);
    const chain = runLengthChain(
      ['beyond'],
      probabilities.map((p) => p.symbol),
    );
    if (!chain.ok) throw new Error('no chain');
    expect(chain.value.states).toBe(1);
    const p = 1 - poissonCdf(10, 6);
    expect(
      averageRunLengthOfChain(
        chain.value,
        probabilities.map((q) => q.probability),
      ),
    ).toBeCloseTo(1 / p, 9);
  });

  it('symbol probabilities add up to 1 at every shift', () => {
    for (const shift of [0.5, 1, 1.25, 2, 5]) {
      const total = countSymbolProbabilities(at, shift).reduce((s, p) => s + p.probability, 0);
      expect(total).toBeCloseTo(1, 12);
    }
  });

  // Tolerance: 4 standard errors of the simulated mean (a few thousand runs, seed fixed): about
  // ±7 % in control, where the run lengths are long, and ±5 % at the shift.
  it.each([
    [['beyond', 'zone-a', 'zone-b', 'run:8'] as RuleId[], 1, 3000, 101],
    [['beyond', 'zone-a', 'zone-b', 'run:8'] as RuleId[], 1.5, 6000, 102],
    [['beyond', 'run:9', 'hug', 'avoid'] as RuleId[], 1, 3000, 103],
  ])(
    'for %j at shift %d agrees with a seeded simulation of the rule functions',
    (rules, shift, runs, seed) => {
      const result = averageRunLength(at, rules, [shift]);
      if (!result.ok) throw new Error(result.findings[0].message);
      const point = result.value.points.find((p) => p.shift === shift);
      const simulated = simulatedArl(rules, shift, runs, seed);
      expect(Math.abs((point?.arl as number) - simulated.mean)).toBeLessThan(4 * simulated.se);
    },
  );

  it('refuses trend and alternate, which compare successive values, with a finding', () => {
    const result = averageRunLength(at, ['beyond', 'trend']);
    expect(result.ok).toBe(false);
    if (!result.ok) expect(result.findings[0].message).toMatch(/trend/);
  });

  it('handles every chain rule at once within the state limit', () => {
    const result = averageRunLength(at, ['beyond', 'zone-a', 'zone-b', 'run:8', 'run:9', 'hug', 'avoid']);
    expect(result.ok).toBe(true);
    if (result.ok) expect(result.value.points[0].arl).toBeGreaterThan(1);
  });

  it('scales z by Laney σz and warns that Poisson run lengths flatter over-dispersed data', () => {
    const laney = { rate: 2, units: 2, limits: sigmaLimits(2, 2, 3, 1.5), sigmaZ: 1.5 };
    const result = averageRunLength(laney, ['beyond'], [2]);
    if (!result.ok) throw new Error('no result');
    // UCL = 4 + 3·1.5·2 = 13, so p = P(X ≥ 14) for X ~ Poisson(4) (@stdlib).
    expect(result.value.points[0].arl).toBeCloseTo(1 / (1 - poissonCdf(13, 4)), 4);
    expect(result.value.warnings.map((w) => w.code)).toContain('arl-poisson-only');
  });

  it('takes the limits of an analysis at its typical k', () => {
    const observations = [5, 3, 4, 6, 2, 4, 5, 3].map((count, i) => ({
      label: `P${i + 1}`,
      row: i + 2,
      count,
      units: 2,
    }));
    const analysis = analyzePhaseOne(observations, [], { ...defaultOptions, limits: 'probability' });
    if (!analysis.ok) throw new Error('no analysis');
    const limits = limitsAtUnits(analysis.value, 2);
    expect(limits.limits.upper).toBe(probabilityLimits(2, 2, 0.0027).upper);
  });
});
