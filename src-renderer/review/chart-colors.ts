import { palette } from '../../shared-core/view/palette.js';

/** DESIGN.md's visual language (shared-core/view/palette.ts), plus the screen's selection tint. */
export const colors = {
  ...palette,
  selection: 'rgba(62, 92, 118, 0.12)',
} as const;
