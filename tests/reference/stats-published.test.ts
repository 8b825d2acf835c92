import { describe, expect, it } from 'vitest';
import { chiSquareQuantile, chiSquareSurvival } from '../../shared-core/stats/chi-square.js';
import { normalCdf, normalQuantile } from '../../shared-core/stats/normal.js';
import { poissonCdf, poissonUpperQuantile, poissonUpperTail } from '../../shared-core/stats/poisson.js';
import { poissonMeanInterval } from '../../shared-core/stats/poisson-mean-interval.js';

/*
 * Published table values, compared at the precision the tables print. Where a value is quoted from
 * memory rather than read off the page, the test says so.
 */

/** |actual − printed| within half a unit in the last printed place. */
function matchesPrinted(actual: number, printed: string): void {
  const decimals = printed.includes('.') ? printed.split('.')[1].length : 0;
  expect(Math.abs(actual - Number(printed))).toBeLessThanOrEqual(0.5 * 10 ** -decimals + 1e-15);
}

describe('chi-square percentage points (Abramowitz & Stegun Table 26.8; NIST/SEMATECH e-Handbook 1.3.6.7.4; values from memory)', () => {
  it.each([
    [0.95, 1, '3.84146'],
    [0.99, 10, '23.2093'],
    [0.975, 2, '7.37776'],
    [0.025, 10, '3.24697'],
    [0.95, 30, '43.7730'],
    [0.99, 100, '135.807'],
    [0.05, 1, '0.00393214'],
  ])('χ²(%d; %d) = %s', (p, df, printed) => {
    matchesPrinted(chiSquareQuantile(p, df), printed);
  });
  it('upper-tail probability at the tabled point: P(χ²₁ > 3.841459) = 0.05 (common practice)', () => {
    expect(chiSquareSurvival(3.841459, 1)).toBeCloseTo(0.05, 6);
  });
});

describe('standard normal (Abramowitz & Stegun Tables 26.1 and 26.5; values from memory)', () => {
  it.each([
    [0.975, '1.959964'],
    [0.95, '1.644854'],
    [0.995, '2.575829'],
    [0.999, '3.090232'],
  ])('Φ⁻¹(%d) = %s', (p, printed) => {
    matchesPrinted(normalQuantile(p), printed);
    matchesPrinted(-normalQuantile(1 - p), printed);
  });
  it.each([
    [1, '0.841344746'],
    [-3, '0.001349898'],
    [2, '0.977249868'],
  ])('Φ(%d) = %s', (z, printed) => {
    matchesPrinted(normalCdf(z), printed);
  });
  it('Φ(−3) = 0.00135 is the one-sided tail of 3-sigma limits, α/2 = 0.0027/2 (common practice)', () => {
    expect(normalCdf(-3) * 2).toBeCloseTo(0.0027, 5);
  });
});

describe('cumulative Poisson table (any statistics text, e.g. Montgomery, Appendix II; values from memory)', () => {
  it.each([
    [2, 1, '0.9197'],
    [5, 4, '0.7851'],
    [10, 5, '0.9863'],
    [0, 4, '0.0183'],
    [11, 4, '0.9991'],
  ])('P(X ≤ %d | μ = %d) = %s', (k, mean, printed) => {
    matchesPrinted(poissonCdf(k, mean), printed);
  });
});

describe('exact Poisson limits, the check in DESIGN.md', () => {
  it('μ = 4 at α = 0.0027: UCL = 11, and a count of 0 does not signal low (no LCL)', () => {
    const halfAlpha = 0.0027 / 2;
    expect(poissonUpperQuantile(halfAlpha, 4)).toBe(11);
    // Why 11: 12 or more is rare enough to signal, 11 or more is not.
    expect(poissonUpperTail(12, 4)).toBeLessThanOrEqual(halfAlpha);
    expect(poissonUpperTail(11, 4)).toBeGreaterThan(halfAlpha);
    // P(X ≤ 0) = e^{−4} ≈ 0.0183 > α/2, so no count is low enough to signal.
    expect(poissonCdf(0, 4)).toBeGreaterThan(halfAlpha);
  });
});

describe('Garwood exact interval for a Poisson mean (Garwood 1936; Ulm, Am. J. Epidemiol. 131, 1990; values from memory)', () => {
  it.each([
    [0, '0', '3.689'],
    [1, '0.0253', '5.572'],
    [5, '1.623', '11.668'],
    [10, '4.795', '18.390'],
  ])('x = %d at 95 %%: [%s, %s]', (total, lower, upper) => {
    const interval = poissonMeanInterval(total);
    matchesPrinted(interval.lower, lower);
    matchesPrinted(interval.upper, upper);
  });
  it('x = 0 at 95 %: the upper end is −ln(0.025) exactly, since P(X = 0 | μ) = e^{−μ}', () => {
    expect(poissonMeanInterval(0).upper).toBeCloseTo(-Math.log(0.025), 13);
  });
});
