import { chiSquareCdf, chiSquareSurvival } from '../stats/chi-square.js';
import type { Dispersion } from './analysis-types.js';

/**
 * Poisson dispersion test over the included periods.
 *
 *   D = Σ (xᵢ − kᵢū)² / (kᵢū)   against χ² with m − 1 degrees of freedom (ū estimated) or m (ū known)
 *
 * Both tails are reported: a small P(χ² ≥ D) means over-dispersion (Poisson limits too tight), a
 * small P(χ² ≤ D) under-dispersion. The χ² approximation is poor when many expected counts kᵢū are
 * below 5 (Cochran 1954: no more than 20 % of them).
 *
 * Source: the Poisson index-of-dispersion test, Fisher (1950), "The significance of deviations from
 * expectation in a Poisson series", Biometrics 6(1); Cochran (1954), "Some methods for strengthening
 * the common χ² tests", Biometrics 10(4) (both cited from memory).
 */
export function dispersionCheck(
  counts: readonly number[],
  units: readonly number[],
  rate: number,
  rateKnown: boolean,
  level = 0.01,
): Dispersion {
  let statistic = 0;
  let smallExpected = 0;
  for (let i = 0; i < counts.length; i++) {
    const expected = units[i] * rate;
    statistic += (counts[i] - expected) ** 2 / expected;
    if (expected < 5) smallExpected++;
  }
  const df = rateKnown ? counts.length : counts.length - 1;
  const pOver = df > 0 ? chiSquareSurvival(statistic, df) : 1;
  const pUnder = df > 0 ? chiSquareCdf(statistic, df) : 1;
  return { statistic, df, pOver, pUnder, smallExpected, advice: dispersionAdvice(pOver, pUnder, level) };
}

function dispersionAdvice(pOver: number, pUnder: number, level: number): string {
  if (pOver < level)
    return (
      'The counts vary more than a Poisson process would (over-dispersed): Poisson limits will be too ' +
      'tight and signal too often. Look for assignable causes first; if the extra variation is part ' +
      'of the process, consider Laney u′ limits.'
    );
  if (pUnder < level)
    return (
      'The counts vary less than a Poisson process would (under-dispersed): limits may be too wide. ' +
      'Check that the data are independent counts (not capped, averaged, or adjusted).'
    );
  return 'The variation between periods is consistent with a Poisson process.';
}
