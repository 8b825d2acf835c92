import type { AnalysisResult } from './analysis-types.js';

/** The limits for one number of inspection units k, on the plotted scale; lcl null means none. */
export interface LimitsRow {
  units: number;
  lcl: number | null;
  ucl: number;
}

/**
 * Each k that occurs among the periods, with its limits: what another system needs to chart new
 * periods against the approved limits. Taken from the periods' own limits, so it is exactly what
 * the chart and the data table show.
 */
export function limitsTable(result: AnalysisResult): LimitsRow[] {
  const byUnits = new Map<number, LimitsRow>();
  for (const period of result.periods) {
    if (!byUnits.has(period.units))
      byUnits.set(period.units, { units: period.units, lcl: period.lcl, ucl: period.ucl });
  }
  return [...byUnits.values()].sort((a, b) => a.units - b.units);
}
