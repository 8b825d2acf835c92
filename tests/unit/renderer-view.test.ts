import { describe, expect, it } from 'vitest';
import { analyzePhaseOne } from '../../shared-core/study/phase-one.js';
import {
  defaultOptions,
  type AnalysisResult,
  type Observation,
} from '../../shared-core/study/analysis-types.js';
import { chartSeries, steppedLine } from '../../shared-core/view/chart-series.js';
import { chartSvg } from '../../shared-core/view/chart-svg.js';
import { paretoOfCategories } from '../../shared-core/view/pareto.js';
import { allRuleIds, ruleInWords, ruleName } from '../../shared-core/view/rules-in-words.js';
import { formatNumber, formatDate } from '../../shared-core/view/number-format.js';
import { warningGuide } from '../../shared-core/view/warning-guide.js';
import { thinForDisplay } from '../../shared-core/view/thin-for-display.js';

// Invented periods for display checks (not a published example): k varies, so the limits step.
const varying: Observation[] = [2, 6, 5, 2, 6, 5, 4, 6].map((units, i) => ({
  label: `P${i + 1}`,
  row: i + 2,
  count: [7, 12, 9, 30, 10, 8, 6, 13][i],
  units,
}));

function analyzed(observations: Observation[], options = {}): AnalysisResult {
  const result = analyzePhaseOne(observations, [], { ...defaultOptions, ...options });
  if (!result.ok) throw new Error(result.findings.map((f) => f.message).join('; '));
  return result.value;
}

describe('steppedLine', () => {
  it('holds each value across its period and joins runs of equal values', () => {
    expect(steppedLine([2, 2, 3, null, null, 3])).toEqual([
      { x: 0.5, y: 2 },
      { x: 2.5, y: 2 },
      { x: 2.5, y: 3 },
      { x: 3.5, y: 3 },
      { x: 3.5, y: null },
      { x: 5.5, y: null },
      { x: 5.5, y: 3 },
      { x: 6.5, y: 3 },
    ]);
  });

  it('draws a constant limit as one segment however many periods there are', () => {
    expect(steppedLine(Array(5000).fill(1.5))).toEqual([
      { x: 0.5, y: 1.5 },
      { x: 5000.5, y: 1.5 },
    ]);
  });
});

describe('chartSeries', () => {
  it('plots rates on a u chart with limits that step with k and keep each status', () => {
    const result = analyzed(varying, { chart: 'u' });
    const series = chartSeries(result);
    expect(series.scale).toBe('rate');
    expect(series.points.map((p) => p.y)).toEqual(varying.map((o) => o.count / o.units));
    expect(series.points.map((p) => p.status)).toEqual(result.periods.map((p) => p.status));
    // k changes at every period here, so every period has its own step.
    expect(series.upper).toHaveLength(2 * varying.length);
    expect(series.upper[0].y).toBe(result.periods[0].ucl);
  });

  it('breaks the lower line where a period has no LCL, never drawing it at 0', () => {
    const result = analyzed(varying, { chart: 'u' });
    const lower = chartSeries(result).lower;
    // Every k differs from its neighbour's here, so each period has its own pair of vertices.
    expect(lower).toHaveLength(2 * result.periods.length);
    result.periods.forEach((p, i) => expect([lower[2 * i].y, lower[2 * i + 1].y]).toEqual([p.lcl, p.lcl]));
    expect(result.periods.some((p) => p.lcl === null)).toBe(true);
    expect(result.periods.some((p) => p.lcl !== null)).toBe(true);
    expect(lower.some((v) => v.y === 0)).toBe(false);
  });

  it('standardizes sigma limits to exactly ±L (ū ± L·√(ū/k) minus ū over √(ū/k); Montgomery ch. 7 u chart)', () => {
    const result = analyzed(varying, { chart: 'u', multiplier: 2.5 });
    const series = chartSeries(result, { standardized: true });
    expect(series.scale).toBe('standardized');
    for (const v of series.upper) expect(v.y).toBeCloseTo(2.5, 12);
    for (const v of series.lower) if (v.y !== null) expect(v.y).toBeCloseTo(-2.5, 12);
    expect(series.points.map((p) => p.y)).toEqual(result.periods.map((p) => p.z));
  });

  it('standardizes Laney limits to ±L, since z is already divided by σz (Laney 2002)', () => {
    const result = analyzed(varying, { chart: 'u', limits: 'laney' });
    const series = chartSeries(result, { standardized: true });
    for (const v of series.upper) expect(v.y).toBeCloseTo(3, 10);
  });

  it('plots counts on a c chart against c̄ ± 3√c̄ (Montgomery ch. 7 c chart)', () => {
    const equal = varying.map((o) => ({ ...o, units: 5 }));
    const result = analyzed(equal);
    expect(result.chart).toBe('c');
    const series = chartSeries(result);
    const cBar = equal.reduce((s, o) => s + o.count, 0) / equal.length;
    expect(series.scale).toBe('count');
    expect(series.center).toEqual([
      { x: 0.5, y: result.center },
      { x: equal.length + 0.5, y: result.center },
    ]);
    expect(result.center).toBeCloseTo(cBar, 12);
    expect(series.upper[0].y).toBeCloseTo(cBar + 3 * Math.sqrt(cBar), 10);
    expect(chartSeries(result, { standardized: true }).upper[0].y).toBeCloseTo(3, 10);
  });

  it('draws average-k limits only when the core offers them', () => {
    const result = analyzed(varying, { chart: 'u' });
    const series = chartSeries(result, { averageK: true });
    if (result.averageK) expect(series.upper).toHaveLength(2);
    else expect(series.upper).toEqual(chartSeries(result).upper);
  });
});

