import { palette } from './chart-layout.js';
import type { PdfDoc, PdfFonts } from './chart-pdf.js';
import { pdfNumber } from './pdf-number.js';
import { installLayoutShortcut } from './pdf-text-layout.js';

export interface TableColumn {
  header: string;
  /** Relative width: the columns share the width between the page margins in these proportions. */
  width: number;
  align?: 'left' | 'right';
  /** Text that may run onto further lines; other cells stay on one line, cut with an ellipsis. */
  wrap?: boolean;
}

export interface TableStyle {
  fonts: PdfFonts;
  /** Font size of the cells and the header. */
  size?: number;
}

const headerFill = '#E9ECEE';
const stripeFill = '#F2F2EC';
const padding = 2;

/**
 * A table from the cursor down, across as many pages as it needs, repeating the header on each;
 * rows alternate a light stripe. The cursor ends half a line below the table.
 *
 * A one-line cell that fits is measured once and written with the row's other such cells in one
 * piece (RowText); pdfkit's line wrapper (which measures every word again and again) is used only
 * for cells that wrap or need cutting. Both place the text identically:
 * tests/unit/packet-pdf-table.test.ts compares the page content with the wrapper's, byte for byte.
 */
export function drawTable(doc: PdfDoc, columns: TableColumn[], rows: string[][], style: TableStyle): void {
  const { fonts } = style;
  const size = style.size ?? 7.5;
  const left = doc.page.margins.left;
  const width = doc.page.width - left - doc.page.margins.right;
  const bottom = () => doc.page.height - doc.page.margins.bottom;
  const total = columns.reduce((sum, c) => sum + c.width, 0);
  const scale = width / total;
  const widths = columns.map((c) => c.width * scale);
  const rowHeight = size + 4.5;
  const useBody = () => {
    doc.font(fonts.regular).fontSize(size);
    installLayoutShortcut(doc);
  };
  const header = () => {
    let x = left;
    const y = doc.y;
    doc.rect(left, y - 1.5, width, rowHeight).fill(headerFill);
    doc.font(fonts.bold).fontSize(size).fillColor(palette.ink);
    installLayoutShortcut(doc);
    const text = new RowText(doc);
    columns.forEach((c, i) => {
      lineCell(text, c.header, x + padding, y + 1, widths[i]! - 2 * padding, c.align ?? 'left', rowHeight);
      x += widths[i]!;
    });
    text.write();
    doc.y = y + rowHeight;
  };
  if (doc.y + rowHeight * 2 > bottom()) doc.addPage();
  header();
  useBody();
  rows.forEach((row, r) => {
    if (doc.y + rowHeight > bottom()) {
      doc.addPage();
      header();
      useBody();
    }
    // Only the columns that may wrap are measured: measuring every cell would slow long tables.
    let height = rowHeight;
    columns.forEach((c, i) => {
      if (c.wrap && row[i])
        height = Math.max(height, doc.heightOfString(row[i]!, { width: widths[i]! - 2 * padding }) + 4.5);
    });
    if (height > rowHeight && doc.y + height > bottom()) {
      doc.addPage();
      header();
      useBody();
    }
    const y = doc.y;
    if (r % 2 === 1) doc.rect(left, y - 1.5, width, height).fill(stripeFill);
    doc.fillColor(palette.ink);
    const text = new RowText(doc);
    let x = left;
    row.forEach((cell, i) => {
      const column = columns[i]!;
      const cellWidth = widths[i]! - 2 * padding;
      // An empty cell draws nothing (through pdfkit's wrapper too, only slower).
      if (cell === '') {
        // nothing to draw
      } else if (column.wrap === true) {
        text.write();
        doc.text(cell, x + padding, y + 1, {
          width: cellWidth,
          align: column.align ?? 'left',
          lineBreak: true,
          ellipsis: false,
          height,
        });
      } else lineCell(text, cell, x + padding, y + 1, cellWidth, column.align ?? 'left', rowHeight);
      x += widths[i]!;
    });
    text.write();
    doc.y = y + height;
  });
  doc.x = left;
  doc.moveDown(0.5);
}

