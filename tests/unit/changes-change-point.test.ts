import { describe, expect, it } from 'vitest';
import poissonPmf from '@stdlib/stats-base-dists-poisson-pmf';
import binomialPmf from '@stdlib/stats-base-dists-binomial-pmf';
import {
  aliasTable,
  allocation,
  binomialDraw,
  changePoint,
  changeProfile,
} from '../../shared-core/changes/change-point.js';
import chisquareCdf from '@stdlib/stats-base-dists-chisquare-cdf';
import { seededRandom, type Random } from '../../shared-core/stats/random.js';

/** Poisson draws by inversion of the cdf (test-only sampler). */
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

/** 2·(max log-likelihood with a step after τ − without), from @stdlib's Poisson pmf (reference). */
function referenceStatistic(counts: number[], units: number[], tau: number): number {
  const logLik = (from: number, to: number, rate: number) => {
    let sum = 0;
    for (let i = from; i <= to; i++) sum += Math.log(poissonPmf(counts[i], rate * units[i]));
    return sum;
  };
  const rateOf = (from: number, to: number) => {
    let x = 0;
    let k = 0;
    for (let i = from; i <= to; i++) {
      x += counts[i];
      k += units[i];
    }
    return x / k;
  };
  const m = counts.length;
  return (
    2 *
    (logLik(0, tau, rateOf(0, tau)) +
      logLik(tau + 1, m - 1, rateOf(tau + 1, m - 1)) -
      logLik(0, m - 1, rateOf(0, m - 1)))
  );
}

