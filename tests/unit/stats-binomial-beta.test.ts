import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { binomialCdf, binomialPmf, binomialUpperTail } from '../../shared-core/stats/binomial.js';
import { binomialTerm } from '../../shared-core/stats/binomial-term.js';
import {
  inverseRegularizedBeta,
  regularizedBeta,
  regularizedBetaComplement,
  regularizedBetaTails,
} from '../../shared-core/stats/incomplete-beta.js';

const runs = { numRuns: 300, seed: 20261201 };
const relativeError = (actual: number, expected: number): number =>
  Math.abs(actual - expected) / Math.abs(expected);
const shape = fc.double({ min: -0.3, max: 3, noNaN: true }).map((exponent) => 10 ** exponent);
const unit = fc.double({ min: 1e-6, max: 1 - 1e-6, noNaN: true });

describe('incomplete beta: closed forms and identities', () => {
  it('I_x(a, 1) = x^a and I_x(1, b) = 1 − (1 − x)^b', () => {
    fc.assert(
      fc.property(unit, shape, (x, s) => {
        // (x^a below 1e-290 would be compared in the subnormal range, where doubles lose digits.)
        if (x ** s > 1e-290)
          expect(relativeError(regularizedBeta(x, s, 1), x ** s)).toBeLessThan(1e-13 * (1 + s));
        const expected = -Math.expm1(s * Math.log1p(-x));
        expect(relativeError(regularizedBeta(x, 1, s), expected)).toBeLessThan(1e-13 * (1 + s));
      }),
      runs,
    );
  });
  it('I_x(a, b) + I_{1−x}(b, a) = 1 (symmetry), and the two tails add to 1', () => {
    fc.assert(
      fc.property(unit, shape, shape, (x, a, b) => {
        expect(Math.abs(regularizedBeta(x, a, b) + regularizedBeta(1 - x, b, a) - 1)).toBeLessThan(1e-12);
        expect(Math.abs(regularizedBeta(x, a, b) + regularizedBetaComplement(x, a, b) - 1)).toBeLessThan(
          1e-15,
        );
      }),
      runs,
    );
  });
  it('I_{½}(a, a) = ½ (symmetry about the center)', () => {
    for (const a of [0.5, 1, 3.7, 40, 1e4]) expect(regularizedBeta(0.5, a, a)).toBeCloseTo(0.5, 13);
  });
  it('the inverse returns x with I_x(a, b) = p, to its conditioning', () => {
    fc.assert(
      fc.property(shape, shape, fc.double({ min: -20, max: -0.31, noNaN: true }), (a, b, exponent) => {
        const p = 10 ** exponent;
        const x = inverseRegularizedBeta(p, a, b);
        // Conditioning: x·density/I, density from the prefix; the round trip cannot beat that many ulp.
        const { lower } = regularizedBetaTails(x, 1 - x, a, b);
        const kappa = ((a * b) / (a + b)) * (binomialTerm(a, a + b, x, 1 - x) / ((1 - x) * lower));
        expect(relativeError(lower, p)).toBeLessThan(1e-13 + 8 * Number.EPSILON * kappa);
      }),
      runs,
    );
  });
  it('the quantile is always in [0, 1] for valid arguments, including tiny shapes and tails', () => {
    fc.assert(
      fc.property(
        fc.double({ min: -3, max: 6, noNaN: true }).map((exponent) => 10 ** exponent),
        fc.double({ min: -3, max: 6, noNaN: true }).map((exponent) => 10 ** exponent),
        fc.double({ min: -300, max: 0, noNaN: true }).map((exponent) => 10 ** exponent),
        (a, b, p) => {
          const x = inverseRegularizedBeta(p, a, b);
          expect(x).toBeGreaterThanOrEqual(0);
          expect(x).toBeLessThanOrEqual(1);
        },
      ),
      { numRuns: 200, seed: 20261201 },
    );
  });
  it('edge cases', () => {
    expect(regularizedBeta(0, 2, 3)).toBe(0);
    expect(regularizedBeta(1, 2, 3)).toBe(1);
    expect(regularizedBeta(-0.1, 2, 3)).toBeNaN();
    expect(regularizedBeta(0.5, 0, 3)).toBeNaN();
    expect(regularizedBeta(Number.NaN, 2, 3)).toBeNaN();
    expect(inverseRegularizedBeta(0, 2, 3)).toBe(0);
    expect(inverseRegularizedBeta(1, 2, 3)).toBe(1);
    expect(inverseRegularizedBeta(1.1, 2, 3)).toBeNaN();
  });
});

