import gammaln from '@stdlib/math-base-special-gammaln';
import chiSquareCdfReference from '@stdlib/stats-base-dists-chisquare-cdf';
import chiSquareQuantileReference from '@stdlib/stats-base-dists-chisquare-quantile';
import normalCdfReference from '@stdlib/stats-base-dists-normal-cdf';
import normalQuantileReference from '@stdlib/stats-base-dists-normal-quantile';
import poissonCdfReference from '@stdlib/stats-base-dists-poisson-cdf';
import poissonPmfReference from '@stdlib/stats-base-dists-poisson-pmf';
import poissonQuantileReference from '@stdlib/stats-base-dists-poisson-quantile';
import jStat from 'jstat';
import { describe, expect, it } from 'vitest';
import { chiSquareCdf, chiSquareQuantile, chiSquareSurvival } from '../../shared-core/stats/chi-square.js';
import { regularizedGammaP, regularizedGammaQ } from '../../shared-core/stats/incomplete-gamma.js';
import { logGamma } from '../../shared-core/stats/log-gamma.js';
import { normalCdf, normalQuantile, normalSurvival } from '../../shared-core/stats/normal.js';
import {
  poissonCdf,
  poissonPmf,
  poissonQuantile,
  poissonUpperQuantile,
  poissonUpperTail,
} from '../../shared-core/stats/poisson.js';

/*
 * Independent reference computations: @stdlib (its ports of the Boost and FDLIBM routines) and jstat,
 * devDependencies used only here. Where they are less accurate than this project's core (found while
 * writing these tests, checked against 30-digit mpmath sums in stats-high-precision.test.ts):
 *   - @stdlib 0.3 poisson-cdf (and chisquare-cdf, which share its incomplete gamma) is off by up to
 *     ~2.5e-3 relative for means ≥ 1e4 below the mean, and its chisquare-quantile inherits this;
 *   - @stdlib poisson-pmf uses k·ln μ − μ − lnΓ(k + 1) and loses digits as μ grows (1e-13 at μ = 100,
 *     1e-8 at μ = 1e7);
 *   - @stdlib normal-quantile is accurate to ~1e-15 for p ≥ 1e-3 but only ~1e-9 at p = 1e-10, and its
 *     normal-cdf to ~1e-13 at z = −30.
 * So each library is compared only where it is itself accurate, and large means are checked against a
 * second method: the normalized ratio-recurrence sum below.
 */

const relativeError = (actual: number, expected: number): number =>
  expected === 0 ? Math.abs(actual) : Math.abs(actual - expected) / Math.abs(expected);

/** Smallest means, moderate means, and k across each mean's whole range. */
const MODERATE_MEANS = [1e-6, 1e-3, 0.01, 0.1, 0.5, 1, 2.5, 4, 7.3, 10, 20, 33.3, 50, 100];

function countsAround(mean: number): number[] {
  const sigma = Math.sqrt(mean);
  const counts = [0, 1, 2, 3, 5, 8, 13, 21];
  for (const d of [-6, -4, -3, -2, -1, -0.5, 0, 0.5, 1, 2, 3, 4, 6, 8])
    counts.push(Math.round(mean + d * sigma));
  return [...new Set(counts.filter((k) => k >= 0))].sort((a, b) => a - b);
}

describe('log-gamma against @stdlib gammaln and jstat gammaln', () => {
  const grid = [1e-300, 1e-10, 1e-6, 1e-3, 0.1, 0.5, 0.9, 1, 1.2, 1.5, 1.9, 2, 2.5, 3, 4.5, 7, 9.99, 10];
  grid.push(10.01, 12.5, 15, 20, 50, 100, 1000, 1e5, 1e7, 1e8, 1e15, 1e100);
  // 1e-14 relative, or 3e-15 absolute near the zeros at 1 and 2 where a relative error is meaningless.
  it.each(grid)('lnΓ(%d)', (x) => {
    const expected = gammaln(x);
    expect(Math.abs(logGamma(x) - expected)).toBeLessThanOrEqual(Math.max(1e-14 * Math.abs(expected), 3e-15));
  });
  it('agrees with @stdlib on a dense grid in (0, 30], across the switch from Lanczos to Stirling at 10', () => {
    for (let x = 0.05; x <= 30; x += 0.05) {
      const expected = gammaln(x);
      expect(Math.abs(logGamma(x) - expected)).toBeLessThanOrEqual(
        Math.max(1e-14 * Math.abs(expected), 3e-15),
      );
    }
  });
  it('agrees with jstat on a dense grid in (0, 10]', () => {
    // jstat's six-term Lanczos form differs from @stdlib by up to 6.1e-14·max(1, |lnΓ|) here (measured;
    // it drifts to 3e-11 near 30): 1e-13·max(1, |lnΓ|).
    for (let x = 0.05; x <= 10; x += 0.05) {
      const expected = jStat.gammaln(x);
      expect(Math.abs(logGamma(x) - expected)).toBeLessThan(1e-13 * Math.max(1, Math.abs(expected)));
    }
  });
});

