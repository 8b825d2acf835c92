import type { PeriodStatus } from '../../shared-core/study/analysis-types.js';
import type { ChartSeries, StepVertex } from '../../shared-core/view/chart-series.js';
import { thinForDisplay } from '../../shared-core/view/thin-for-display.js';
import { visibleMarks } from '../../shared-core/view/visible-marks.js';
import { colors } from './chart-colors.js';
import { drawInControlMarks, type MarkPicture } from './mark-picture.js';
import { markPaint, traceMark } from './point-marks.js';

/** The series' lines, thinned once per series and plot width (a redraw for a new selection reuses them). */
export interface SeriesLayer {
  series: ChartSeries;
  upper: StepVertex[];
  lower: StepVertex[];
  center: StepVertex[];
  path: StepVertex[];
  /** The plot width the lines were thinned for. */
  columns: number;
}

/** Where the plot is on the canvas: data values to CSS pixels, the plot's box and the pixel ratio. */
export interface PlotFrame {
  pixelX: (value: number) => number;
  pixelY: (value: number) => number;
  area: { left: number; top: number; right: number; bottom: number };
  /** Device pixels per CSS pixel. */
  ratio: number;
}

/**
 * The range the y axis must hold: the lowest and highest value of every line and mark, widened
 * outward to a tenth of the range's order of magnitude (for a range of 5.5, to 0.1). chart.js
 * still chooses the axis from it, and every tick step it can choose (at most 11 ticks, steps of
 * 1, 2 or 5 times a power of ten) is a multiple of that grain, so the widening rarely changes
 * the axis (at most to the next step, never hiding a value). A recompute that moves a limit a
 * little (an exclusion) then gives the same range, and the redraw skips laying out the axes again.
 */
export function axisExtent(series: ChartSeries): { low: number; high: number } {
  let low = Infinity;
  let high = -Infinity;
  for (const line of [series.points, series.upper, series.lower, series.center])
    for (const { y } of line)
      if (y !== null) {
        if (y < low) low = y;
        if (y > high) high = y;
      }
  if (!Number.isFinite(low)) return { low: 0, high: 1 };
  if (high === low) return { low, high };
  const grain = 10 ** (Math.floor(Math.log10(high - low)) - 1);
  return { low: Math.floor(low / grain) * grain, high: Math.ceil(high / grain) * grain };
}

/** The series' lines thinned for a plot `columns` CSS pixels wide (the marks are thinned as drawn). */
export function seriesLayer(series: ChartSeries, columns: number): SeriesLayer {
  const range = { from: 0.5, to: series.points.length + 0.5 };
  const thin = (line: readonly StepVertex[]) => thinForDisplay(line, range, columns);
  return {
    series,
    columns,
    upper: thin(series.upper),
    lower: thin(series.lower),
    center: thin(series.center),
    path: thin(series.points),
  };
}

function strokeLine(
  context: CanvasRenderingContext2D,
  vertices: readonly StepVertex[],
  frame: PlotFrame,
  style: { color: string; width: number; dash: number[] },
): void {
  context.beginPath();
  let open = false;
  for (const { x, y } of vertices) {
    // A vertex without a value (no LCL there, or a split) breaks the line.
    if (y === null) {
      open = false;
      continue;
    }
    if (open) context.lineTo(frame.pixelX(x), frame.pixelY(y));
    else context.moveTo(frame.pixelX(x), frame.pixelY(y));
    open = true;
  }
  context.strokeStyle = style.color;
  context.lineWidth = style.width;
  context.setLineDash(style.dash);
  context.stroke();
}

/**
 * Draws the lines and the point marks: each line as one path, and every mark of a status as one
 * path filled and stroked once. Signals and exclusions are drawn last, so that no in-control mark
 * ever hides one. The in-control marks come from `picture` when they land where they did last time.
 */
export function drawSeriesLayer(
  context: CanvasRenderingContext2D,
  layer: SeriesLayer,
  frame: PlotFrame,
  selected: number | null,
  picture: MarkPicture,
): void {
  const { area } = frame;
  context.save();
  context.beginPath();
  // Marks at the edge of the plot may overhang it, as far as the largest mark reaches.
  context.rect(area.left - 8, area.top - 8, area.right - area.left + 16, area.bottom - area.top + 16);
  context.clip();
  context.lineCap = 'butt';
  context.lineJoin = 'miter';
  strokeLine(context, layer.path, frame, { color: colors.path, width: 1, dash: [] });
  strokeLine(context, layer.center, frame, { color: colors.center, width: 1.5, dash: [] });
  strokeLine(context, layer.lower, frame, { color: colors.limit, width: 1.5, dash: [6, 4] });
  strokeLine(context, layer.upper, frame, { color: colors.limit, width: 1.5, dash: [6, 4] });
  context.setLineDash([]);

  const points = layer.series.points;
  const xs = new Float64Array(points.length);
  const ys = new Float64Array(points.length);
  const deviceX = new Float64Array(points.length);
  const deviceY = new Float64Array(points.length);
  for (let i = 0; i < points.length; i++) {
    xs[i] = frame.pixelX(points[i].x);
    ys[i] = frame.pixelY(points[i].y);
    deviceX[i] = xs[i] * frame.ratio;
    deviceY[i] = ys[i] * frame.ratio;
  }
  const kept = visibleMarks(points, deviceX, deviceY, selected);
  drawInControlMarks(
    context,
    picture,
    kept.filter((index) => points[index].status === 'in'),
    xs,
    ys,
  );
  const order: PeriodStatus[] = ['excluded', 'signal'];
  for (const status of order) {
    context.beginPath();
    let any = false;
    for (const index of kept)
      if (points[index].status === status) {
        traceMark(context, status, xs[index], ys[index]);
        any = true;
      }
    if (!any) continue;
    const paint = markPaint(status);
    if (paint.fill) {
      context.fillStyle = paint.fill;
      context.fill();
    }
    if (paint.stroke) {
      context.strokeStyle = paint.stroke;
      context.lineWidth = paint.lineWidth;
      context.stroke();
    }
  }
  context.restore();
}
