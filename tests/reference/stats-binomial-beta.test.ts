import binomialCdfReference from '@stdlib/stats-base-dists-binomial-cdf';
import binomialPmfReference from '@stdlib/stats-base-dists-binomial-pmf';
import betaQuantileReference from '@stdlib/stats-base-dists-beta-quantile';
import jStat from 'jstat';
import { describe, expect, it } from 'vitest';
import { binomialCdf, binomialPmf, binomialUpperTail } from '../../shared-core/stats/binomial.js';
import { inverseRegularizedBeta, regularizedBeta } from '../../shared-core/stats/incomplete-beta.js';

/*
 * Binomial probabilities and the incomplete beta function against independent references: @stdlib
 * and jstat (devDependencies, used only in tests) and 30-digit mpmath values (tables below).
 */

const relativeError = (actual: number, expected: number): number =>
  expected === 0 ? Math.abs(actual) : Math.abs(actual - expected) / Math.abs(expected);

describe('binomial against @stdlib for n ≤ 1000', () => {
  const trials = [1, 2, 5, 10, 20, 50, 100, 1000];
  const probabilities = [1e-6, 0.001, 0.01, 0.1, 0.3, 0.5, 0.77, 0.99, 1 - 1e-6];
  it.each(trials)('n = %d: pmf and cdf', (n) => {
    for (const p of probabilities) {
      const sd = Math.sqrt(n * p * (1 - p));
      const counts = new Set([
        0,
        1,
        2,
        n - 1,
        n,
        ...[-6, -3, -1, 0, 1, 3, 6].map((d) => Math.round(n * p + d * sd)),
      ]);
      for (const k of counts) {
        if (k < 0 || k > n) continue;
        // @stdlib is good to ~1e-14 here (its pmf loses digits for larger n); ours to a few 1e-15.
        const pmf = binomialPmfReference(k, n, p);
        if (pmf > 1e-300) expect(relativeError(binomialPmf(k, n, p), pmf)).toBeLessThan(5e-13);
        const cdf = binomialCdfReference(k, n, p);
        if (cdf > 1e-300) expect(relativeError(binomialCdf(k, n, p), cdf)).toBeLessThan(5e-13);
        // Where 1 − cdf does not cancel, it checks the upper tail too.
        if (cdf < 0.9) expect(relativeError(binomialUpperTail(k + 1, n, p), 1 - cdf)).toBeLessThan(5e-12);
      }
    }
  });
});

describe('incomplete beta against jstat and its quantile against @stdlib', () => {
  const shapes = [0.5, 1, 2, 5, 10, 30, 100, 1000];
  it.each(shapes)('a = %d', (a) => {
    for (const b of [0.5, 1, 3, 10, 50, 1000]) {
      for (const p of [1e-8, 0.001, 0.025, 0.3, 0.5, 0.9, 0.975, 0.999]) {
        const x = betaQuantileReference(p, a, b);
        // @stdlib's beta quantile (a Boost port) is accurate to a few ulp: 2e-13 allows its conditioning.
        expect(relativeError(inverseRegularizedBeta(p, a, b), x)).toBeLessThan(2e-13);
        // jstat's ibeta is a fixed-depth continued fraction good to ~1e-7 for large shapes: a loose check.
        expect(relativeError(regularizedBeta(x, a, b), jStat.ibeta(x, a, b))).toBeLessThan(1e-6);
      }
    }
  });
});
