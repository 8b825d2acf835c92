import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  chiSquareCdf,
  chiSquareQuantile,
  chiSquareSurvival,
  chiSquareUpperQuantile,
} from '../../shared-core/stats/chi-square.js';
import { deviance } from '../../shared-core/stats/deviance.js';
import {
  inverseRegularizedGammaP,
  inverseRegularizedGammaQ,
  regularizedGammaP,
  regularizedGammaQ,
} from '../../shared-core/stats/incomplete-gamma.js';
import { logGamma } from '../../shared-core/stats/log-gamma.js';
import { normalCdf, normalQuantile, normalSurvival } from '../../shared-core/stats/normal.js';
import { poissonMeanInterval } from '../../shared-core/stats/poisson-mean-interval.js';
import { stirlingError } from '../../shared-core/stats/stirling-error.js';

const runs = { numRuns: 300, seed: 20261201 };
const relativeError = (actual: number, expected: number): number =>
  Math.abs(actual - expected) / Math.abs(expected);

/** ln(n!) from the exact BigInt factorial: ln(leading 17 digits) + (remaining digits)·ln 10. */
function exactLogFactorial(n: number): number {
  let factorial = 1n;
  for (let i = 2n; i <= BigInt(n); i++) factorial *= i;
  const digits = factorial.toString();
  if (digits.length <= 17) return Math.log(Number(digits));
  return Math.log(Number(`${digits.slice(0, 17)}`)) + (digits.length - 17) * Math.LN10;
}

describe('log-gamma and Stirling error: exact values and identities', () => {
  it('lnΓ(n) = ln((n − 1)!) from exact integer arithmetic, n up to 1001 (relative 2e-15)', () => {
    for (const n of [3, 5, 8, 10, 11, 12, 16, 20, 31, 50, 100, 171, 172, 500, 1001]) {
      expect(relativeError(logGamma(n), exactLogFactorial(n - 1))).toBeLessThan(2e-15);
    }
  });
  it('lnΓ(½) = ln √π, lnΓ(1) = lnΓ(2) = 0 exactly (closed forms)', () => {
    expect(logGamma(0.5)).toBeCloseTo(0.5 * Math.log(Math.PI), 15);
    expect(logGamma(1)).toBe(0);
    expect(logGamma(2)).toBe(0);
  });
  it('lnΓ(x + 1) = lnΓ(x) + ln x (the recurrence), across the switch at 10', () => {
    fc.assert(
      fc.property(fc.double({ min: 0.01, max: 1e6, noNaN: true }), (x) => {
        const difference = logGamma(x + 1) - logGamma(x) - Math.log(x);
        expect(Math.abs(difference)).toBeLessThan(4e-15 * Math.max(1, Math.abs(logGamma(x + 1))));
      }),
      runs,
    );
  });
  it('δ(1) = 1 − ln√(2π) and δ(½) = ½ − ½·ln 2 (closed forms from Γ(2) = 1, Γ(3/2) = √π/2)', () => {
    expect(stirlingError(1)).toBeCloseTo(1 - 0.5 * Math.log(2 * Math.PI), 15);
    expect(stirlingError(0.5)).toBeCloseTo(0.5 - 0.5 * Math.LN2, 15);
  });
  it('δ(n) matches 40-digit mpmath values of lnΓ(n + 1) − (n + ½)·ln n + n − ln√(2π) to 4 ulp', () => {
    // Generated with mpmath 1.3 (Python): mp.loggamma(N + 1) − (N + 1/2)·mp.log(N) + N − mp.log(mp.sqrt(2π)),
    // N the double nearest n, at mp.dps = 40.
    const table: [string, string][] = [
      ['0.5', '0.15342640972002734529'],
      ['0.75', '0.10626293633956786156'],
      ['1', '0.08106146679532725822'],
      ['1.5', '0.054814121051917653896'],
      ['2', '0.041340695955409294094'],
      ['2.7', '0.030728119827808329551'],
      ['3', '0.027677925684998339149'],
      ['5', '0.016644691189821192163'],
      ['7.25', '0.011487002684428696791'],
      ['9', '0.0092554621827127329177'],
      ['9.99', '0.008338896797734330091'],
      ['10', '0.0083305634333628712565'],
      ['12.5', '0.0066652470327076824424'],
      ['15', '0.005554733551962801371'],
      ['100', '0.00083333055563491468338'],
      ['1e4', '8.3333333305555555635e-6'],
    ];
    for (const [n, expected] of table)
      expect(Math.abs(stirlingError(Number(n)) - Number(expected))).toBeLessThan(
        4 * Number.EPSILON * Number(expected),
      );
  });
  it('δ(n) − δ(n + 1) = Σ_{j≥1} t^{2j}/(2j + 1), t = 1/(2n + 1), for n ≥ 10 where the series is used', () => {
    // The identity follows from Γ(n + 2) = (n + 1)·Γ(n + 1). (Below 10 the implementation uses it, so
    // checking it there would prove nothing; the mpmath table above covers that range.)
    fc.assert(
      fc.property(fc.double({ min: 10, max: 1e6, noNaN: true }), (n) => {
        const t2 = 1 / (2 * n + 1) ** 2;
        let series = 0;
        let power = 1;
        for (let j = 1; j < 60; j++) series += (power *= t2) / (2 * j + 1);
        const difference = stirlingError(n) - stirlingError(n + 1);
        // Two numbers near 1/(12n) are subtracted: a few ulp of δ(n), plus the omitted series term.
        expect(Math.abs(difference - series)).toBeLessThan(
          8 * Number.EPSILON * stirlingError(n) + 0.18 / n ** 17,
        );
      }),
      runs,
    );
  });
  it('edge cases: NaN and x ≤ 0 give NaN; lnΓ(∞) = ∞', () => {
    expect(logGamma(Number.NaN)).toBeNaN();
    expect(logGamma(0)).toBeNaN();
    expect(logGamma(-1.5)).toBeNaN();
    expect(logGamma(Number.POSITIVE_INFINITY)).toBe(Number.POSITIVE_INFINITY);
    expect(stirlingError(0)).toBeNaN();
  });
});

