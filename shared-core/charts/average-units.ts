/**
 * The average number of inspection units k̄, when limits drawn at k̄ are a fair display: every kᵢ
 * within ±25 % of k̄ (common practice). Otherwise null: the limits must be drawn stepped.
 * A period's status always comes from the limits at its own kᵢ.
 */
export function averageUnitsForDisplay(units: readonly number[], tolerance = 0.25): number | null {
  if (units.length === 0) return null;
  const mean = units.reduce((sum, k) => sum + k, 0) / units.length;
  return units.every((k) => Math.abs(k - mean) <= tolerance * mean) ? mean : null;
}
