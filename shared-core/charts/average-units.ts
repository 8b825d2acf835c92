/**
 * The average number of inspection units k̄, when limits drawn at k̄ are a fair display: every kᵢ
 * within ±25 % of k̄ (common practice). Otherwise null: the limits must be drawn stepped.
 * A period's status always comes from the limits at its own kᵢ.
 */
export function averageUnitsForDisplay(units: readonly number[], tolerance = 0.25): number | null {
  if (units.length === 0) return null;
  let sum = 0;
  for (let i = 0; i < units.length; i++) sum += units[i];
  const mean = sum / units.length;
  for (let i = 0; i < units.length; i++) if (!(Math.abs(units[i] - mean) <= tolerance * mean)) return null;
  return mean;
}
