import type PDFDocument from 'pdfkit';
import type { ChartDrawing } from './chart-layout.js';

export type PdfDoc = InstanceType<typeof PDFDocument>;

export interface PdfFonts {
  regular: string;
  bold: string;
}

/** Draws the laid-out chart as PDF vector graphics with its top-left corner at (left, top). */
export function drawChartOnPdf(
  doc: PdfDoc,
  drawing: ChartDrawing,
  left: number,
  top: number,
  fonts: PdfFonts,
): void {
  doc.save();
  doc.translate(left, top);
  for (const p of drawing.primitives) {
    switch (p.kind) {
      case 'rect':
        doc.rect(p.x, p.y, p.width, p.height);
        if (p.fill && p.stroke) doc.lineWidth(p.lineWidth ?? 1).fillAndStroke(p.fill, p.stroke);
        else if (p.fill) doc.fill(p.fill);
        else if (p.stroke) doc.lineWidth(p.lineWidth ?? 1).stroke(p.stroke);
        break;
      case 'polyline': {
        const [first, ...rest] = p.points;
        if (!first) break;
        doc.moveTo(first[0], first[1]);
        for (const [x, y] of rest) doc.lineTo(x, y);
        doc.lineWidth(p.lineWidth);
        if (p.dash) doc.dash(p.dash[0], { space: p.dash[1] });
        doc.stroke(p.stroke);
        if (p.dash) doc.undash();
        break;
      }
      case 'circle':
        doc.circle(p.x, p.y, p.radius).fill(p.fill);
        break;
      case 'polygon':
        doc.polygon(...p.points).fill(p.fill);
        break;
      case 'text': {
        doc
          .font(p.bold ? fonts.bold : fonts.regular)
          .fontSize(p.size)
          .fillColor(p.color);
        const width = doc.widthOfString(p.text);
        const shift = p.anchor === 'middle' ? width / 2 : p.anchor === 'end' ? width : 0;
        if (p.rotate) {
          doc.save();
          doc.rotate(-p.rotate, { origin: [p.x, p.y] });
        }
        doc.text(p.text, p.x - shift, p.y, { lineBreak: false, baseline: 'alphabetic' });
        if (p.rotate) doc.restore();
        break;
      }
    }
  }
  doc.restore();
}
