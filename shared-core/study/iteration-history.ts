import { fail, ok, type Result } from '../result.js';
import type { AnalysisOptions, AnalysisResult, Exclusion, Iteration, Observation } from './analysis-types.js';
import { analyzePhaseOne } from './phase-one.js';

/** What one recompute looked like: the excluded set, the center, the limits at k̄ and the signals. */
export function iterationSnapshot(result: AnalysisResult): Iteration {
  const included = result.periods.filter((p) => p.status !== 'excluded');
  const meanUnits = result.totals.units / result.m;
  // Limits at k̄: the average-k limits where they are a fair display, else the nearest period's.
  const nearest = included.reduce((best, p) =>
    Math.abs(p.units - meanUnits) < Math.abs(best.units - meanUnits) ? p : best,
  );
  const atMean = result.averageK ?? { lcl: nearest.lcl, ucl: nearest.ucl };
  return {
    excluded: result.periods.filter((p) => p.status === 'excluded').map((p) => p.label),
    center: result.center,
    lcl: atMean.lcl,
    ucl: atMean.ucl,
    signals: result.periods.filter((p) => p.status === 'signal').map((p) => p.label),
  };
}

/**
 * The Phase I iterations: each step is the set of exclusions in force after one recompute (the
 * first usually empty), analysed in turn.
 */
export function iterationHistory(
  observations: readonly Observation[],
  steps: readonly (readonly Exclusion[])[],
  options: AnalysisOptions,
): Result<Iteration[]> {
  const history: Iteration[] = [];
  for (const exclusions of steps) {
    const result = analyzePhaseOne(observations, exclusions, options);
    if (!result.ok) return fail(...result.findings);
    history.push(iterationSnapshot(result.value));
  }
  return ok(history);
}
