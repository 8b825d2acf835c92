import { colors } from './chart-colors.js';
import { traceMark } from './point-marks.js';
import { blankPicture, paintPicture } from './canvas-picture.js';

/**
 * The in-control marks as last drawn, kept as a picture of the whole canvas. An exclusion moves no
 * point (the plotted values are the data), so when the same in-control marks land on the same
 * pixels the redraw stamps the picture instead of tracing thousands of discs again. The picture is
 * the same single fill of the same path under the same transform, blended onto the lines as one
 * image: measured against tracing onto the canvas, a few soft edge pixels of the discs (137 of
 * 290,000 with 5,000 periods) come out up to 6 levels of 255 lighter, nothing one can see.
 */
export interface MarkPicture {
  /** What the picture shows: canvas size, transform, then each mark's x and y in CSS pixels. */
  key: Float64Array | null;
  canvas: OffscreenCanvas | null;
}

export function emptyMarkPicture(): MarkPicture {
  return { key: null, canvas: null };
}

/** The canvas size and transform, then each mark's position: two pictures with equal keys are equal. */
function pictureKey(
  context: CanvasRenderingContext2D,
  indices: readonly number[],
  xs: ArrayLike<number>,
  ys: ArrayLike<number>,
): Float64Array {
  const { a, b, c, d, e, f } = context.getTransform();
  const key = new Float64Array(8 + 2 * indices.length);
  key.set([context.canvas.width, context.canvas.height, a, b, c, d, e, f]);
  for (let i = 0, at = 8; i < indices.length; i++, at += 2) {
    key[at] = xs[indices[i]];
    key[at + 1] = ys[indices[i]];
  }
  return key;
}

function sameKey(before: Float64Array | null, now: Float64Array): boolean {
  if (before === null || before.length !== now.length) return false;
  // A NaN position never compares equal: such a picture is simply drawn again.
  for (let i = 0; i < now.length; i++) if (before[i] !== now[i]) return false;
  return true;
}

function fillMarks(
  context: CanvasRenderingContext2D | OffscreenCanvasRenderingContext2D,
  indices: readonly number[],
  xs: ArrayLike<number>,
  ys: ArrayLike<number>,
): void {
  context.beginPath();
  for (const index of indices) traceMark(context, 'in', xs[index], ys[index]);
  context.fillStyle = colors.ink;
  context.fill();
}

/**
 * Draws the in-control marks `indices` (positions in `xs`/`ys`, CSS pixels) into `context`, from
 * `picture` when it shows exactly these marks, else traced afresh and kept in `picture`.
 */
export function drawInControlMarks(
  context: CanvasRenderingContext2D,
  picture: MarkPicture,
  indices: readonly number[],
  xs: ArrayLike<number>,
  ys: ArrayLike<number>,
): void {
  if (indices.length === 0) return;
  const key = pictureKey(context, indices, xs, ys);
  if (!sameKey(picture.key, key) || picture.canvas === null) {
    const blank = blankPicture(picture.canvas, context.canvas.width, context.canvas.height);
    if (!blank) {
      fillMarks(context, indices, xs, ys);
      return;
    }
    blank.context.setTransform(context.getTransform());
    fillMarks(blank.context, indices, xs, ys);
    picture.canvas = blank.canvas;
    picture.key = key;
  }
  paintPicture(context, picture.canvas);
}
