import { describe, expect, it } from 'vitest';
import {
  layoutChart,
  niceTicks,
  palette,
  steppedRuns,
  type Primitive,
} from '../../src-main/services/packet/chart-layout.js';
import { chartSvg } from '../../src-main/services/packet/chart-svg.js';
import { analyzePhaseOne } from '../../shared-core/study/phase-one.js';
import type { AnalysisResult, PeriodResult } from '../../shared-core/study/analysis-types.js';

/** A hand-made result (not from the engine): the layout only draws what it is given. */
function result(periods: Partial<PeriodResult>[]): AnalysisResult {
  const full = periods.map((p, i) => ({
    index: i,
    label: `P${i + 1}`,
    row: i + 2,
    count: 2,
    units: 10,
    rate: 0.2,
    center: 0.25,
    lcl: null,
    ucl: 0.72,
    z: 0,
    status: 'in' as const,
    rules: [],
    ...p,
  }));
  // Everything but the periods from a real analysis, so the shape stays the engine's.
  const base = analyzePhaseOne(
    full.map((p) => ({ label: p.label, row: p.row, count: p.count, units: p.units })),
    [],
    { limits: 'sigma', multiplier: 3, alpha: 0.0027, rules: ['beyond'], chart: 'u' },
  );
  if (!base.ok) throw new Error('no analysis');
  return { ...base.value, center: 0.25, rate: 0.25, periods: full };
}

const dashed = (ps: Primitive[]) =>
  ps.filter((p) => p.kind === 'polyline' && p.dash && p.stroke === palette.limit);
const inPlot = (ps: Primitive[]) => ps.slice(0, -12); // the legend's glyphs come last

describe('the chart layout', () => {
  it('draws no lower limit line where there is none, and one where there is', () => {
    const withoutLcl = layoutChart(
      result([{}, {}, {}]),
      { inspectionUnit: 'one board', title: 't' },
      500,
      300,
    );
    expect(dashed(inPlot(withoutLcl.primitives))).toHaveLength(1); // the UCL only
    const partly = layoutChart(
      result([{ lcl: 0.05, units: 40 }, {}, { lcl: 0.05, units: 40 }]),
      { inspectionUnit: 'one board', title: 't' },
      500,
      300,
    );
    // UCL (one run) and LCL in two runs, broken where period 2 has no lower limit.
    expect(dashed(inPlot(partly.primitives))).toHaveLength(3);
  });

  it('marks in-control dots, signal triangles and excluded crossed squares in their colors', () => {
    const drawing = layoutChart(
      result([{}, { status: 'signal', rate: 0.9 }, { status: 'excluded', rate: 0.8 }, {}]),
      { inspectionUnit: 'one board', title: 't' },
      500,
      300,
    );
    const plot = inPlot(drawing.primitives);
    expect(plot.filter((p) => p.kind === 'circle' && p.fill === palette.ink)).toHaveLength(2);
    expect(plot.filter((p) => p.kind === 'polygon' && p.fill === palette.signal)).toHaveLength(1);
    expect(plot.filter((p) => p.kind === 'rect' && p.stroke === palette.excluded && !p.fill)).toHaveLength(1);
    expect(plot.filter((p) => p.kind === 'polyline' && p.stroke === palette.excluded)).toHaveLength(2);
    expect(drawing.primitives[0]).toMatchObject({ kind: 'rect', fill: '#FAFAF7' });
  });

  it('labels the y axis with the inspection unit', () => {
    const drawing = layoutChart(result([{}, {}]), { inspectionUnit: '50 m² of cloth', title: 't' }, 500, 300);
    const texts = drawing.primitives
      .filter((p) => p.kind === 'text')
      .map((p) => (p.kind === 'text' ? p.text : ''));
    expect(texts).toContain('Nonconformities per inspection unit (50 m² of cloth)');
  });

  it('labels a c chart with what one inspection counts', () => {
    const drawing = layoutChart(
      { ...result([{ units: 5 }, { units: 5 }]), chart: 'c' },
      { inspectionUnit: 'panel', title: 't' },
      500,
      300,
    );
    const texts = drawing.primitives.map((p) => (p.kind === 'text' ? p.text : ''));
    expect(texts).toContain('Nonconformities per inspection of 5 panels');
  });

  it('becomes SVG with the same primitives, text escaped', () => {
    const drawing = layoutChart(
      result([{}, { status: 'signal', rate: 0.9 }]),
      { inspectionUnit: 'a <b> & c', title: 't' },
      500,
      300,
    );
    const svg = chartSvg(drawing, 'x & y');
    expect(svg).toMatch(/^<svg xmlns="http:\/\/www.w3.org\/2000\/svg"/);
    expect(svg).toContain('a &lt;b&gt; &amp; c');
    expect(svg).toContain('<title>x &amp; y</title>');
    expect((svg.match(/<polygon /g) ?? []).length).toBe(
      drawing.primitives.filter((p) => p.kind === 'polygon').length,
    );
    expect(svg).toContain('stroke="#0F766E"');
  });
});

describe('stepped runs', () => {
  it('hold each value across its period, merge equal neighbours and break at null', () => {
    expect(steppedRuns([1, 1, 2, null, 3])).toEqual([
      [
        { from: 0.5, to: 2.5, value: 1 },
        { from: 2.5, to: 3.5, value: 2 },
      ],
      [{ from: 4.5, to: 5.5, value: 3 }],
    ]);
  });
});

describe('axis ticks', () => {
  it('use steps of 1, 2 or 5 × 10ⁿ covering the range (common practice)', () => {
    expect(niceTicks(0, 0.72, 6)).toEqual([0, 0.2, 0.4, 0.6, 0.8]);
    expect(niceTicks(0, 37, 6)).toEqual([0, 10, 20, 30, 40]);
  });
});