describe('Poisson against @stdlib and jstat for means up to 100', () => {
  it.each(MODERATE_MEANS)('mean %d: pmf and cdf', (mean) => {
    for (const k of countsAround(mean)) {
      const pmf = poissonPmf(k, mean);
      // jstat's pmf is accurate to a few ulp here; ours to about 1e-14 (its exponent up to ~100).
      const jstatPmf = jStat.poisson.pdf(k, mean);
      // (jstat overflows to NaN for larger k at μ = 100: its factorial is computed directly.)
      if (Number.isFinite(jstatPmf) && jstatPmf > 1e-300)
        expect(relativeError(pmf, jstatPmf)).toBeLessThan(2e-14);
      // @stdlib's pmf is itself only good to ~1e-13 at μ = 100.
      const stdlibPmf = poissonPmfReference(k, mean);
      if (stdlibPmf > 1e-300) expect(relativeError(pmf, stdlibPmf)).toBeLessThan(5e-13);
      // @stdlib's cdf is accurate to a few ulp for these means.
      const cdf = poissonCdfReference(k, mean);
      if (cdf > 1e-300) expect(relativeError(poissonCdf(k, mean), cdf)).toBeLessThan(1e-13);
    }
  });

  it.each(MODERATE_MEANS)('mean %d: quantiles equal @stdlib quantiles', (mean) => {
    // Integer results: equal unless the cdf lands within rounding of p, which these p avoid.
    // (@stdlib returns −0 for some; + 0 makes it +0.)
    for (const p of [1e-6, 0.00135, 0.025, 0.3, 0.5, 0.9, 0.975, 0.99865]) {
      expect(poissonQuantile(p, mean)).toBe(poissonQuantileReference(p, mean) + 0);
    }
  });
});

/**
 * A second method for large means: pmf terms by the ratio p(k + 1) = p(k)·μ/(k + 1), outward from
 * the mode with p(mode) = 1, over ±40 standard deviations (the mass outside is below 1e-340), then
 * normalized by their sum. No gamma function and no incomplete gamma is involved. Each step adds a
 * rounding, so after ~1.3·10⁵ steps the terms are good to ~1e-11: hence a tolerance of 1e-9 below.
 */
function normalizedPoisson(mean: number): {
  start: number;
  pmf: Float64Array;
  lower: Float64Array;
  upper: Float64Array;
} {
  const mode = Math.floor(mean);
  const spread = Math.ceil(40 * Math.sqrt(mean)) + 40;
  const start = Math.max(0, mode - spread);
  const end = mode + spread;
  const terms = new Float64Array(end - start + 1);
  terms[mode - start] = 1;
  for (let k = mode; k < end; k++) terms[k + 1 - start] = (terms[k - start] * mean) / (k + 1);
  for (let k = mode; k > start; k--) terms[k - 1 - start] = (terms[k - start] * k) / mean;
  let total = 0;
  for (const t of terms) total += t;
  const pmf = terms.map((t) => t / total);
  const lower = new Float64Array(pmf.length);
  const upper = new Float64Array(pmf.length);
  let running = 0;
  for (let i = 0; i < pmf.length; i++) lower[i] = running += pmf[i];
  running = 0;
  for (let i = pmf.length - 1; i >= 0; i--) upper[i] = running += pmf[i];
  return { start, pmf, lower, upper };
}

