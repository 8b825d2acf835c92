import { signalsHigh, signalsLow } from '../charts/count-limits.js';
import { standardizedValue } from '../charts/standardized-value.js';
import { findSignals } from '../rules/find-signals.js';
import type { AnalysisResult, Observation, PeriodResult, RuleId } from '../study/analysis-types.js';
import { limitsAtUnits } from './average-run-length.js';

/**
 * New periods judged against frozen limits: each period's limits at its own kᵢ from the approved
 * rate, method, multiplier, α and σz, with no recomputation; z from the approved rate (and σz); the
 * selected rules over the new periods in order, starting afresh with the first new period.
 *
 * The result has the period shape of the analyze contract (status `in` or `signal`).
 */
export function checkNewPeriods(
  approved: AnalysisResult,
  observations: readonly Observation[],
  rules: readonly RuleId[],
): PeriodResult[] {
  const limits = observations.map((o) => limitsAtUnits(approved, o.units).limits);
  const z = observations.map((o) =>
    standardizedValue(o.count / o.units, approved.rate, o.units, approved.sigmaZ ?? 1),
  );
  const fired = findSignals(
    {
      z,
      beyond: observations.map((o, i) => signalsHigh(o.count, limits[i]) || signalsLow(o.count, limits[i])),
    },
    rules,
  );
  return observations.map((o, i) => {
    const scale = approved.chart === 'c' ? 1 : 1 / o.units;
    const lower = limits[i].lower;
    const period: PeriodResult = {
      index: i,
      label: o.label,
      row: o.row,
      count: o.count,
      units: o.units,
      rate: o.count / o.units,
      center: limits[i].mean * scale,
      lcl: lower === null ? null : lower * scale,
      ucl: limits[i].upper * scale,
      z: z[i],
      status: fired[i].length > 0 ? 'signal' : 'in',
      rules: fired[i],
    };
    if (o.rows) period.rows = o.rows;
    return period;
  });
}
