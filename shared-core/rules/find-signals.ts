import type { RuleId } from '../study/analysis-types.js';
import { ruleCatalog } from './rule-catalog.js';
import type { RulePoint } from './rule-point.js';

/**
 * Runs the selected rules over the included periods in period order and returns, for each point,
 * the ids of the rules that fire there. A rule fires at every t whose window completes its pattern
 * (a run of 10 fires `run:8` at its 8th, 9th and 10th periods).
 */
export function findSignals(points: readonly RulePoint[], rules: readonly RuleId[]): RuleId[][] {
  const definitions = rules.map((id) => ruleCatalog[id]);
  return points.map((_, t) => {
    const fired: RuleId[] = [];
    for (const rule of definitions) if (rule.firesAt(points, t)) fired.push(rule.id);
    return fired;
  });
}