describe('Clopper–Pearson end points in closed form (Clopper & Pearson, Biometrika 26, 1934)', () => {
  it('no successes in n trials: upper = 1 − (α/2)^{1/n}; n of n: lower = (α/2)^{1/n}', () => {
    // 1 − (α/2)^{1/n} is evaluated as −expm1(ln(α/2)/n): the plain form cancels for large n.
    for (const n of [1, 5, 10, 100, 1e4]) {
      expect(
        relativeError(inverseRegularizedBeta(0.975, 1, n), -Math.expm1(Math.log(0.025) / n)),
      ).toBeLessThan(1e-13);
      expect(relativeError(inverseRegularizedBeta(0.025, n, 1), 0.025 ** (1 / n))).toBeLessThan(1e-13);
    }
    // n = 10 gives 0.3085, the value printed in binomial confidence tables (common practice).
    expect(inverseRegularizedBeta(0.975, 1, 10)).toBeCloseTo(0.3085, 4);
  });
});

describe('binomial: published table values (any binomial table; values from memory)', () => {
  it.each([
    [2, 10, 0.3, 0.3828],
    [5, 20, 0.5, 0.0207],
    [1, 5, 0.1, 0.9185],
    [3, 8, 0.25, 0.8862],
  ])('P(X ≤ %d | n = %d, p = %d) = %d', (k, n, p, printed) => {
    expect(Math.abs(binomialCdf(k, n, p) - printed)).toBeLessThanOrEqual(0.00005 + 1e-15);
  });
});

describe('binomial: properties', () => {
  const trials = fc.integer({ min: 1, max: 100000 });
  it('P(X ≤ k) + P(X ≥ k + 1) = 1 and the pmf sums to 1', () => {
    fc.assert(
      fc.property(trials, unit, fc.double({ min: 0, max: 1, noNaN: true }), (n, p, position) => {
        const k = Math.floor(position * n);
        expect(Math.abs(binomialCdf(k, n, p) + binomialUpperTail(k + 1, n, p) - 1)).toBeLessThan(1e-12);
      }),
      runs,
    );
    for (const [n, p] of [
      [30, 0.2],
      [200, 0.5],
      [1000, 0.003],
    ]) {
      let total = 0;
      for (let k = 0; k <= n; k++) total += binomialPmf(k, n, p);
      expect(Math.abs(total - 1)).toBeLessThan(1e-13);
    }
  });
  it('P(X ≤ k) − P(X ≤ k − 1) = P(X = k) where the difference does not cancel', () => {
    fc.assert(
      fc.property(trials, unit, fc.double({ min: 0, max: 1, noNaN: true }), (n, p, position) => {
        const k = Math.floor(position * n);
        const lower = binomialCdf(k, n, p);
        const pmf = binomialPmf(k, n, p);
        if (lower > 0.5 || lower < 1e-290 || pmf < 1e-6 * lower) return;
        expect(Math.abs(lower - binomialCdf(k - 1, n, p) - pmf)).toBeLessThan(1e-12 * lower);
      }),
      runs,
    );
  });
  it('edge cases', () => {
    expect(binomialPmf(2.5, 10, 0.3)).toBe(0);
    expect(binomialPmf(-1, 10, 0.3)).toBe(0);
    expect(binomialPmf(11, 10, 0.3)).toBe(0);
    expect(binomialPmf(0, 10, 0)).toBe(1);
    expect(binomialPmf(10, 10, 1)).toBe(1);
    expect(binomialCdf(-1, 10, 0.3)).toBe(0);
    expect(binomialCdf(10, 10, 0.3)).toBe(1);
    expect(binomialUpperTail(0, 10, 0.3)).toBe(1);
    expect(binomialUpperTail(11, 10, 0.3)).toBe(0);
    expect(binomialCdf(3, 10.5, 0.3)).toBeNaN();
    expect(binomialCdf(3, 10, 1.5)).toBeNaN();
    expect(binomialUpperTail(Number.NaN, 10, 0.3)).toBeNaN();
  });
});