describe('deviance term bd0', () => {
  it('matches m·Σ_{j≥2} (−e)^j/(j(j − 1)), e = (x − m)/m, where x is close to m', () => {
    // (1 + e)·ln(1 + e) − e = Σ_{j≥2} (−1)^j e^j/(j(j − 1)): Taylor series, an independent form.
    fc.assert(
      fc.property(
        fc.double({ min: -6, max: 8, noNaN: true }),
        fc.double({ min: -0.15, max: 0.15, noNaN: true }),
        (exponent, e) => {
          const m = 10 ** exponent;
          const x = m * (1 + e);
          const eExact = (x - m) / m;
          let series = 0;
          let power = -eExact;
          for (let j = 2; j < 80; j++) {
            power *= -eExact;
            series += power / (j * (j - 1));
          }
          const expected = m * series;
          if (expected === 0) return;
          expect(relativeError(deviance(x, m), expected)).toBeLessThan(1e-13);
        },
      ),
      runs,
    );
  });
  it('is the direct formula where x and m are far apart, 0 at x = m, m at x = 0', () => {
    expect(relativeError(deviance(50, 10), 50 * Math.log(5) - 40)).toBeLessThan(1e-15);
    expect(deviance(7, 7)).toBe(0);
    expect(deviance(0, 3.5)).toBe(3.5);
    expect(deviance(-1, 3)).toBeNaN();
  });
});

