/**
 * The project's visual language (DESIGN.md, "Look and words"), in one place for the screen, the
 * exported SVG and the PDF: every graphic is at least 3:1 against the background.
 */
export const palette = {
  background: '#FAFAF7',
  ink: '#1F2933',
  center: '#3E5C76',
  limit: '#0F766E',
  signal: '#B45309',
  excluded: '#66717F',
  grid: '#E4E7EB',
  path: '#9AA5B1',
} as const;
