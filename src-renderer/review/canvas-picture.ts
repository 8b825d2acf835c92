/**
 * A picture of a whole canvas kept off screen, for the chart's redraws that can paint what they
 * drew before instead of drawing it again (the axes, the in-control marks).
 */

/**
 * A cleared offscreen canvas of `width`×`height` with its context at the identity transform: `kept`
 * again when it has that size. Null where the page has no offscreen canvas or the size is empty.
 */
export function blankPicture(
  kept: OffscreenCanvas | null,
  width: number,
  height: number,
): { canvas: OffscreenCanvas; context: OffscreenCanvasRenderingContext2D } | null {
  if (typeof OffscreenCanvas === 'undefined' || width === 0 || height === 0) return null;
  const canvas = kept?.width === width && kept.height === height ? kept : new OffscreenCanvas(width, height);
  const context = canvas.getContext('2d');
  if (!context) return null;
  context.setTransform(1, 0, 0, 1, 0, 0);
  context.clearRect(0, 0, width, height);
  return { canvas, context };
}

/** Paints a whole-canvas picture one to one, whatever the context's transform. */
export function paintPicture(context: CanvasRenderingContext2D, picture: OffscreenCanvas): void {
  context.save();
  context.setTransform(1, 0, 0, 1, 0, 0);
  context.drawImage(picture, 0, 0);
  context.restore();
}
