import { fail, ok, type Result } from '../result.js';
import type {
  AnalysisOptions,
  AnalysisResult,
  Exclusion,
  Iteration,
  Observation,
  PeriodResult,
} from './analysis-types.js';
import { analyzePhaseOne } from './phase-one.js';

/** What one recompute looked like: the excluded set, the center, the limits at k̄ and the signals. */
export function iterationSnapshot(result: AnalysisResult): Iteration {
  const meanUnits = result.totals.units / result.m;
  const excluded: string[] = [];
  const signals: string[] = [];
  // Limits at k̄: the average-k limits where they are a fair display, else the nearest included
  // period's (the first of equals).
  let nearest: PeriodResult | undefined;
  for (const p of result.periods) {
    if (p.status === 'excluded') {
      excluded.push(p.label);
      continue;
    }
    if (p.status === 'signal') signals.push(p.label);
    if (nearest === undefined || Math.abs(p.units - meanUnits) < Math.abs(nearest.units - meanUnits))
      nearest = p;
  }
  const atMean = result.averageK ?? { lcl: nearest?.lcl ?? null, ucl: nearest?.ucl ?? Number.NaN };
  return { excluded, center: result.center, lcl: atMean.lcl, ucl: atMean.ucl, signals };
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
