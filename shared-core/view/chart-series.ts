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
  return steppedLineOf(values.length, (i) => values[i]);
}

/**
 * `steppedLine` of the values `valueAt(0)` to `valueAt(count − 1)`, read once each: a long history
 * builds its lines without an array of values per line first.
 */
function steppedLineOf(count: number, valueAt: (i: number) => number | null): StepVertex[] {
  const vertices: StepVertex[] = [];
  if (count === 0) return vertices;
  let start = 0;
  let value = valueAt(0);
  for (let i = 1; i <= count; i++) {
    const next = i < count ? valueAt(i) : value;
    if (i < count && next === value) continue;
    vertices.push({ x: start + 0.5, y: value }, { x: i + 0.5, y: value });
    start = i;
    value = next;
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
  const n = periods.length;
  const useAverage = options.averageK === true && result.averageK !== null;
  const points = new Array<ChartPoint>(n);
  if (options.standardized) {
    const standardize = (value: number | null, i: number) =>
      value === null ? null : (value - periods[i].center) / plottedSpread(result, periods[i].units);
    for (let i = 0; i < n; i++)
      points[i] = { x: i + 1, y: periods[i].z, position: i, status: periods[i].status };
    return {
      scale: 'standardized',
      points,
      center: steppedLineOf(n, () => 0),
      upper: steppedLineOf(n, (i) => standardize(periods[i].ucl, i)),
      lower: steppedLineOf(n, (i) => standardize(periods[i].lcl, i)),
    };
  }
  const rates = result.chart === 'u';
  for (let i = 0; i < n; i++) {
    const p = periods[i];
    points[i] = { x: i + 1, y: rates ? p.rate : p.count, position: i, status: p.status };
  }
  const average = useAverage ? result.averageK : null;
  return {
    scale: rates ? 'rate' : 'count',
    points,
    center: steppedLineOf(n, (i) => periods[i].center),
    upper: average ? steppedLineOf(n, () => average.ucl) : steppedLineOf(n, (i) => periods[i].ucl),
    lower: average ? steppedLineOf(n, () => average.lcl) : steppedLineOf(n, (i) => periods[i].lcl),
  };
}
