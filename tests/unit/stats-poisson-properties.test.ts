import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  poissonCdf,
  poissonLogPmf,
  poissonPmf,
  poissonQuantile,
  poissonUpperQuantile,
  poissonUpperTail,
} from '../../shared-core/stats/poisson.js';

/*
 * Properties that hold for any Poisson distribution (facts of probability, no source needed), over
 * means from 1e-6 to 1e7 drawn on a log scale, and the edge cases of the contract.
 */

const mean = fc.double({ min: -6, max: 7, noNaN: true }).map((exponent) => 10 ** exponent);
const probability = fc.double({ min: 1e-12, max: 1 - 1e-12, noNaN: true });
const smallTail = fc.double({ min: -15, max: -0.31, noNaN: true }).map((exponent) => 10 ** exponent);
/** A count near the bulk of the distribution (within ±10 standard deviations). */
const countFor = (mu: number, offset: number): number => Math.max(0, Math.round(mu + offset * Math.sqrt(mu)));
const offset = fc.double({ min: -10, max: 10, noNaN: true });
const runs = { numRuns: 300, seed: 20261201 };

describe('Poisson quantiles invert the distribution function exactly', () => {
  it('P(X ≤ q(p)) ≥ p and P(X ≤ q(p) − 1) < p', () => {
    fc.assert(
      fc.property(probability, mean, (p, mu) => {
        const k = poissonQuantile(p, mu);
        expect(poissonCdf(k, mu)).toBeGreaterThanOrEqual(p);
        if (k > 0) expect(poissonCdf(k - 1, mu)).toBeLessThan(p);
      }),
      runs,
    );
  });
  it('P(X > u(q)) ≤ q and P(X > u(q) − 1) > q, through the upper tail', () => {
    fc.assert(
      fc.property(smallTail, mean, (q, mu) => {
        const k = poissonUpperQuantile(q, mu);
        expect(poissonUpperTail(k + 1, mu)).toBeLessThanOrEqual(q);
        if (k > 0) expect(poissonUpperTail(k, mu)).toBeGreaterThan(q);
      }),
      runs,
    );
  });
});

describe('the two tails and the pmf fit together', () => {
  it('P(X ≤ k) + P(X ≥ k + 1) = 1 within 1e-12', () => {
    fc.assert(
      fc.property(mean, offset, (mu, d) => {
        const k = countFor(mu, d);
        expect(Math.abs(poissonCdf(k, mu) + poissonUpperTail(k + 1, mu) - 1)).toBeLessThan(1e-12);
      }),
      runs,
    );
  });
  it('P(X ≤ k) − P(X ≤ k − 1) = P(X = k) where the difference does not cancel', () => {
    fc.assert(
      fc.property(mean, offset, (mu, d) => {
        const k = countFor(mu, d);
        const lower = poissonCdf(k, mu);
        if (lower > 0.5) return; // the difference of two numbers near 1 says nothing
        const pmf = poissonPmf(k, mu);
        const difference = lower - poissonCdf(k - 1, mu);
        if (pmf < 1e-6 * lower) return;
        expect(Math.abs(difference - pmf) / pmf).toBeLessThan((1e-12 * lower) / pmf);
      }),
      runs,
    );
  });
  it('the log pmf is the log of the pmf', () => {
    fc.assert(
      fc.property(mean, offset, (mu, d) => {
        const k = countFor(mu, d);
        const pmf = poissonPmf(k, mu);
        if (pmf > 1e-300) expect(Math.abs(poissonLogPmf(k, mu) - Math.log(pmf))).toBeLessThan(1e-12);
      }),
      runs,
    );
  });
});