describe('incomplete gamma: identities and inverses', () => {
  it('P(1, x) = 1 − e^{−x} and Q(1, x) = e^{−x} (closed forms)', () => {
    // A result e^{−y} computed through its exponent carries a relative error of about y ulp.
    const tolerance = (expected: number) => 4 * Number.EPSILON * (1 + Math.abs(Math.log(expected)));
    for (const x of [1e-10, 0.1, 1, 2, 10, 100, 700]) {
      const lower = -Math.expm1(-x);
      const upper = Math.exp(-x);
      expect(relativeError(regularizedGammaP(1, x), lower)).toBeLessThan(tolerance(lower));
      expect(relativeError(regularizedGammaQ(1, x), upper)).toBeLessThan(tolerance(upper));
    }
  });
  it('P(a + 1, x) = P(a, x) − x^a e^{−x}/Γ(a + 1) (recurrence, A&S 6.5.21)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0.5, max: 200, noNaN: true }),
        fc.double({ min: 0.05, max: 3, noNaN: true }),
        (a, r) => {
          const x = a * r;
          const term = Math.exp(a * Math.log(x) - x - logGamma(a + 1));
          const lhs = regularizedGammaP(a + 1, x);
          const rhs = regularizedGammaP(a, x) - term;
          if (lhs < 1e-3) return; // the right side cancels there
          expect(Math.abs(lhs - rhs)).toBeLessThan(1e-12);
        },
      ),
      runs,
    );
  });
  it('the inverses return x with P(a, x) = p and Q(a, x) = q, for a from 0.5 to 1e8', () => {
    // Even the correctly rounded x moves the tail T by a relative κ·ulp, κ = x·density/T (about √a near
    // the center): the round trip can be no better than that, plus the tail's own ~1e-13 at large a.
    const tolerance = (a: number, x: number, t: number) =>
      1e-13 + 4 * Number.EPSILON * ((a * Math.exp(a * Math.log(x) - x - logGamma(a + 1))) / t);
    fc.assert(
      fc.property(
        fc.double({ min: -0.3, max: 8, noNaN: true }).map((exponent) => 10 ** exponent),
        fc.double({ min: -30, max: -0.31, noNaN: true }).map((exponent) => 10 ** exponent),
        (a, t) => {
          const lower = inverseRegularizedGammaP(a, t);
          const upper = inverseRegularizedGammaQ(a, t);
          expect(relativeError(regularizedGammaP(a, lower), t)).toBeLessThan(tolerance(a, lower, t));
          expect(relativeError(regularizedGammaQ(a, upper), t)).toBeLessThan(tolerance(a, upper, t));
        },
      ),
      { numRuns: 150, seed: 20261201 },
    );
  });
  it('never gives NaN for valid arguments, even where the root underflows (tiny a, tiny p)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: -6, max: 9, noNaN: true }).map((exponent) => 10 ** exponent),
        fc.double({ min: -300, max: 0, noNaN: true }).map((exponent) => 10 ** exponent),
        (a, t) => {
          const lower = inverseRegularizedGammaP(a, t);
          const upper = inverseRegularizedGammaQ(a, t);
          expect(lower).toBeGreaterThanOrEqual(0);
          expect(upper).toBeGreaterThanOrEqual(0);
          expect(chiSquareQuantile(t, 2 * a)).toBeGreaterThanOrEqual(0);
        },
      ),
      { numRuns: 200, seed: 20261201 },
    );
    // P(0.01, x) = 1e-17 needs x ≈ (1e-17·Γ(1.01))^{100} ≈ e^{−3900}: below the smallest double, so 0.
    expect(inverseRegularizedGammaP(0.01, 1e-17)).toBe(0);
  });
  it('edge cases', () => {
    expect(regularizedGammaP(2, 0)).toBe(0);
    expect(regularizedGammaQ(2, 0)).toBe(1);
    expect(regularizedGammaP(2, Number.POSITIVE_INFINITY)).toBe(1);
    expect(regularizedGammaQ(0, 1)).toBeNaN();
    expect(regularizedGammaP(1, -1)).toBeNaN();
    expect(inverseRegularizedGammaP(3, 0)).toBe(0);
    expect(inverseRegularizedGammaP(3, 1)).toBe(Number.POSITIVE_INFINITY);
    expect(inverseRegularizedGammaQ(3, 0)).toBe(Number.POSITIVE_INFINITY);
    expect(inverseRegularizedGammaQ(3, 1)).toBe(0);
    expect(inverseRegularizedGammaP(3, 1.2)).toBeNaN();
  });
});