describe('Poisson for large means against normalized direct sums', () => {
  it.each([1e3, 1e4, 1e5, 1e6, 1e7])('mean %d: pmf, cdf, upper tail and both quantiles', (mean) => {
    const reference = normalizedPoisson(mean);
    const sigma = Math.sqrt(mean);
    for (let d = -9; d <= 9; d += 0.25) {
      const k = Math.round(mean + d * sigma);
      const i = k - reference.start;
      expect(relativeError(poissonPmf(k, mean), reference.pmf[i])).toBeLessThan(1e-9);
      expect(relativeError(poissonCdf(k, mean), reference.lower[i])).toBeLessThan(1e-9);
      expect(relativeError(poissonUpperTail(k, mean), reference.upper[i])).toBeLessThan(1e-9);
    }
    for (const p of [1e-9, 0.00135, 0.025, 0.5, 0.975]) {
      // The reference's smallest k with P(X ≤ k) ≥ p, and smallest k with P(X > k) ≤ p.
      const lowerIndex = reference.lower.findIndex((value) => value >= p);
      const upperIndex = reference.upper.findIndex((value) => value <= p) - 1;
      expect(poissonQuantile(p, mean)).toBe(reference.start + lowerIndex);
      expect(poissonUpperQuantile(p, mean)).toBe(reference.start + upperIndex);
    }
  });
});

describe('normal distribution against @stdlib and jstat', () => {
  it('Φ and 1 − Φ agree with @stdlib to 1e-14 for |z| ≤ 8', () => {
    for (let z = -8; z <= 8; z += 0.125) {
      expect(relativeError(normalCdf(z), normalCdfReference(z, 0, 1))).toBeLessThan(1e-14);
      expect(relativeError(normalSurvival(z), normalCdfReference(-z, 0, 1))).toBeLessThan(1e-14);
    }
  });
  it('Φ agrees with jstat to 1e-8 for |z| ≤ 6 (jstat erfc is a fixed Chebyshev fit, good to a few 1e-9)', () => {
    for (let z = -6; z <= 6; z += 0.25)
      expect(relativeError(normalCdf(z), jStat.normal.cdf(z, 0, 1))).toBeLessThan(1e-8);
  });
  it('Φ⁻¹ agrees with @stdlib to 4e-15 (a few ulp each) for 1e-3 ≤ p ≤ 1 − 1e-3, where @stdlib is accurate', () => {
    for (let p = 0.001; p < 0.9995; p += 0.0035) {
      expect(relativeError(normalQuantile(p), normalQuantileReference(p, 0, 1))).toBeLessThan(4e-15);
    }
  });
  it('Φ⁻¹ far in the tails is confirmed by @stdlib Φ (round trip to 5e-13: @stdlib Φ is good to ~1e-13 there)', () => {
    for (const p of [1e-300, 1e-200, 1e-100, 1e-50, 1e-20, 1e-10, 1e-6]) {
      expect(relativeError(normalCdfReference(normalQuantile(p), 0, 1), p)).toBeLessThan(5e-13);
    }
  });
});

describe('chi-square and incomplete gamma against @stdlib and jstat, for df ≤ 200', () => {
  const degrees = [0.5, 1, 2, 3, 4, 5, 7, 10, 15, 29, 30, 50, 99, 200];
  it.each(degrees)('df %d: cdf and survival', (df) => {
    for (const x of [1e-8, 0.01, 0.1, 0.5, 1, 2, 3.84, 5, 10, 20, 50, 100, 200, 400, 800]) {
      const expected = chiSquareCdfReference(x, df);
      // @stdlib's incomplete gamma (a Boost port) is accurate to a few ulp for a ≤ 100.
      if (expected > 1e-300) expect(relativeError(chiSquareCdf(x, df), expected)).toBeLessThan(1e-13);
      if (expected < 0.9) expect(relativeError(chiSquareSurvival(x, df), 1 - expected)).toBeLessThan(1e-13);
      if (expected > 1e-300) {
        // jstat's lowRegGamma is only good to ~1e-10 (series to fixed depth); a looser check.
        expect(
          relativeError(regularizedGammaP(df / 2, x / 2), jStat.lowRegGamma(df / 2, x / 2)),
        ).toBeLessThan(1e-8);
      }
    }
  });
  it.each(degrees)('df %d: quantile', (df) => {
    for (const p of [1e-10, 1e-4, 0.00135, 0.025, 0.05, 0.5, 0.95, 0.975, 0.99, 0.999]) {
      expect(relativeError(chiSquareQuantile(p, df), chiSquareQuantileReference(p, df))).toBeLessThan(1e-12);
    }
  });
  it('Q(a, x) = 1 − P(a, x) where both are moderate, for a up to 1e8', () => {
    for (const a of [0.5, 1, 10, 1e3, 1e5, 1e8]) {
      for (const d of [-2, -1, 0, 1, 2]) {
        const x = a + d * Math.sqrt(a) + 1;
        if (x <= 0) continue;
        expect(Math.abs(regularizedGammaP(a, x) + regularizedGammaQ(a, x) - 1)).toBeLessThan(1e-12);
      }
    }
  });
});
