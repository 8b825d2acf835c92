import type { Observation } from '../study/analysis-types.js';

export interface ParetoBar {
  category: string;
  count: number;
  /** Share of all categorised nonconformities, 0..1. */
  share: number;
  /** Running share up to and including this bar, 0..1. */
  cumulative: number;
}

/**
 * Categories of nonconformity ordered from the most to the least frequent, with running shares
 * (a Pareto ordering, common practice). Ties keep the order in which categories first appear.
 * `include` picks the periods that count (for example, only those not excluded).
 */
export function paretoOfCategories(
  observations: readonly Observation[],
  include: (index: number) => boolean = () => true,
): ParetoBar[] {
  const totals = new Map<string, number>();
  observations.forEach((observation, index) => {
    if (!observation.categories || !include(index)) return;
    for (const [category, count] of Object.entries(observation.categories)) {
      totals.set(category, (totals.get(category) ?? 0) + count);
    }
  });
  const grand = [...totals.values()].reduce((sum, count) => sum + count, 0);
  const ordered = [...totals.entries()].map(([category, count], order) => ({ category, count, order }));
  ordered.sort((a, b) => b.count - a.count || a.order - b.order);
  let running = 0;
  return ordered.map(({ category, count }) => {
    running += count;
    return {
      category,
      count,
      share: grand > 0 ? count / grand : 0,
      cumulative: grand > 0 ? running / grand : 0,
    };
  });
}
