import { describe, expect, it } from 'vitest';
import { analyzePhaseOne } from '../../shared-core/study/phase-one.js';
import { defaultOptions, type Observation } from '../../shared-core/study/analysis-types.js';

const periods = (counts: number[], units: number[] | number = 1): Observation[] =>
  counts.map((count, i) => ({
    label: String(i + 1),
    row: i + 2,
    count,
    units: Array.isArray(units) ? units[i] : units,
  }));

/**
 * The book computes its limits from the center rounded to two decimals (e.g. 19.85 + 3·√19.85 =
 * 33.22), so a limit from the exact center can differ from the printed one by up to 0.01.
 */
function expectPrinted(value: number | null, printed: number, tolerance = 0.01) {
  expect(value).not.toBeNull();
  expect(Math.abs(value! - printed)).toBeLessThanOrEqual(tolerance + 1e-12);
}

function analyze(observations: Observation[], excluded: number[] = [], options = {}) {
  const result = analyzePhaseOne(
    observations,
    excluded.map((index) => ({ index, cause: { category: 'test', description: 'assignable cause' } })),
    { ...defaultOptions, ...options },
  );
  if (!result.ok) throw new Error(result.findings[0].message);
  return result.value;
}

describe('c chart: Montgomery, Introduction to Statistical Quality Control, printed circuit boards example (values from memory)', () => {
  // 26 samples of 100 boards; the book prints c̄ = 19.85, UCL = 33.22, LCL = 6.48, samples 6 and 20
  // beyond the limits, and after excluding both (assignable causes found) c̄ = 19.67, UCL = 32.97,
  // LCL = 6.36. Compared at the printed precision.
  const boards = periods([
    21, 24, 16, 12, 15, 5, 28, 20, 31, 25, 20, 24, 16, 19, 10, 17, 13, 22, 18, 39, 30, 24, 16, 19, 17, 15,
  ]);

  it('gives the trial limits and flags samples 6 and 20', () => {
    const result = analyze(boards);
    expect(result.chart).toBe('c');
    expect(result.center).toBeCloseTo(19.85, 2);
    expectPrinted(result.periods[0].ucl, 33.22);
    expectPrinted(result.periods[0].lcl, 6.48);
    expect(result.periods.filter((p) => p.status === 'signal').map((p) => p.label)).toEqual(['6', '20']);
    expect(result.stable).toBe(false);
  });

  it('gives the revised limits once samples 6 and 20 are excluded', () => {
    const result = analyze(boards, [5, 19]);
    expect(result.m).toBe(24);
    expect(result.center).toBeCloseTo(19.67, 2);
    expectPrinted(result.periods[0].ucl, 32.97);
    expectPrinted(result.periods[0].lcl, 6.36);
    expect(result.periods[5].status).toBe('excluded');
    expect(result.periods[19].status).toBe('excluded');
    expect(result.periods[19].rules).toEqual([]);
    expect(result.stable).toBe(true);
  });
});

describe('u chart: Montgomery, personal computers example, 20 samples of 5 units (values from memory)', () => {
  // The book prints ū = 1.93, UCL = 3.79, LCL = 0.07 and no sample out of control.
  const computers = periods([10, 12, 8, 14, 10, 16, 11, 7, 10, 15, 9, 5, 7, 11, 12, 6, 8, 10, 7, 5], 5);

  it('gives the printed center and limits on the rate scale when a u chart is asked for', () => {
    const result = analyze(computers, [], { chart: 'u' });
    expect(result.chart).toBe('u');
    expect(result.center).toBeCloseTo(1.93, 2);
    expectPrinted(result.periods[0].ucl, 3.79);
    expectPrinted(result.periods[0].lcl, 0.07);
    expect(result.stable).toBe(true);
  });
});

describe('u chart with variable k: Montgomery, dyed cloth example, rolls in units of 50 m² (values from memory)', () => {
  // The book prints ū = 1.42 and, for a roll of 10 units, UCL = 2.55 and LCL = 0.29; no roll signals.
  const units = [10, 8, 13, 10, 9.5, 10, 12, 10.5, 12, 12.5];
  const cloth = periods([14, 12, 20, 11, 7, 10, 21, 16, 19, 23], units);

  it('chooses a u chart, estimates ū = Σx/Σk and steps the limits with k', () => {
    const result = analyze(cloth);
    expect(result.chart).toBe('u');
    expect(result.center).toBeCloseTo(153 / 107.5, 12);
    expect(result.center).toBeCloseTo(1.42, 2);
    expectPrinted(result.periods[0].ucl, 2.55);
    expectPrinted(result.periods[0].lcl, 0.29);
    expect(result.periods[1].ucl).toBeGreaterThan(result.periods[0].ucl); // k = 8 < 10: wider
    expect(result.stable).toBe(true);
    // k̄ = 10.75 and the roll of 8 units lies 25.6 % below it: average-k limits are not offered.
    expect(result.averageK).toBeNull();
  });

  it('refuses a c chart when k varies', () => {
    const result = analyzePhaseOne(cloth, [], { ...defaultOptions, chart: 'c' });
    expect(result.ok).toBe(false);
  });
});
