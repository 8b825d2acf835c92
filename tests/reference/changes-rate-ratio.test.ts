import { describe, expect, it } from 'vitest';
import binomialPmf from '@stdlib/stats-base-dists-binomial-pmf';
import betaQuantile from '@stdlib/stats-base-dists-beta-quantile';
import jStat from 'jstat';
import { rateRatioTest, twoSidedP } from '../../shared-core/changes/rate-ratio-test.js';

/** The definition itself, summed over every i with @stdlib's binomial pmf (independent reference). */
function referenceP(x: number, n: number, p: number): number {
  const observed = binomialPmf(x, n, p);
  let sum = 0;
  for (let i = 0; i <= n; i++) {
    const d = binomialPmf(i, n, p);
    if (d <= observed * (1 + 1e-7)) sum += d;
  }
  return Math.min(1, sum);
}

/** Clopper–Pearson with @stdlib's beta quantile, mapped to the ratio. */
function referenceInterval(xBase: number, tBase: number, xNew: number, tNew: number) {
  const n = xBase + xNew;
  const low = xNew === 0 ? 0 : betaQuantile(0.025, xNew, n - xNew + 1);
  const high = xNew === n ? 1 : betaQuantile(0.975, xNew + 1, n - xNew);
  const map = (p: number) => (p * tBase) / ((1 - p) * tNew);
  return { low: map(low), high: high === 1 ? null : map(high) };
}

describe('exact conditional rate-ratio test (Przyborowski & Wilenski 1940)', () => {
  it('matches the published comparison of lung cancer rates, Fredericia against three other Danish cities, ages 55–59 (E. B. Andersen 1977 data, Scandinavian Journal of Statistics 4; printed values from memory)', () => {
    // 11 cases in 800 person-years against 6 + 8 + 7 = 21 in 1083 + 1050 + 878 = 3011: printed as
    // rate ratio 1.971488, 95 % interval 0.8584264 to 4.2772659, exact conditional p = 0.07967.
    const result = rateRatioTest({ count: 21, units: 3011 }, { count: 11, units: 800 });
    if (!result.ok) throw new Error('no result');
    expect(result.value.ratio).toBeCloseTo(1.971488, 6);
    expect(result.value.ciLow).toBeCloseTo(0.8584264, 6);
    expect(result.value.ciHigh).toBeCloseTo(4.2772659, 6);
    expect(result.value.pValue).toBeCloseTo(0.07967, 5);
    expect(result.value.conditional.total * result.value.conditional.nullProportion).toBeCloseTo(6.7174, 4);
  });

  const cases: [number, number, number, number][] = [
    [21, 3011, 11, 800],
    [40, 100, 40, 100],
    [0, 50, 7, 50],
    [9, 20, 0, 35],
    [120, 600, 95, 410],
    [3, 10, 30, 10],
    [1500, 3000, 1650, 3100],
    [5, 7, 5, 13],
  ];

  it.each(cases)(
    'p-value for base %d/%d, new %d/%d equals the definition summed with @stdlib',
    (xb, tb, xn, tn) => {
      const result = rateRatioTest({ count: xb, units: tb }, { count: xn, units: tn });
      if (!result.ok) throw new Error('no result');
      const expected = referenceP(xn, xb + xn, tn / (tb + tn));
      expect(Math.abs(result.value.pValue - expected)).toBeLessThanOrEqual(
        1e-10 * Math.max(expected, 1e-300) + 1e-15,
      );
    },
  );

  it.each(cases)(
    'interval for base %d/%d, new %d/%d equals Clopper–Pearson from @stdlib, mapped',
    (xb, tb, xn, tn) => {
      const result = rateRatioTest({ count: xb, units: tb }, { count: xn, units: tn });
      if (!result.ok) throw new Error('no result');
      const expected = referenceInterval(xb, tb, xn, tn);
      expect(result.value.ciLow).toBeCloseTo(expected.low, 8);
      if (expected.high === null) expect(result.value.ciHigh).toBeNull();
      else expect((result.value.ciHigh as number) / expected.high).toBeCloseTo(1, 9);
      if (xb === 0) expect(result.value.ratio).toBeNull();
    },
  );

  it('agrees with jStat’s binomial pmf summed over every outcome (a second independent library)', () => {
    const n = 60;
    const p = 0.37;
    for (const x of [0, 5, 15, 22, 23, 30, 45, 60]) {
      let expected = 0;
      const observed = jStat.binomial.pdf(x, n, p);
      for (let i = 0; i <= n; i++) {
        const d = jStat.binomial.pdf(i, n, p);
        if (d <= observed * (1 + 1e-7)) expected += d;
      }
      expect(twoSidedP(x, n, p)).toBeCloseTo(Math.min(1, expected), 10);
    }
  });

  it('counts the tied outcome of a symmetric binomial on both sides (p = 1/2)', () => {
    // n = 10, p = ½, x = 2: P(X ≤ 2) + P(X ≥ 8) = 2·56/1024 (the binomial coefficients; common practice).
    expect(twoSidedP(2, 10, 0.5)).toBeCloseTo(112 / 1024, 14);
    expect(twoSidedP(5, 10, 0.5)).toBe(1);
  });

  it('says the test is optimistic when the data are over-dispersed, and refuses bad samples', () => {
    const result = rateRatioTest({ count: 30, units: 10 }, { count: 45, units: 10 }, { overdispersed: true });
    if (!result.ok) throw new Error('no result');
    expect(result.value.cautions.map((c) => c.code)).toContain('test-optimistic');
    const bad = rateRatioTest({ count: 2.5, units: 10 }, { count: 4, units: 0 });
    expect(bad.ok).toBe(false);
    if (!bad.ok) expect(bad.findings.map((f) => f.column)).toEqual(['count', 'units']);
  });

  it('reports no evidence when nothing was counted in either sample', () => {
    const result = rateRatioTest({ count: 0, units: 10 }, { count: 0, units: 12 });
    if (!result.ok) throw new Error('no result');
    expect(result.value).toMatchObject({ ratio: null, ciLow: 0, ciHigh: null, pValue: 1 });
    expect(result.value.cautions[0].code).toBe('no-counts');
  });
});
