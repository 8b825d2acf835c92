import type { RuleId } from '../study/analysis-types.js';
import { ruleCatalog } from './rule-catalog.js';
import type { RuleSeries } from './rule-series.js';

/**
 * Runs the selected rules over the included periods in period order and returns, for each point,
 * the ids of the rules that fire there. A rule fires at every t whose window completes its pattern
 * (a run of 10 fires `run:8` at its 8th, 9th and 10th periods).
 */
export function findSignals(series: RuleSeries, rules: readonly RuleId[]): (readonly RuleId[])[] {
  const length = series.z.length;
  const fired = new Array<readonly RuleId[]>(length).fill(noRules);
  // Rule by rule over the whole series (one rule's test in each tight loop), each id added in the
  // order of the selection.
  for (const id of rules) {
    const firesAt = ruleCatalog[id].firesAt;
    for (let t = 0; t < length; t++) {
      if (!firesAt(series, t)) continue;
      fired[t] = fired[t] === noRules ? [id] : [...fired[t], id];
    }
  }
  return fired;
}

/**
 * The rules of a period where none fired: one shared empty list (frozen, so that it stays empty),
 * because a long history is nearly all such periods and each list would live as long as the result.
 */
export const noRules: readonly RuleId[] = Object.freeze([]);
