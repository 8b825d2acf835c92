import { describe, expect, it } from 'vitest';
// Independent general-purpose references, used only in tests.
import qpois from '@stdlib/stats-base-dists-poisson-quantile';
import ppois from '@stdlib/stats-base-dists-poisson-cdf';
import pchisq from '@stdlib/stats-base-dists-chisquare-cdf';
import { probabilityLimits } from '../../shared-core/charts/probability-limits.js';
import { pointFalseAlarm } from '../../shared-core/charts/false-alarm.js';
import { dispersionCheck } from '../../shared-core/study/dispersion-check.js';

// @stdlib's Poisson cdf loses accuracy in the lower tail of large means (at μ = 1e4 its
// P(X ≤ 9700) is off by 3e-3 relative, checked against mpmath below), so it is the reference up to
// μ = 1000 and for upper quantiles everywhere; large means are checked against mpmath.
const means = [0.01, 0.1, 0.5, 1, 2.5, 4, 6.61, 10, 19.85, 50, 100, 1000];
const largeMeans = [1e4, 1e5, 1e6];
const alphas = [0.0027, 0.01, 0.05, 0.002];

describe('exact Poisson probability limits against @stdlib (independent reference)', () => {
  it.each(means)(
    'μ = %s: UCL = qpois(1 − α/2, μ) and LCL is the smallest count not signalling low',
    (mean) => {
      for (const alpha of alphas) {
        const limits = probabilityLimits(mean, 1, alpha);
        expect(limits.upper).toBe(qpois(1 - alpha / 2, mean));
        // LCL from the reference cdf: the smallest l with P(X ≤ l) > α/2 (null when that is 0).
        let l = Math.max(0, qpois(alpha / 2, mean) - 2);
        while (ppois(l, mean) <= alpha / 2) l++;
        expect(limits.lower).toBe(l === 0 ? null : l);
      }
    },
  );

  it.each(largeMeans)('μ = %s: UCL = qpois(1 − α/2, μ) from @stdlib', (mean) => {
    for (const alpha of alphas)
      expect(probabilityLimits(mean, 1, alpha).upper).toBe(qpois(1 - alpha / 2, mean));
  });

  // Reference values computed once with mpmath 1.3.0 (40 significant digits; regularized incomplete
  // gamma, P(X ≤ k) = Q(k + 1, μ)) by bisection on the definitions of DESIGN.md.
  it.each([
    [1e4, 0.05, 9804, 10196],
    [1e4, 0.0027, 9701, 10301],
    [1e6, 0.05, 998041, 1001960],
    [1e6, 0.0027, 997001, 1003001],
    [1e6, 0.01, 997425, 1002577],
    [1e6, 0.002, 996911, 1003092],
  ])('μ = %s, α = %s: LCL %s and UCL %s (mpmath reference)', (mean, alpha, lower, upper) => {
    expect(probabilityLimits(mean, 1, alpha)).toEqual({ mean, lower, upper });
  });

  it.each([
    [1e4, 0.002655260768534691],
    [1e6, 0.002695362003723176],
  ])('μ = %s: the point false-alarm probability matches mpmath', (mean, reference) => {
    expect(pointFalseAlarm(probabilityLimits(mean, 1, 0.0027)) / reference).toBeCloseTo(1, 10);
  });

  it('each period signals with probability at most α (exact tails from the reference cdf)', () => {
    for (const mean of means) {
      const limits = probabilityLimits(mean, 1, 0.0027);
      const reference =
        1 - ppois(limits.upper, mean) + (limits.lower === null ? 0 : ppois(limits.lower - 1, mean));
      expect(pointFalseAlarm(limits)).toBeCloseTo(reference, 9);
      expect(pointFalseAlarm(limits)).toBeLessThanOrEqual(0.0027);
    }
  });
});

describe('dispersion check against an independent computation (sample variance, @stdlib χ²)', () => {
  it('D = Σ(x − c̄)²/c̄ = (m − 1)s²/c̄ for equal k, referred to χ² on m − 1 df', () => {
    // The counts of Montgomery's printed circuit board example (Introduction to Statistical
    // Quality Control), used here only as realistic input; the reference is the identity above.
    const counts = [
      21, 24, 16, 12, 15, 5, 28, 20, 31, 25, 20, 24, 16, 19, 10, 17, 13, 22, 18, 39, 30, 24, 16, 19, 17, 15,
    ];
    const mean = counts.reduce((a, b) => a + b, 0) / counts.length;
    const variance = counts.reduce((a, x) => a + (x - mean) ** 2, 0) / (counts.length - 1);
    const check = dispersionCheck(
      counts,
      counts.map(() => 1),
      mean,
      false,
    );
    const expected = ((counts.length - 1) * variance) / mean;
    expect(check.statistic).toBeCloseTo(expected, 10);
    expect(check.df).toBe(25);
    expect(check.pUnder).toBeCloseTo(pchisq(expected, 25), 10);
    expect(check.pOver).toBeCloseTo(1 - pchisq(expected, 25), 10);
  });
});
