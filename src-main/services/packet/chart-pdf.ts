import type PDFDocument from 'pdfkit';
import type { ChartDrawing } from './chart-layout.js';
import { pdfNumber } from './pdf-number.js';

export type PdfDoc = InstanceType<typeof PDFDocument>;

export interface PdfFonts {
  regular: string;
  bold: string;
}

/**
 * Draws the laid-out chart as PDF vector graphics with its top-left corner at (left, top).
 *
 * Lines and dots are written as the operators pdfkit's path methods write, a line or a run of
 * dots in one write rather than one per point. Dots of one color that follow each other (the
 * in-control periods of a long history) are one path filled once, without a color and a fill
 * operator per dot; filled in one color, their union paints the same pixels
 * (tests/integration/packet-chart-pdf.test.ts renders both with poppler).
 */
export function drawChartOnPdf(
  doc: PdfDoc,
  drawing: ChartDrawing,
  left: number,
  top: number,
  fonts: PdfFonts,
): void {
  doc.save();
  doc.translate(left, top);
  let dots: string[] = [];
  let dotFill = '';
  const fillDots = () => {
    if (dots.length === 0) return;
    doc.addContent(dots.join('\n'));
    doc.fill(dotFill);
    dots = [];
  };
  for (const p of drawing.primitives) {
    if (p.kind === 'circle') {
      if (p.fill !== dotFill) fillDots();
      dotFill = p.fill;
      dots.push(circlePath(p.x, p.y, p.radius));
      continue;
    }
    fillDots();
    switch (p.kind) {
      case 'rect':
        doc.rect(p.x, p.y, p.width, p.height);
        if (p.fill && p.stroke) doc.lineWidth(p.lineWidth ?? 1).fillAndStroke(p.fill, p.stroke);
        else if (p.fill) doc.fill(p.fill);
        else if (p.stroke) doc.lineWidth(p.lineWidth ?? 1).stroke(p.stroke);
        break;
      case 'polyline': {
        if (p.points.length === 0) break;
        // The moveTo and lineTo operators pdfkit writes, in one write rather than one per point.
        doc.addContent(
          p.points.map(([x, y], i) => `${pdfNumber(x)} ${pdfNumber(y)} ${i === 0 ? 'm' : 'l'}`).join('\n'),
        );
        doc.lineWidth(p.lineWidth);
        if (p.dash) doc.dash(p.dash[0], { space: p.dash[1] });
        doc.stroke(p.stroke);
        if (p.dash) doc.undash();
        break;
      }
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
  fillDots();
  doc.restore();
}

/** pdfkit's KAPPA, written as it is there so that the control points come out to the same digits. */
const kappa = 4.0 * ((Math.sqrt(2) - 1.0) / 3.0);

/** The operators of pdfkit's `circle(x, y, r)`: a move, four Bézier quarter arcs, a close. */
function circlePath(cx: number, cy: number, r: number): string {
  const n = pdfNumber;
  const [x, y] = [cx - r, cy - r];
  const o = r * kappa;
  const [xe, ye, xm, ym] = [x + r * 2, y + r * 2, x + r, y + r];
  return [
    `${n(x)} ${n(ym)} m`,
    `${n(x)} ${n(ym - o)} ${n(xm - o)} ${n(y)} ${n(xm)} ${n(y)} c`,
    `${n(xm + o)} ${n(y)} ${n(xe)} ${n(ym - o)} ${n(xe)} ${n(ym)} c`,
    `${n(xe)} ${n(ym + o)} ${n(xm + o)} ${n(ye)} ${n(xm)} ${n(ye)} c`,
    `${n(xm - o)} ${n(ye)} ${n(x)} ${n(ym + o)} ${n(x)} ${n(ym)} c`,
    'h',
  ].join('\n');
}
