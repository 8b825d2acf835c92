import { inverseRegularizedGammaP, inverseRegularizedGammaQ } from './incomplete-gamma.js';

export interface MeanInterval {
  lower: number;
  upper: number;
}

/**
 * The exact (Garwood) two-sided confidence interval for the mean μ of a Poisson count, given the
 * observed total x ≥ 0:
 *
 *   lower = ½·χ²(α/2; 2x)        = P⁻¹(x, α/2)          (0 when x = 0)
 *   upper = ½·χ²(1 − α/2; 2x + 2) = Q⁻¹(x + 1, α/2)
 *
 * with α = 1 − confidence. The upper end is found through the upper tail directly, so small α keep
 * their digits. Dividing both ends by the number of inspection units gives the interval for the rate.
 * A negative, infinite or NaN total, or a confidence outside (0, 1), gives NaN ends.
 *
 * Source: F. Garwood, "Fiducial limits for the Poisson distribution", Biometrika 28 (1936).
 */
export function poissonMeanInterval(total: number, confidence = 0.95): MeanInterval {
  if (!(total >= 0) || !Number.isFinite(total) || !(confidence > 0 && confidence < 1)) {
    return { lower: Number.NaN, upper: Number.NaN };
  }
  const halfAlpha = (1 - confidence) / 2;
  return {
    lower: total === 0 ? 0 : inverseRegularizedGammaP(total, halfAlpha),
    upper: inverseRegularizedGammaQ(total + 1, halfAlpha),
  };
}
