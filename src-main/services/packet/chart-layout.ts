import type { AnalysisResult, PeriodResult } from '../../../shared-core/study/analysis-types.js';
import { palette } from '../../../shared-core/view/palette.js';
import { scaleTitle } from '../../../shared-core/view/scale-words.js';

/**
 * The packet's chart as drawing primitives, laid out once and drawn by two back ends (PDF vector
 * graphics in chart-pdf.ts, SVG text in chart-svg.ts), so the printed and the exported chart are
 * the same picture. Coordinates are points from the top-left corner, y downwards.
 *
 * The visual language is the project's own (DESIGN.md, "Look and words").
 */
export { palette };

export type Point = [number, number];
export type Anchor = 'start' | 'middle' | 'end';

export type Primitive =
  | {
      kind: 'rect';
      x: number;
      y: number;
      width: number;
      height: number;
      fill?: string;
      stroke?: string;
      lineWidth?: number;
    }
  | { kind: 'polyline'; points: Point[]; stroke: string; lineWidth: number; dash?: [number, number] }
  | { kind: 'circle'; x: number; y: number; radius: number; fill: string }
  | { kind: 'polygon'; points: Point[]; fill: string }
  /** y is the text's baseline. `rotate` is counter-clockwise in degrees about (x, y). */
  | {
      kind: 'text';
      x: number;
      y: number;
      text: string;
      size: number;
      color: string;
      anchor: Anchor;
      rotate?: number;
      bold?: boolean;
    };

export interface ChartDrawing {
  width: number;
  height: number;
  primitives: Primitive[];
  /** The y range shown, on the plotted scale. */
  yRange: [number, number];
}

export interface ChartWords {
  /** The inspection unit as the user defines it, e.g. "one board". */
  inspectionUnit: string;
  title: string;
}

/** Text widths are estimated (DejaVu Sans averages about 0.55 em), good enough for placing labels. */
const estimatedWidth = (text: string, size: number) => text.length * size * 0.55;

export function layoutChart(
  result: AnalysisResult,
  words: ChartWords,
  width: number,
  height: number,
): ChartDrawing {
  const periods = result.periods;
  const plotted = (p: PeriodResult) => (result.chart === 'u' ? p.rate : p.count);
  const values = periods.flatMap((p) => [plotted(p), p.ucl, p.center, ...(p.lcl === null ? [] : [p.lcl])]);
  const top = niceCeiling(Math.max(...values) * 1.04);
  const bottom = Math.min(0, ...values);
  const ticks = niceTicks(bottom, top, 6);
  const yMax = Math.max(top, ticks[ticks.length - 1]!);
  const margin = { left: 58, right: 14, top: 34, bottom: 46 };
  const plot = {
    x: margin.left,
    y: margin.top,
    width: width - margin.left - margin.right,
    height: height - margin.top - margin.bottom,
  };
  const n = periods.length;
  const xOf = (position: number) => plot.x + ((position - 0.5) / n) * plot.width; // position in 0.5 … n + 0.5
  const yOf = (value: number) => plot.y + plot.height - ((value - bottom) / (yMax - bottom)) * plot.height;

  const out: Primitive[] = [{ kind: 'rect', x: 0, y: 0, width, height, fill: palette.background }];
  for (const tick of ticks) {
    const y = yOf(tick);
    out.push({
      kind: 'polyline',
      points: [
        [plot.x, y],
        [plot.x + plot.width, y],
      ],
      stroke: palette.grid,
      lineWidth: 0.4,
    });
    out.push({
      kind: 'text',
      x: plot.x - 4,
      y: y + 2.5,
      text: tickText(tick),
      size: 7,
      color: palette.ink,
      anchor: 'end',
    });
  }
  out.push({
    kind: 'rect',
    x: plot.x,
    y: plot.y,
    width: plot.width,
    height: plot.height,
    stroke: palette.ink,
    lineWidth: 0.6,
  });

  // Period labels along x: as many as fit without overlapping.
  const every = Math.max(1, Math.ceil(n / Math.max(1, Math.floor(plot.width / 48))));
  for (let i = 0; i < n; i += every) {
    const x = xOf(i + 1);
    out.push({
      kind: 'polyline',
      points: [
        [x, plot.y + plot.height],
        [x, plot.y + plot.height + 3],
      ],
      stroke: palette.ink,
      lineWidth: 0.5,
    });
    out.push({
      kind: 'text',
      x,
      y: plot.y + plot.height + 12,
      text: clip(periods[i]!.label, 9),
      size: 6.5,
      color: palette.ink,
      anchor: 'middle',
    });
  }

  const stepped = (pick: (p: PeriodResult) => number | null, stroke: string, dash?: [number, number]) => {
    for (const run of steppedRuns(periods.map(pick))) {
      const points: Point[] = [];
      for (const step of run) points.push([xOf(step.from), yOf(step.value)], [xOf(step.to), yOf(step.value)]);
      out.push({ kind: 'polyline', points, stroke, lineWidth: 1.1, ...(dash ? { dash } : {}) });
    }
  };
  stepped((p) => p.center, palette.center);
  stepped((p) => p.ucl, palette.limit, [4, 2.5]);
  stepped((p) => p.lcl, palette.limit, [4, 2.5]); // a null lower limit leaves a gap: no line is drawn there

  const marker = Math.max(1.2, Math.min(2.6, plot.width / n / 2.2));
  periods.forEach((p, i) => out.push(...pointMarker(p.status, xOf(i + 1), yOf(plotted(p)), marker)));

  const scaleWords =
    result.chart === 'u'
      ? `Nonconformities per inspection unit (${words.inspectionUnit})`
      : scaleTitle('c', words.inspectionUnit, periods[0]!.units, 'en-US');
  out.push({
    kind: 'text',
    x: 14,
    y: plot.y + plot.height / 2,
    text: clip(scaleWords, 80),
    size: 7.5,
    color: palette.ink,
    anchor: 'middle',
    rotate: 90,
  });
  out.push({
    kind: 'text',
    x: plot.x + plot.width / 2,
    y: height - 8,
    text: 'Period, in period order',
    size: 7.5,
    color: palette.ink,
    anchor: 'middle',
  });
  out.push({
    kind: 'text',
    x: plot.x,
    y: 13,
    text: clip(words.title, 90),
    size: 9,
    color: palette.ink,
    anchor: 'start',
    bold: true,
  });
  out.push(...legend(plot.x + plot.width, 26));
  return { width, height, primitives: out, yRange: [bottom, yMax] };
}

