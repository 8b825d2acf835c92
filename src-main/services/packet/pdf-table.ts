import { palette } from './chart-layout.js';
import type { PdfDoc, PdfFonts } from './chart-pdf.js';
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
 * A one-line cell that fits is drawn with a single positioned `text` call, measured once;
 * pdfkit's line wrapper (which measures every word again and again) is used only for cells that
 * wrap or need cutting. Both place the text identically: tests/unit/packet-pdf-table.test.ts
 * compares the page content with the wrapper's, byte for byte.
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
    columns.forEach((c, i) => {
      lineCell(doc, c.header, x + padding, y + 1, widths[i]! - 2 * padding, c.align ?? 'left', rowHeight);
      x += widths[i]!;
    });
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
    let x = left;
    row.forEach((cell, i) => {
      const column = columns[i]!;
      const cellWidth = widths[i]! - 2 * padding;
      if (column.wrap === true) {
        doc.text(cell, x + padding, y + 1, {
          width: cellWidth,
          align: column.align ?? 'left',
          lineBreak: true,
          ellipsis: false,
          height,
        });
      } else lineCell(doc, cell, x + padding, y + 1, cellWidth, column.align ?? 'left', rowHeight);
      x += widths[i]!;
    });
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
  doc: PdfDoc,
  text: string,
  x: number,
  y: number,
  width: number,
  align: 'left' | 'right',
  height: number,
): void {
  if (text === '') return;
  if (text === text.trim() && !hasSpecialCharacters(text)) {
    const textWidth = doc.widthOfString(text);
    if (textWidth <= width - fitMargin) {
      // The same x as pdfkit's right alignment computes, in the same order of operations.
      doc.text(text, align === 'right' ? x + (width - textWidth) : x, y, { lineBreak: false });
      return;
    }
  }
  doc.text(text, x, y, { width, align, lineBreak: false, ellipsis: true, height });
}
