import type { AnalysisResult, PeriodStatus } from '../study/analysis-types.js';

/** One plotted period: x is its position in period order (1-based). */
export interface ChartPoint {
  x: number;
  y: number;
  /** Position in `result.periods`. */
  position: number;
  status: PeriodStatus;
}

/** A vertex of a stepped line; `y: null` breaks the line (no lower limit there). */
export interface StepVertex {
  x: number;
  y: number | null;
}

export interface ChartSeries {
  points: ChartPoint[];
  center: StepVertex[];
  upper: StepVertex[];
  lower: StepVertex[];
  /** What the y axis shows. */
  scale: 'count' | 'rate' | 'standardized';
}

export interface SeriesOptions {
  standardized?: boolean;
  /** Draw the average-k limits instead of each period's own (display only; statuses are unchanged). */
  averageK?: boolean;
}

/**
 * A line that holds each period's value across that period's width (x − ½ to x + ½), so limits that
 * change with kᵢ show as steps. Runs of equal values collapse into one segment.
 */
export function steppedLine(values: (number | null)[]): StepVertex[] {
  const vertices: StepVertex[] = [];
  let start = 0;
  while (start < values.length) {
    const value = values[start];
    let end = start;
    while (end + 1 < values.length && values[end + 1] === value) end++;
    vertices.push({ x: start + 0.5, y: value }, { x: end + 1.5, y: value });
    start = end + 1;
  }
  return vertices;
}

/**
 * The plotted spread of period i under the fitted model: √(ū/kᵢ) on the rate scale (u chart),
 * √(ū·kᵢ) on the count scale (c chart), times σz for Laney limits. Dividing a distance from the
 * center line by it gives the z of DESIGN.md, so the standardized view puts points and limits on the
 * scale the rules use (for probability limits the standardized limits are not exactly ±L).
 */
function plottedSpread(result: AnalysisResult, units: number): number {
  const spread = result.chart === 'u' ? Math.sqrt(result.rate / units) : Math.sqrt(result.rate * units);
  return result.limits === 'laney' && result.sigmaZ !== null ? spread * result.sigmaZ : spread;
}

/** The chart's series from an analysis: points with their states, the center line and stepped limits. */
export function chartSeries(result: AnalysisResult, options: SeriesOptions = {}): ChartSeries {
  const periods = result.periods;
  const useAverage = options.averageK === true && result.averageK !== null;
  if (options.standardized) {
    const standardize = (value: number | null, i: number) =>
      value === null ? null : (value - periods[i].center) / plottedSpread(result, periods[i].units);
    return {
      scale: 'standardized',
      points: periods.map((p, i) => ({ x: i + 1, y: p.z, position: i, status: p.status })),
      center: steppedLine(periods.map(() => 0)),
      upper: steppedLine(periods.map((p, i) => standardize(p.ucl, i))),
      lower: steppedLine(periods.map((p, i) => standardize(p.lcl, i))),
    };
  }
  const plotted = (p: (typeof periods)[number]) => (result.chart === 'u' ? p.rate : p.count);
  const average = result.averageK;
  return {
    scale: result.chart === 'u' ? 'rate' : 'count',
    points: periods.map((p, i) => ({ x: i + 1, y: plotted(p), position: i, status: p.status })),
    center: steppedLine(periods.map((p) => p.center)),
    upper: steppedLine(periods.map((p) => (useAverage && average ? average.ucl : p.ucl))),
    lower: steppedLine(periods.map((p) => (useAverage && average ? average.lcl : p.lcl))),
  };
}
