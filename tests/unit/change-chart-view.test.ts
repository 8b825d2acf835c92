import { describe, expect, it } from 'vitest';
import { analyzePhaseOne } from '../../shared-core/study/phase-one.js';
import { defaultOptions, type Observation } from '../../shared-core/study/analysis-types.js';
import { beforeAfterSeries, beforeAfterSvg } from '../../shared-core/view/change-chart.js';

// Invented periods (not a published example): an imaginary coil line before and after a change.
const periods = (prefix: string, counts: number[], units: (i: number) => number): Observation[] =>
  counts.map((count, i) => ({ label: `${prefix}${i + 1}`, row: i + 2, count, units: units(i) }));

function analyze(observations: Observation[], chart?: 'c' | 'u') {
  const result = analyzePhaseOne(observations, [], { ...defaultOptions, ...(chart ? { chart } : {}) });
  if (!result.ok) throw new Error(result.findings[0].message);
  return result.value;
}

describe('the before/after chart of a limit change', () => {
  it('plots counts when both halves are c charts at the same k, each on its own limits', () => {
    const before = analyze(periods('A', [12, 9, 11, 14, 10, 8, 13, 11], () => 20));
    const after = analyze(periods('B', [6, 5, 7, 4, 6, 8, 5, 6], () => 20));
    const chart = beforeAfterSeries(before, after);
    expect(chart.series.scale).toBe('count');
    expect(chart.approvedCount).toBe(8);
    expect(chart.labels.slice(7, 9)).toEqual(['A8', 'B1']);
    // c chart: center = mean count; UCL = c̄ + 3√c̄ (Montgomery, ch. 7).
    const cBefore = 88 / 8;
    const cAfter = 47 / 8;
    expect(chart.series.center[0].y).toBeCloseTo(cBefore, 10);
    expect(chart.series.center.at(-1)!.y).toBeCloseTo(cAfter, 10);
    expect(chart.series.upper.at(-1)!.y).toBeCloseTo(cAfter + 3 * Math.sqrt(cAfter), 10);
  });

  it('puts both halves on the rate scale when the numbers of units differ', () => {
    const before = analyze(
      periods('A', [12, 9, 11, 14], () => 20),
      'c',
    );
    const after = analyze(
      periods('B', [6, 5, 9, 4], (i) => 15 + i),
      'u',
    );
    const chart = beforeAfterSeries(before, after);
    expect(chart.series.scale).toBe('rate');
    // The c chart's center of 11.5 counts at k = 20 is a rate of 0.575 per unit.
    expect(chart.series.center[0].y).toBeCloseTo(11.5 / 20, 10);
    expect(chart.series.points[0].y).toBeCloseTo(12 / 20, 10);
    expect(chart.series.center.at(-1)!.y).toBeCloseTo(24 / 66, 10);
  });

  it('draws the divider between the last approved and the first proposed period', () => {
    const before = analyze(periods('A', [12, 9, 11, 14, 10, 8], () => 20));
    const after = analyze(periods('B', [6, 5, 7, 4], () => 20));
    const svg = beforeAfterSvg(beforeAfterSeries(before, after), { title: '', yTitle: 'count' });
    const dots = [...svg.matchAll(/<circle cx="([\d.]+)"/g)].map((m) => Number(m[1]));
    const divider = Number(/data-divider="true" x1="([\d.]+)"/.exec(svg)![1]);
    expect(dots).toHaveLength(10);
    expect(divider).toBeGreaterThan(dots[5]);
    expect(divider).toBeLessThan(dots[6]);
    expect((dots[5] + dots[6]) / 2).toBeCloseTo(divider, 6);
    expect(svg).toContain('approved limits');
    expect(svg).toContain('proposed limits');
  });
});