describe('change-point check for one step in a Poisson rate', () => {
  const counts = [4, 6, 3, 5, 4, 9, 11, 8, 10, 12];
  const units = [2, 3, 2, 2, 2, 3, 3, 2, 3, 3];

  it('computes the likelihood-ratio statistic at every split as the Poisson log-likelihoods do (@stdlib pmf)', () => {
    const profile = changeProfile(counts, units);
    expect(profile).toHaveLength(counts.length - 1);
    profile.forEach((g, tau) => expect(g).toBeCloseTo(referenceStatistic(counts, units, tau), 9));
  });

  it('proposes the split with the largest statistic and reports both segments and the seed', () => {
    const result = changePoint(
      counts.map((count, i) => ({ count, units: units[i] })),
      { replications: 999, seed: 5 },
    );
    if (!result.ok) throw new Error('no result');
    const { value } = result;
    expect(value.splitAfter).toBe(4);
    expect(value.before).toMatchObject({ first: 0, last: 4, count: 22, units: 11 });
    expect(value.after).toMatchObject({ first: 5, last: 9, count: 50, units: 14 });
    expect(value.ratio).toBeCloseTo(50 / 14 / 2, 12);
    expect(value).toMatchObject({
      replications: 999,
      seed: 5,
      generator: 'xoshiro128** seeded by SplitMix64',
    });
    expect(value.pValue).toBe((1 + value.exceedances) / 1000);
    const again = changePoint(
      counts.map((count, i) => ({ count, units: units[i] })),
      { replications: 999, seed: 5 },
    );
    expect(again.ok && again.value.pValue).toBe(value.pValue);
  });

  it('agrees with the exact conditional p-value, enumerated over every allocation of a small total', () => {
    // m = 4 periods, total 9: all C(12, 3) = 220 allocations with their multinomial probabilities.
    const small = [1, 1, 3, 4];
    const k = [1, 2, 1, 2];
    const observed = Math.max(...changeProfile(small, k));
    const probabilities = k.map((u) => u / 6);
    let exact = 0;
    const factorial = (n: number): number => (n <= 1 ? 1 : n * factorial(n - 1));
    for (let a = 0; a <= 9; a++)
      for (let b = 0; a + b <= 9; b++)
        for (let c = 0; a + b + c <= 9; c++) {
          const d = 9 - a - b - c;
          const cells = [a, b, c, d];
          const g = Math.max(...changeProfile(cells, k));
          if (g >= observed - 1e-9) {
            let p = factorial(9);
            cells.forEach((x, i) => (p *= probabilities[i] ** x / factorial(x)));
            exact += p;
          }
        }
    const result = changePoint(
      small.map((count, i) => ({ count, units: k[i] })),
      { replications: 20_000, seed: 11 },
    );
    if (!result.ok) throw new Error('no result');
    // Tolerance: 4 binomial standard errors of the Monte Carlo proportion.
    const se = Math.sqrt((exact * (1 - exact)) / 20_000);
    expect(Math.abs(result.value.pValue - exact)).toBeLessThan(4 * se);
  });

  it('draws each period in proportion to its units (alias method; chi-square bound from 60,000 draws)', () => {
    const weights = [1, 2, 3, 0.5, 3.5];
    const draw = aliasTable(weights);
    const random = seededRandom(3);
    const tally = new Array<number>(weights.length).fill(0);
    for (let i = 0; i < 60_000; i++) tally[draw(random)]++;
    const statistic = tally.reduce((s, c, i) => {
      const e = (60_000 * weights[i]) / 10;
      return s + (c - e) ** 2 / e;
    }, 0);
    // χ²(4) 0.999 quantile is 18.47 (common tables).
    expect(statistic).toBeLessThan(18.47);
  });

  it.each([
    [50, 0.3],
    [2000, 0.01],
    [12, 0.95],
    [400, 0.5],
  ])('draws Binomial(%d, %d) with the probabilities of @stdlib’s pmf (chi-square, 40,000 draws)', (n, p) => {
    const random = seededRandom(n);
    const draws = 40_000;
    const tally = new Map<number, number>();
    for (let i = 0; i < draws; i++) {
      const x = binomialDraw(random, n, p);
      tally.set(x, (tally.get(x) ?? 0) + 1);
    }
    // Cells with an expected count of at least 5, the rest pooled (common practice).
    let statistic = 0;
    let cells = 0;
    let pooledObserved = 0;
    let pooledExpected = 0;
    for (let x = 0; x <= n; x++) {
      const expected = draws * binomialPmf(x, n, p);
      const observed = tally.get(x) ?? 0;
      if (expected >= 5) {
        statistic += (observed - expected) ** 2 / expected;
        cells++;
      } else {
        pooledObserved += observed;
        pooledExpected += expected;
      }
    }
    if (pooledExpected > 0) {
      statistic += (pooledObserved - pooledExpected) ** 2 / pooledExpected;
      cells++;
    }
    expect(1 - chisquareCdf(statistic, cells - 1)).toBeGreaterThan(0.001);
  });

  it('allocates a large total by conditional binomials: every draw sums to the total, means in proportion to k', () => {
    const k = [1, 2, 3, 4];
    const allocate = allocation(k, 5000);
    const random = seededRandom(8);
    const cells = new Float64Array(4);
    const sums = [0, 0, 0, 0];
    for (let r = 0; r < 2000; r++) {
      allocate(random, cells);
      expect(cells.reduce((a, b) => a + b, 0)).toBe(5000);
      cells.forEach((x, i) => (sums[i] += x));
    }
    // Mean of 2000 draws of Binomial(5000, kᵢ/10): within 4 standard errors of 500·kᵢ.
    sums.forEach((sum, i) => {
      const p = k[i] / 10;
      expect(Math.abs(sum / 2000 - 5000 * p)).toBeLessThan(4 * Math.sqrt((5000 * p * (1 - p)) / 2000));
    });
  });

  it('gives the same p-value by conditional binomials as by one alias draw per nonconformity (large total)', () => {
    const k = Array.from({ length: 12 }, (_, i) => 3 + (i % 4));
    const counts = k.map((units, i) => Math.round(units * (i < 7 ? 40 : 43)));
    const total = counts.reduce((a, b) => a + b, 0);
    const result = changePoint(
      counts.map((count, i) => ({ count, units: k[i] })),
      { replications: 3000, seed: 4 },
    );
    if (!result.ok) throw new Error('no result');
    const draw = aliasTable(k);
    const random = seededRandom(99);
    let hits = 0;
    const cells = new Float64Array(k.length);
    for (let r = 0; r < 3000; r++) {
      cells.fill(0);
      for (let n = 0; n < total; n++) cells[draw(random)]++;
      if (Math.max(...changeProfile(cells, k)) >= result.value.statistic - 1e-9) hits++;
    }
    const alias = hits / 3000;
    const se = Math.sqrt((2 * alias * (1 - alias)) / 3000) + 1e-3;
    expect(Math.abs(result.value.exceedances / 3000 - alias)).toBeLessThan(4 * se);
  });

  // Size and power by simulation, seed fixed. Under a constant rate the Monte Carlo test is exact
  // conditional on the total: P(p ≤ 0.05) ≤ 0.05 with R = 199. Bounds: ±3 binomial standard errors.
  it('holds its size under a constant rate and finds a doubling of the rate', () => {
    const random = seededRandom(2026);
    const k = Array.from({ length: 24 }, (_, i) => 2 + (i % 3));
    const datasets = 300;
    const run = (stepFactor: number) => {
      let rejected = 0;
      let nearTrueSplit = 0;
      for (let d = 0; d < datasets; d++) {
        const periods = k.map((units, i) => ({
          count: poissonDraw(random, (i >= 12 ? stepFactor : 1) * 1.5 * units),
          units,
        }));
        const result = changePoint(periods, { replications: 199, seed: d });
        if (!result.ok) throw new Error('no result');
        if (result.value.pValue <= 0.05) rejected++;
        if (Math.abs(result.value.splitAfter - 11) <= 2) nearTrueSplit++;
      }
      return { size: rejected / datasets, located: nearTrueSplit / datasets };
    };
    const sd = Math.sqrt((0.05 * 0.95) / datasets);
    const nullRun = run(1);
    expect(nullRun.size).toBeLessThan(0.05 + 3 * sd);
    expect(nullRun.size).toBeGreaterThan(0.05 - 3 * sd);
    const stepRun = run(2);
    expect(stepRun.size).toBeGreaterThan(0.9);
    expect(stepRun.located).toBeGreaterThan(0.75);
  });

  it('refuses fewer than three periods and reports no evidence when nothing was counted', () => {
    expect(
      changePoint([
        { count: 1, units: 1 },
        { count: 2, units: 1 },
      ]).ok,
    ).toBe(false);
    const none = changePoint(
      [0, 0, 0, 0].map((count) => ({ count, units: 1 })),
      { replications: 9 },
    );
    expect(none.ok && none.value.pValue).toBe(1);
  });
});
