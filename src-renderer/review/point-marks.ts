import type { PeriodStatus } from '../../shared-core/study/analysis-types.js';
import { colors } from './chart-colors.js';

/** How a period's mark is painted: DESIGN.md's ink dot, amber triangle, hollow square with a cross. */
export interface MarkPaint {
  fill: string | null;
  stroke: string | null;
  lineWidth: number;
}

export function markPaint(status: PeriodStatus): MarkPaint {
  switch (status) {
    case 'signal':
      return { fill: colors.signal, stroke: colors.signal, lineWidth: 1 };
    case 'excluded':
      return { fill: null, stroke: colors.excluded, lineWidth: 1.5 };
    default:
      // A solid disc the size of the former dot with its outline, filled once instead of filled and stroked.
      return { fill: colors.ink, stroke: null, lineWidth: 0 };
  }
}

/** Half the width of each mark's shape in CSS pixels (an outline adds half its line width). */
export const markRadius = { in: 3, signal: 6, excluded: 4 } as const satisfies Record<PeriodStatus, number>;

const third = (2 * Math.PI) / 3;

/**
 * Adds one mark's outline to the current path, so that every mark of a status is filled and
 * stroked in a single call however many periods there are.
 */
export function traceMark(context: CanvasPath, status: PeriodStatus, x: number, y: number): void {
  const r = markRadius[status];
  if (status === 'signal') {
    // An upright triangle inscribed in a circle of radius r. Its outline is closed by a line back
    // to the top, not closePath: the canvas slows down badly with a closePath per mark in one path.
    context.moveTo(x, y - r);
    context.lineTo(x + Math.sin(third) * r, y - Math.cos(third) * r);
    context.lineTo(x + Math.sin(2 * third) * r, y - Math.cos(2 * third) * r);
    context.lineTo(x, y - r);
  } else if (status === 'excluded') {
    context.rect(x - r, y - r, 2 * r, 2 * r);
    context.moveTo(x - r, y - r);
    context.lineTo(x + r, y + r);
    context.moveTo(x + r, y - r);
    context.lineTo(x - r, y + r);
  } else {
    // A full turn closes itself (see above about closePath).
    context.moveTo(x + r, y);
    context.arc(x, y, r, 0, 2 * Math.PI);
  }
}