describe('chartSvg', () => {
  it('writes a standalone SVG with one mark per period and escapes text', () => {
    const result = analyzed(varying, { chart: 'u' });
    const svg = chartSvg(chartSeries(result), {
      title: 'Line <A> & "B"',
      yTitle: 'rate',
      labels: varying.map((o) => o.label),
    });
    expect(svg.startsWith('<svg xmlns="http://www.w3.org/2000/svg"')).toBe(true);
    expect(svg).toContain('Line &lt;A&gt; &amp; &quot;B&quot;');
    const marks =
      (svg.match(/<circle /g) ?? []).length +
      (svg.match(/<polygon /g) ?? []).length +
      (svg.match(/<rect x=/g) ?? []).length;
    expect(marks).toBe(varying.length);
    expect(svg).toContain('#B45309');
  });
});

describe('paretoOfCategories', () => {
  it('orders categories by count with running shares (hand-computed)', () => {
    const observations: Observation[] = [
      { label: 'a', row: 2, count: 6, units: 1, categories: { solder: 3, scratch: 1, missing: 2 } },
      { label: 'b', row: 3, count: 5, units: 1, categories: { solder: 4, scratch: 1 } },
      { label: 'c', row: 4, count: 9, units: 1, categories: { scratch: 9 } },
    ];
    expect(paretoOfCategories(observations, (i) => i !== 2)).toEqual([
      { category: 'solder', count: 7, share: 7 / 11, cumulative: 7 / 11 },
      // A tie keeps the order of first appearance: scratch before missing.
      { category: 'scratch', count: 2, share: 2 / 11, cumulative: 9 / 11 },
      { category: 'missing', count: 2, share: 2 / 11, cumulative: 1 },
    ]);
  });
});

describe('words', () => {
  it('has a sentence and a short name for every rule of DESIGN.md', () => {
    expect(allRuleIds).toEqual([
      'beyond',
      'zone-a',
      'zone-b',
      'run:8',
      'run:9',
      'trend',
      'alternate',
      'hug',
      'avoid',
    ]);
    for (const id of allRuleIds) {
      expect(ruleInWords(id)).toMatch(/\.$/);
      expect(ruleName(id)).not.toBe(id);
    }
    expect(ruleInWords('run:8')).toContain('Eight');
  });

  it('names every warning code of the core with a title', () => {
    for (const code of ['few-periods', 'over-dispersion', 'phase-one-fap', 'no-lower-limit', 'rare-events']) {
      expect(warningGuide(code).title).not.toBe(code.replace(/-/g, ' '));
    }
    expect(warningGuide('over-dispersion').remedy?.options).toEqual({ limits: 'laney' });
  });

  it('formats numbers and dates in the given locale and writes "none" for a missing LCL', () => {
    expect(formatNumber(null)).toBe('none');
    expect(formatNumber(1234567, 'de-DE')).toBe('1.234.567');
    expect(formatNumber(0.78298, 'de-DE')).toBe('0,783');
    expect(formatNumber(0.78298, 'en-US')).toBe('0.783');
    expect(formatDate('2026-03-05', 'en-US')).toBe('Mar 5, 2026');
    expect(formatDate('not a date')).toBe('not a date');
  });

  it('keeps each locale and precision apart when it reuses its number formats', () => {
    // Alternating calls: a formatter kept for one locale or precision must not answer for another.
    for (let round = 0; round < 2; round++) {
      expect(formatNumber(1234.5678, 'de-DE')).toBe('1.235');
      expect(formatNumber(1234.5678, 'en-US')).toBe('1,235');
      expect(formatNumber(1234.5678, 'en-US', 6)).toBe('1,234.57');
      expect(formatNumber(1234, 'de-DE')).toBe('1.234');
      expect(formatNumber(1234, 'en-US', 2)).toBe('1,234');
    }
  });
});

describe('thinForDisplay', () => {
  // Invented series (not a published example), checked against a direct per-column scan.
  const points = Array.from({ length: 2000 }, (_, i) => ({ x: i + 1, y: Math.sin(i / 7) * 10 + (i % 13) }));

  it('keeps every point when there are few enough', () => {
    expect(thinForDisplay(points.slice(0, 40), { from: 0.5, to: 40.5 }, 10)).toHaveLength(40);
  });

  it('keeps each pixel column’s first, lowest, highest and last point, in order', () => {
    const thinned = thinForDisplay(points, { from: 0.5, to: 2000.5 }, 100);
    expect(thinned.length).toBeLessThanOrEqual(400);
    expect(thinned.map((p) => p.x)).toEqual([...thinned.map((p) => p.x)].sort((a, b) => a - b));
    for (let column = 0; column < 100; column++) {
      const inColumn = points.filter((p) => Math.floor(((p.x - 0.5) / 2000) * 100) === column);
      const kept = thinned.filter((p) => Math.floor(((p.x - 0.5) / 2000) * 100) === column);
      expect(Math.max(...kept.map((p) => p.y))).toBe(Math.max(...inColumn.map((p) => p.y)));
      expect(Math.min(...kept.map((p) => p.y))).toBe(Math.min(...inColumn.map((p) => p.y)));
      expect(kept[0]).toBe(inColumn[0]);
      expect(kept.at(-1)).toBe(inColumn.at(-1));
    }
  });

  it('never drops a break in a line (a period with no LCL)', () => {
    const line = Array.from({ length: 3000 }, (_, i) => ({ x: i / 2, y: i === 1500 ? null : i % 7 }));
    const thinned = thinForDisplay(line, { from: 0, to: 1500 }, 50);
    const gap = thinned.findIndex((v) => v.y === null);
    expect(thinned[gap - 1]).toBe(line[1499]);
    expect(thinned[gap + 1]).toBe(line[1501]);
  });
});
