/**
 * The standardized value of a period: how many Poisson standard errors its rate lies from the center.
 *
 *   zᵢ = (uᵢ − ū) / √(ū/kᵢ)     (divided by σz for Laney u′)
 *
 * Source: Montgomery, Introduction to Statistical Quality Control, ch. 7 (standardized u chart);
 * Laney (2002), Quality Engineering 14(4).
 */
export function standardizedValue(rate: number, center: number, units: number, sigmaZ = 1): number {
  return (rate - center) / Math.sqrt(center / units) / sigmaZ;
}