describe('normal and chi-square: symmetry, round trips, edge cases', () => {
  it('Φ(z) + Φ(−z) = 1, and Φ(Φ⁻¹(p)) = p far into the tail', () => {
    fc.assert(
      fc.property(fc.double({ min: -8, max: 8, noNaN: true }), (z) => {
        expect(Math.abs(normalCdf(z) + normalSurvival(z) - 1)).toBeLessThan(2e-16 * 4);
      }),
      runs,
    );
    fc.assert(
      fc.property(fc.double({ min: -300, max: -0.302, noNaN: true }), (exponent) => {
        const p = 10 ** exponent;
        // Conditioning: a one-ulp change in x moves Φ by a relative x·φ(x)/Φ(x) ≈ 1 + x² ulp.
        const x = normalQuantile(p);
        expect(relativeError(normalCdf(x), p)).toBeLessThan(4 * Number.EPSILON * (2 + x * x));
      }),
      runs,
    );
  });
  it('χ² with 1 df is the square of a normal: F(z²; 1) = 1 − 2Φ(−|z|)', () => {
    for (const z of [0.1, 0.5, 1, 1.96, 3, 5, 10]) {
      expect(relativeError(chiSquareSurvival(z * z, 1), 2 * normalCdf(-z))).toBeLessThan(1e-14);
    }
  });
  it('χ² with 2 df is exponential: F(x; 2) = 1 − e^{−x/2}', () => {
    for (const x of [0.01, 1, 5.991, 20, 100]) {
      expect(relativeError(chiSquareCdf(x, 2), -Math.expm1(-x / 2))).toBeLessThan(1e-14);
      expect(relativeError(chiSquareUpperQuantile(Math.exp(-x / 2), 2), x)).toBeLessThan(1e-13);
    }
  });
  it('edge cases', () => {
    expect(normalCdf(Number.NaN)).toBeNaN();
    expect(normalCdf(Number.NEGATIVE_INFINITY)).toBe(0);
    expect(normalCdf(Number.POSITIVE_INFINITY)).toBe(1);
    expect(normalQuantile(0)).toBe(Number.NEGATIVE_INFINITY);
    expect(normalQuantile(1)).toBe(Number.POSITIVE_INFINITY);
    expect(normalQuantile(0.5)).toBe(0);
    expect(normalQuantile(-0.1)).toBeNaN();
    expect(chiSquareCdf(-1, 3)).toBe(0);
    expect(chiSquareSurvival(0, 3)).toBe(1);
    expect(chiSquareCdf(1, 0)).toBeNaN();
    expect(chiSquareQuantile(0, 4)).toBe(0);
    expect(chiSquareQuantile(1, 4)).toBe(Number.POSITIVE_INFINITY);
  });
});

describe('Garwood interval: coverage facts and edge cases', () => {
  it('each end leaves α/2 in its tail: P(X ≥ x | lower) = α/2 and P(X ≤ x | upper) = α/2', () => {
    for (const total of [1, 3, 17, 250, 1e4, 1e7]) {
      for (const confidence of [0.9, 0.95, 0.99]) {
        const { lower, upper } = poissonMeanInterval(total, confidence);
        const halfAlpha = (1 - confidence) / 2;
        // At a total of 1e7 the incomplete gamma sums ~3·10⁴ terms: 1e-11.
        const tolerance = total > 1e4 ? 1e-11 : 1e-12;
        expect(relativeError(regularizedGammaP(total, lower), halfAlpha)).toBeLessThan(tolerance);
        expect(relativeError(regularizedGammaQ(total + 1, upper), halfAlpha)).toBeLessThan(tolerance);
        expect(lower).toBeLessThan(total);
        expect(upper).toBeGreaterThan(total);
      }
    }
  });
  it('rejects what is not a total or a confidence', () => {
    expect(poissonMeanInterval(-1).lower).toBeNaN();
    expect(poissonMeanInterval(Number.NaN).upper).toBeNaN();
    expect(poissonMeanInterval(5, 1).upper).toBeNaN();
    expect(poissonMeanInterval(5, 0).upper).toBeNaN();
  });
});
