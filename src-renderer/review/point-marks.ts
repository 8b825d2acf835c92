import type { PeriodStatus } from '../../shared-core/study/analysis-types.js';
import { colors } from './chart-colors.js';

/** A hollow square with a cross, for excluded periods (chart.js takes a canvas as a point style). */
function excludedMark(size: number): HTMLCanvasElement | 'rect' {
  if (typeof document === 'undefined') return 'rect';
  const canvas = document.createElement('canvas');
  const ratio = globalThis.devicePixelRatio || 1;
  canvas.width = canvas.height = Math.ceil(size * ratio);
  canvas.style.width = canvas.style.height = `${size}px`;
  const context = canvas.getContext('2d');
  if (!context) return 'rect';
  context.scale(ratio, ratio);
  context.strokeStyle = colors.excluded;
  context.lineWidth = 1.5;
  const inset = 1.5;
  context.strokeRect(inset, inset, size - 2 * inset, size - 2 * inset);
  context.beginPath();
  context.moveTo(inset, inset);
  context.lineTo(size - inset, size - inset);
  context.moveTo(size - inset, inset);
  context.lineTo(inset, size - inset);
  context.stroke();
  return canvas;
}

let cachedExcluded: HTMLCanvasElement | 'rect' | undefined;

export interface PointMark {
  style: 'circle' | 'triangle' | 'rect' | HTMLCanvasElement;
  radius: number;
  fill: string;
  stroke: string;
}

export function pointMark(status: PeriodStatus): PointMark {
  switch (status) {
    case 'signal':
      return { style: 'triangle', radius: 6, fill: colors.signal, stroke: colors.signal };
    case 'excluded':
      cachedExcluded ??= excludedMark(11);
      return { style: cachedExcluded, radius: 6, fill: 'transparent', stroke: colors.excluded };
    default:
      return { style: 'circle', radius: 2.5, fill: colors.ink, stroke: colors.ink };
  }
}