describe('monotonicity', () => {
  it('P(X ≤ k) rises with k and falls with μ; P(X ≥ k) falls with k and rises with μ', () => {
    fc.assert(
      fc.property(mean, offset, fc.double({ min: 1.001, max: 2, noNaN: true }), (mu, d, factor) => {
        const k = countFor(mu, d);
        expect(poissonCdf(k + 1, mu)).toBeGreaterThanOrEqual(poissonCdf(k, mu));
        expect(poissonUpperTail(k + 1, mu)).toBeLessThanOrEqual(poissonUpperTail(k, mu));
        expect(poissonCdf(k, mu * factor)).toBeLessThanOrEqual(poissonCdf(k, mu));
        expect(poissonUpperTail(k, mu * factor)).toBeGreaterThanOrEqual(poissonUpperTail(k, mu));
      }),
      runs,
    );
  });
  it('the upper control limit rises with the mean and falls as the tail allowed grows', () => {
    fc.assert(
      fc.property(mean, smallTail, (mu, q) => {
        expect(poissonUpperQuantile(q, mu * 1.5)).toBeGreaterThanOrEqual(poissonUpperQuantile(q, mu));
        expect(poissonUpperQuantile(q * 2 > 1 ? 1 : q * 2, mu)).toBeLessThanOrEqual(
          poissonUpperQuantile(q, mu),
        );
      }),
      runs,
    );
  });
});

describe('edge cases', () => {
  it('NaN in, NaN out', () => {
    for (const f of [poissonPmf, poissonLogPmf, poissonCdf, poissonUpperTail]) {
      expect(f(Number.NaN, 1)).toBeNaN();
      expect(f(1, Number.NaN)).toBeNaN();
      expect(f(1, -1)).toBeNaN();
      expect(f(1, Number.POSITIVE_INFINITY)).toBeNaN();
    }
    expect(poissonQuantile(Number.NaN, 1)).toBeNaN();
    expect(poissonQuantile(0.5, Number.NaN)).toBeNaN();
    expect(poissonQuantile(1.5, 1)).toBeNaN();
    expect(poissonUpperQuantile(-0.1, 1)).toBeNaN();
  });
  it('negative counts have no probability', () => {
    expect(poissonPmf(-1, 3)).toBe(0);
    expect(poissonLogPmf(-1, 3)).toBe(Number.NEGATIVE_INFINITY);
    expect(poissonCdf(-1, 3)).toBe(0);
    expect(poissonUpperTail(-1, 3)).toBe(1);
    expect(poissonUpperTail(0, 3)).toBe(1);
  });
  it('non-integer counts: no mass at them; P(X ≤ 2.5) = P(X ≤ 2) and P(X ≥ 2.5) = P(X ≥ 3)', () => {
    expect(poissonPmf(2.5, 3)).toBe(0);
    expect(poissonCdf(2.5, 3)).toBe(poissonCdf(2, 3));
    expect(poissonUpperTail(2.5, 3)).toBe(poissonUpperTail(3, 3));
  });
  it('a mean of 0 puts all mass at 0', () => {
    expect(poissonPmf(0, 0)).toBe(1);
    expect(poissonPmf(1, 0)).toBe(0);
    expect(poissonCdf(0, 0)).toBe(1);
    expect(poissonUpperTail(1, 0)).toBe(0);
    expect(poissonQuantile(0.999, 0)).toBe(0);
    expect(poissonUpperQuantile(1e-9, 0)).toBe(0);
  });
  it('p = 0 and p = 1, q = 0 and q = 1', () => {
    expect(poissonQuantile(0, 5)).toBe(0);
    expect(poissonQuantile(1, 5)).toBe(Number.POSITIVE_INFINITY);
    expect(poissonUpperQuantile(0, 5)).toBe(Number.POSITIVE_INFINITY);
    expect(poissonUpperQuantile(1, 5)).toBe(0);
  });
  it('infinite counts', () => {
    expect(poissonCdf(Number.POSITIVE_INFINITY, 5)).toBe(1);
    expect(poissonUpperTail(Number.POSITIVE_INFINITY, 5)).toBe(0);
    expect(poissonUpperTail(Number.NEGATIVE_INFINITY, 5)).toBe(1);
  });
  it('counts up to 1e8 at means up to 1e7 stay finite and ordered', () => {
    expect(poissonUpperTail(1e8, 1e7)).toBe(0); // far beyond: underflows to 0, no NaN
    expect(poissonCdf(1e8, 1e7)).toBe(1);
    const near = poissonCdf(1e8, 1e8);
    expect(near).toBeGreaterThan(0.5);
    expect(near).toBeLessThan(0.5001);
    expect(poissonUpperQuantile(0.00135, 1e8)).toBeGreaterThan(1e8);
  });
});