// A margin below the column width, so that a cell pdfkit's wrapper would judge just too wide by
// its own word-by-word rounding is never drawn whole here.
const fitMargin = 0.01;
/** Control characters, soft hyphens and line separators change how the wrapper breaks or draws. */
function hasSpecialCharacters(text: string): boolean {
  for (let i = 0; i < text.length; i++) {
    const code = text.charCodeAt(i);
    if (code < 32 || code === 0x7f || code === 0xad || code === 0x2028 || code === 0x2029) return true;
  }
  return false;
}

/** One line of text in a cell of the given width, cut with an ellipsis when it does not fit. */
function lineCell(
  row: RowText,
  text: string,
  x: number,
  y: number,
  width: number,
  align: 'left' | 'right',
  height: number,
): void {
  if (text === '') return;
  const doc = row.doc;
  if (text === text.trim() && !hasSpecialCharacters(text)) {
    const textWidth = doc.widthOfString(text);
    if (textWidth <= width - fitMargin) {
      // The same x as pdfkit's right alignment computes, in the same order of operations.
      const left = align === 'right' ? x + (width - textWidth) : x;
      if (row.add(text, left, y)) return;
      row.write();
      doc.text(text, left, y, { lineBreak: false });
      return;
    }
  }
  row.write();
  doc.text(text, x, y, { width, align, lineBreak: false, ellipsis: true, height });
}

interface GlyphPosition {
  xAdvance: number;
  advanceWidth: number;
  xOffset: number;
  yOffset: number;
}

/** The parts of pdfkit's document and embedded font that text placement uses. */
interface PdfkitText {
  _font?: {
    id: string;
    ascender: number;
    ref?: () => unknown;
    encode?: (text: string, features?: unknown) => [string[], GlyphPosition[]];
  };
  _fontSize: number;
  _textOptions?: unknown;
  _wrapper?: unknown;
  page: { height: number; fonts: Record<string, unknown> };
}

/**
 * The one-line cells of a table row, written to the page in one piece.
 *
 * pdfkit writes a positioned piece of text as eight content operators (q, cm, BT, Tm, Tf, TJ, ET,
 * Q), each turned into bytes on its own, and a 500-period data table has 5,000 such cells. These
 * cells are written here as the same operators with the same numbers, from the same glyph encoding
 * (the font's own `encode`, which also adds the glyphs to the embedded subset), so the page
 * content is byte for byte what pdfkit's `text(cell, x, y, { lineBreak: false })` writes, in one
 * write per row. Text whose glyphs are placed off their line (combining marks), and text while
 * options carried over from an earlier `continued` text are in force, go through pdfkit.
 */
class RowText {
  private operators: string[] = [];

  constructor(readonly doc: PdfDoc) {}

  /** Adds the text with its top-left corner at (x, y); false when it must go through pdfkit. */
  add(text: string, x: number, y: number): boolean {
    const doc = this.doc as unknown as PdfkitText;
    const font = doc._font;
    if (!font?.encode || !font.ref || doc._textOptions || doc._wrapper) return false;
    const [glyphs, positions] = font.encode(text);
    if (positions.some((p) => p.xOffset || p.yOffset)) return false;
    const size = doc._fontSize;
    const baseline = doc.page.height - y - (font.ascender / 1000) * size;
    doc.page.fonts[font.id] ??= font.ref();
    // pdfkit's _fragment: a run of glyphs ends where a glyph's advance differs from its width (kerning).
    const runs: string[] = [];
    let start = 0;
    const endRun = (end: number) => {
      if (start < end) {
        const last = positions[end - 1]!;
        runs.push(
          `<${glyphs.slice(start, end).join('')}> ${pdfNumber(-(last.xAdvance - last.advanceWidth))}`,
        );
      }
      start = end;
    };
    positions.forEach((p, i) => {
      if (p.xAdvance - p.advanceWidth !== 0) endRun(i + 1);
    });
    endRun(positions.length);
    this.operators.push(
      'q',
      `1 0 0 -1 0 ${pdfNumber(doc.page.height)} cm`,
      'BT',
      `1 0 0 1 ${pdfNumber(x)} ${pdfNumber(baseline)} Tm`,
      `/${font.id} ${pdfNumber(size)} Tf`,
      ...(runs.length > 0 ? [`[${runs.join(' ')}] TJ`] : []),
      'ET',
      'Q',
    );
    return true;
  }

  /** Writes what was added, before anything else is drawn. */
  write(): void {
    if (this.operators.length === 0) return;
    this.doc.addContent(this.operators.join('\n'));
    this.operators = [];
  }
}
