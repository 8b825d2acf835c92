import { blankPicture, paintPicture } from './canvas-picture.js';

/**
 * The chart's background, grid, ticks and axis titles as chart.js last laid them out and drew them,
 * kept as a picture of the whole canvas. While the axes stay as laid out (an exclusion, a new
 * selection), a redraw paints the picture and draws the series over it, instead of chart.js
 * drawing every grid line and tick label again: the same pixels, copied one to one.
 */
export interface AxesPicture {
  canvas: OffscreenCanvas | null;
  /** Canvas size and plot box the picture was taken at. */
  frame: number[];
}

interface ChartFrame {
  canvas: { width: number; height: number };
  chartArea: { left: number; top: number; right: number; bottom: number };
}

export function emptyAxesPicture(): AxesPicture {
  return { canvas: null, frame: [] };
}

function frameOf(chart: ChartFrame): number[] {
  const { canvas, chartArea } = chart;
  return [canvas.width, canvas.height, chartArea.left, chartArea.top, chartArea.right, chartArea.bottom];
}

/** Keeps what is on `chart`'s canvas now (call after the axes are drawn, before the series). */
export function takeAxesPicture(
  picture: AxesPicture,
  chart: ChartFrame & { canvas: HTMLCanvasElement },
): void {
  const blank = blankPicture(picture.canvas, chart.canvas.width, chart.canvas.height);
  picture.canvas = blank?.canvas ?? null;
  if (!blank) return;
  blank.context.drawImage(chart.canvas, 0, 0);
  picture.frame = frameOf(chart);
}

/** True when the picture was taken at `chart`'s present canvas size and plot box. */
export function axesPictureFits(picture: AxesPicture, chart: ChartFrame): boolean {
  if (picture.canvas === null) return false;
  const now = frameOf(chart);
  return now.every((value, i) => value === picture.frame[i]);
}

/** Paints the picture over the whole canvas, whatever the context's transform. */
export function paintAxesPicture(picture: AxesPicture, context: CanvasRenderingContext2D): void {
  if (picture.canvas !== null) paintPicture(context, picture.canvas);
}
