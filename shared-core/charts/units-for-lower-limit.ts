import type { LimitsMethod } from '../study/analysis-types.js';

/**
 * The number of inspection units per period above which a lower control limit exists.
 *
 *   sigma:        k > L²/ū
 *   probability:  ū·k ≥ ln(2/α)   (then P(X = 0) = e^(−ūk) ≤ α/2, so a count of 0 signals low)
 *   Laney u′:     k > L²·σz²/ū
 *
 * Source: follows from the limit formulas (Montgomery, Introduction to Statistical Quality Control,
 * ch. 7; Laney 2002); ln(2/0.0027) = 6.61 (DESIGN.md).
 *
 * @returns the bound on k and whether it is strict (k must exceed it) or inclusive
 */
export function unitsForLowerLimit(
  method: LimitsMethod,
  rate: number,
  multiplier: number,
  alpha: number,
  sigmaZ: number | null,
): { units: number; strict: boolean } {
  switch (method) {
    case 'sigma':
      return { units: (multiplier * multiplier) / rate, strict: true };
    case 'probability':
      return { units: Math.log(2 / alpha) / rate, strict: false };
    case 'laney': {
      const spread = sigmaZ ?? 1;
      return { units: (multiplier * multiplier * spread * spread) / rate, strict: true };
    }
  }
}