function pointMarker(status: PeriodResult['status'], x: number, y: number, size: number): Primitive[] {
  if (status === 'signal') {
    const s = size * 1.5;
    return [
      {
        kind: 'polygon',
        points: [
          [x, y - s],
          [x + s * 0.95, y + s * 0.7],
          [x - s * 0.95, y + s * 0.7],
        ],
        fill: palette.signal,
      },
    ];
  }
  if (status === 'excluded') {
    const s = size * 1.15;
    return [
      {
        kind: 'rect',
        x: x - s,
        y: y - s,
        width: 2 * s,
        height: 2 * s,
        stroke: palette.excluded,
        lineWidth: 0.8,
      },
      {
        kind: 'polyline',
        points: [
          [x - s, y - s],
          [x + s, y + s],
        ],
        stroke: palette.excluded,
        lineWidth: 0.6,
      },
      {
        kind: 'polyline',
        points: [
          [x - s, y + s],
          [x + s, y - s],
        ],
        stroke: palette.excluded,
        lineWidth: 0.6,
      },
    ];
  }
  return [{ kind: 'circle', x, y, radius: size * 0.75, fill: palette.ink }];
}

/** The key, right-aligned at (right, baseline). */
function legend(right: number, baseline: number): Primitive[] {
  const entries: { words: string; glyph: (x: number, y: number) => Primitive[] }[] = [
    {
      words: 'Center line',
      glyph: (x, y) => [
        {
          kind: 'polyline',
          points: [
            [x, y],
            [x + 14, y],
          ],
          stroke: palette.center,
          lineWidth: 1.1,
        },
      ],
    },
    {
      words: 'Control limits',
      glyph: (x, y) => [
        {
          kind: 'polyline',
          points: [
            [x, y],
            [x + 14, y],
          ],
          stroke: palette.limit,
          lineWidth: 1.1,
          dash: [4, 2.5],
        },
      ],
    },
    { words: 'In control', glyph: (x, y) => pointMarker('in', x + 7, y, 2.2) },
    { words: 'Signal', glyph: (x, y) => pointMarker('signal', x + 7, y, 2.2) },
    { words: 'Excluded', glyph: (x, y) => pointMarker('excluded', x + 7, y, 2.2) },
  ];
  const out: Primitive[] = [];
  let x = right;
  for (const entry of [...entries].reverse()) {
    x -= estimatedWidth(entry.words, 7);
    out.push({
      kind: 'text',
      x,
      y: baseline,
      text: entry.words,
      size: 7,
      color: palette.ink,
      anchor: 'start',
    });
    x -= 18;
    out.push(...entry.glyph(x, baseline - 2.5));
    x -= 10;
  }
  return out;
}

interface Step {
  from: number;
  to: number;
  value: number;
}

/**
 * Each period's value held across its width (position i ± ½); runs of equal values merge, a change
 * of value steps vertically, and a null (no lower limit) ends the line.
 */
export function steppedRuns(values: (number | null)[]): Step[][] {
  const runs: Step[][] = [];
  let current: Step[] = [];
  values.forEach((value, i) => {
    if (value === null) {
      if (current.length > 0) runs.push(current);
      current = [];
      return;
    }
    const last = current[current.length - 1];
    if (last && last.value === value) last.to = i + 1.5;
    else current.push({ from: i + 0.5, to: i + 1.5, value });
  });
  if (current.length > 0) runs.push(current);
  return runs;
}

/** Round tick steps of 1, 2 or 5 × 10ⁿ (common practice for axis scales). */
export function niceTicks(low: number, high: number, wanted: number): number[] {
  const span = high - low || Math.abs(high) || 1;
  const rough = span / wanted;
  const power = 10 ** Math.floor(Math.log10(rough));
  const step = [1, 2, 5, 10].map((m) => m * power).find((s) => s >= rough) ?? 10 * power;
  const ticks: number[] = [];
  for (let t = Math.floor(low / step) * step; t <= high + step * 1e-9; t += step)
    ticks.push(Number(t.toPrecision(12)));
  if (ticks[ticks.length - 1]! < high) ticks.push(Number((ticks[ticks.length - 1]! + step).toPrecision(12)));
  return ticks;
}

function niceCeiling(value: number): number {
  return value > 0 ? value : 1;
}

const tickText = (value: number) =>
  Math.abs(value) >= 1000 ? value.toFixed(0) : String(Number(value.toPrecision(4)));
const clip = (text: string, length: number) =>
  text.length > length ? `${text.slice(0, length - 1)}…` : text;
