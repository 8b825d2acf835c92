import { createRequire } from 'node:module';
import PDFDocument from 'pdfkit';
import { describe, expect, it } from 'vitest';
import { palette } from '../../src-main/services/packet/chart-layout.js';
import type { PdfDoc } from '../../src-main/services/packet/chart-pdf.js';
import { drawTable, type TableColumn } from '../../src-main/services/packet/pdf-table.js';

const require = createRequire(import.meta.url);
const fonts = { regular: 'Body', bold: 'Body-Bold' };

function newDoc(): { doc: PdfDoc; done: Promise<Buffer> } {
  const doc = new PDFDocument({
    size: 'A4',
    margins: { top: 64, bottom: 60, left: 50, right: 50 },
    compress: false,
    info: { CreationDate: new Date('2026-12-01T10:00:00Z') },
  });
  const chunks: Buffer[] = [];
  doc.on('data', (chunk: Buffer) => chunks.push(chunk));
  const done = new Promise<Buffer>((resolve) => doc.on('end', () => resolve(Buffer.concat(chunks))));
  doc.registerFont(fonts.regular, require.resolve('dejavu-fonts-ttf/ttf/DejaVuSans.ttf'));
  doc.registerFont(fonts.bold, require.resolve('dejavu-fonts-ttf/ttf/DejaVuSans-Bold.ttf'));
  doc.font(fonts.regular).fontSize(9.5).fillColor(palette.ink);
  return { doc, done };
}

/**
 * The reference: every cell through pdfkit's line wrapper with its own alignment and ellipsis,
 * and pdfkit's own shaping throughout (how packet tables were drawn before drawTable).
 */
function wrapperTable(doc: PdfDoc, columns: TableColumn[], rows: string[][], size: number): void {
  const left = doc.page.margins.left;
  const width = doc.page.width - left - doc.page.margins.right;
  const bottom = doc.page.height - doc.page.margins.bottom;
  const total = columns.reduce((sum, c) => sum + c.width, 0);
  const widths = columns.map((c) => (c.width * width) / total);
  const rowHeight = size + 4.5;
  const header = () => {
    let x = left;
    const y = doc.y;
    doc.rect(left, y - 1.5, width, rowHeight).fill('#E9ECEE');
    doc.font(fonts.bold).fontSize(size).fillColor(palette.ink);
    columns.forEach((c, i) => {
      doc.text(c.header, x + 2, y + 1, {
        width: widths[i]! - 4,
        align: c.align ?? 'left',
        lineBreak: false,
        ellipsis: true,
        height: rowHeight,
      });
      x += widths[i]!;
    });
    doc.y = y + rowHeight;
  };
  if (doc.y + rowHeight * 2 > bottom) doc.addPage();
  header();
  doc.font(fonts.regular).fontSize(size);
  rows.forEach((row, r) => {
    if (doc.y + rowHeight > bottom) {
      doc.addPage();
      header();
      doc.font(fonts.regular).fontSize(size);
    }
    let height = rowHeight;
    columns.forEach((c, i) => {
      if (c.wrap && row[i])
        height = Math.max(height, doc.heightOfString(row[i]!, { width: widths[i]! - 4 }) + 4.5);
    });
    if (height > rowHeight && doc.y + height > bottom) {
      doc.addPage();
      header();
      doc.font(fonts.regular).fontSize(size);
    }
    const y = doc.y;
    if (r % 2 === 1) doc.rect(left, y - 1.5, width, height).fill('#F2F2EC');
    doc.fillColor(palette.ink);
    let x = left;
    row.forEach((cell, i) => {
      const wrap = columns[i]!.wrap === true;
      doc.text(cell, x + 2, y + 1, {
        width: widths[i]! - 4,
        align: columns[i]!.align ?? 'left',
        lineBreak: wrap,
        ellipsis: !wrap,
        height: wrap ? height : rowHeight,
      });
      x += widths[i]!;
    });
    doc.y = y + height;
  });
  doc.x = left;
  doc.moveDown(0.5);
}

const columns: TableColumn[] = [
  { header: '#', width: 0.7, align: 'right' },
  { header: 'Period', width: 2.4 },
  { header: 'Count', width: 1.1, align: 'right' },
  { header: 'Rate per inspection unit', width: 1.3, align: 'right' },
  { header: 'Status', width: 1.2 },
  { header: 'Note', width: 2.6, wrap: true },
];

/** Invented cells covering what packet tables hold: numbers, labels, kerned words, cut and wrapped text. */
function rows(n: number): string[][] {
  return Array.from({ length: n }, (_, i) => [
    String(i + 1),
    i % 7 === 3
      ? 'Week 12 of the second quarter, night shift, line B'
      : i % 13 === 6
        ? 'WAVE To, AV'
        : i % 5 === 0
          ? `2026-03-${(i % 28) + 1}`
          : `P${i + 1}`,
    String((i * 7 + 3) % 13),
    i % 11 === 0 ? '—' : ((i * 0.0137) % 1).toFixed(5),
    i % 4 === 0 ? 'excluded' : 'in',
    i % 9 === 0 ? 'Tool change; Operator AV reported “To be checked” before the first piece of the run.' : '',
  ]);
}

describe('drawTable', () => {
  it('draws the same PDF, byte for byte, as every cell through pdfkit’s line wrapper', async () => {
    const fast = newDoc();
    fast.doc.text('Data', 50, 64);
    drawTable(fast.doc, columns, rows(160), { fonts, size: 7.5 });
    fast.doc.text('After the table.');
    fast.doc.end();

    const reference = newDoc();
    reference.doc.text('Data', 50, 64);
    wrapperTable(reference.doc, columns, rows(160), 7.5);
    reference.doc.text('After the table.');
    reference.doc.end();

    const [fastBytes, referenceBytes] = await Promise.all([fast.done, reference.done]);
    // 160 rows with wrapped notes run over several pages, so the repeated header is compared too.
    expect((fastBytes.toString('latin1').match(/\/Type \/Page\b/g) ?? []).length).toBeGreaterThan(2);
    expect(fastBytes.equals(referenceBytes)).toBe(true);
    // Kerned one-line cells (WAVE To, AV) are among them: a glyph run ends at each kerning pair.
    expect(fastBytes.toString('latin1')).toMatch(/\[<[0-9a-f]+> -?[1-9][0-9.]* <[0-9a-f]+>/);
  });

  it('cuts a cell that does not fit with an ellipsis rather than running into the next column', async () => {
    const { doc, done } = newDoc();
    drawTable(
      doc,
      [
        { header: 'Period', width: 1 },
        { header: 'Count', width: 5 },
      ],
      [['A label far too long for its narrow column', '1']],
      {
        fonts,
        size: 7.5,
      },
    );
    doc.end();
    const text = (await done).toString('latin1');
    // The ellipsis is a glyph of the embedded font; its ToUnicode entry maps it back to U+2026.
    expect(text).toMatch(/<[0-9a-f]{4}> <2026>/);
  });
});
