import type { RuleId } from '../study/analysis-types.js';
import { ruleCatalog } from './rule-catalog.js';
import type { RuleSeries } from './rule-series.js';

/**
 * Runs the selected rules over the included periods in period order and returns, for each point,
 * the ids of the rules that fire there. A rule fires at every t whose window completes its pattern
 * (a run of 10 fires `run:8` at its 8th, 9th and 10th periods).
 */
export function findSignals(series: RuleSeries, rules: readonly RuleId[]): (readonly RuleId[])[] {
  const definitions = rules.map((id) => ruleCatalog[id]);
  const length = series.z.length;
  const fired = new Array<readonly RuleId[]>(length);
  for (let t = 0; t < length; t++) {
    let here: RuleId[] | undefined;
    for (const rule of definitions) if (rule.firesAt(series, t)) (here ??= []).push(rule.id);
    fired[t] = here ?? noRules;
  }
  return fired;
}

/**
 * The rules of a period where none fired: one shared empty list (frozen, so that it stays empty),
 * because a long history is nearly all such periods and each list would live as long as the result.
 */
export const noRules: readonly RuleId[] = Object.freeze([]);
