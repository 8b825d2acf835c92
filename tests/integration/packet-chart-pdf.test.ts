import { createRequire } from 'node:module';
import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import PDFDocument from 'pdfkit';
import { describe, expect, it } from 'vitest';
import { layoutChart, type ChartDrawing } from '../../src-main/services/packet/chart-layout.js';
import { drawChartOnPdf, type PdfDoc } from '../../src-main/services/packet/chart-pdf.js';
import { inventedContent } from './packet-fixtures.js';
import { run, scratch } from './packet-tools.js';

/**
 * The packet chart, its lines written in one piece and its dots filled as one path per run of one
 * color, renders in poppler without anti-aliasing to the same pixels as every primitive drawn
 * through pdfkit's own calls (the reference below), for histories whose dots overlap and whose
 * signals and exclusions break the runs. Invented data.
 */
const require = createRequire(import.meta.url);
const fonts = { regular: 'Body', bold: 'Body-Bold' };
const folder = scratch('chart-pdf');

/**
 * Every primitive on its own, each line and dot through pdfkit's path methods (how they were drawn
 * before drawChartOnPdf wrote them itself); the rest through drawChartOnPdf.
 */
function referenceChart(doc: PdfDoc, drawing: ChartDrawing, left: number, top: number): void {
  for (const p of drawing.primitives) {
    if (p.kind !== 'circle' && p.kind !== 'polyline') {
      drawChartOnPdf(doc, { ...drawing, primitives: [p] }, left, top, fonts);
      continue;
    }
    doc.save();
    doc.translate(left, top);
    if (p.kind === 'circle') doc.circle(p.x, p.y, p.radius).fill(p.fill);
    else {
      const [first, ...rest] = p.points;
      doc.moveTo(first![0], first![1]);
      for (const [x, y] of rest) doc.lineTo(x, y);
      doc.lineWidth(p.lineWidth);
      if (p.dash) doc.dash(p.dash[0], { space: p.dash[1] });
      doc.stroke(p.stroke);
      if (p.dash) doc.undash();
    }
    doc.restore();
  }
}

async function pdfOf(draw: (doc: PdfDoc) => void): Promise<Buffer> {
  const doc = new PDFDocument({ size: 'A4', info: { CreationDate: new Date('2026-12-01T10:00:00Z') } });
  const chunks: Buffer[] = [];
  doc.on('data', (chunk: Buffer) => chunks.push(chunk));
  const done = new Promise<Buffer>((resolve) => doc.on('end', () => resolve(Buffer.concat(chunks))));
  doc.registerFont(fonts.regular, require.resolve('dejavu-fonts-ttf/ttf/DejaVuSans.ttf'));
  doc.registerFont(fonts.bold, require.resolve('dejavu-fonts-ttf/ttf/DejaVuSans-Bold.ttf'));
  draw(doc);
  doc.end();
  return done;
}

function pixels(pdf: Buffer, name: string): Buffer {
  const path = join(folder, `${name}.pdf`);
  writeFileSync(path, pdf);
  // Without anti-aliasing: dots that overlap blend their soft edges twice when painted one by one
  // and once as one path; with whole pixels the union paints exactly the pixels the dots do.
  run('pdftoppm', ['-r', '110', '-aaVector', 'no', '-singlefile', path, join(folder, name)]);
  return readFileSync(join(folder, `${name}.ppm`));
}

describe('the packet chart in the PDF', () => {
  for (const periods of [40, 900]) {
    it(`renders as every dot drawn on its own (${periods} periods)`, async () => {
      const content = inventedContent(periods);
      const drawing = layoutChart(
        content.result,
        { inspectionUnit: 'one panel', title: 'Invented' },
        495,
        336,
      );
      const dots = drawing.primitives.filter((p) => p.kind === 'circle').length;
      expect(dots).toBeGreaterThan(periods / 2);
      expect(drawing.primitives.some((p) => p.kind === 'polygon' || p.kind === 'rect')).toBe(true);

      const batched = await pdfOf((doc) => drawChartOnPdf(doc, drawing, 50, 80, fonts));
      const reference = await pdfOf((doc) => referenceChart(doc, drawing, 50, 80));
      expect(batched.length).toBeLessThan(reference.length);
      const [mine, theirs] = [
        pixels(batched, `batched-${periods}`),
        pixels(reference, `reference-${periods}`),
      ];
      expect(mine.equals(theirs)).toBe(true);
      // A dot drawn a hair off shows: the comparison sees the marks.
      const shifted = await pdfOf((doc) =>
        drawChartOnPdf(
          doc,
          {
            ...drawing,
            primitives: drawing.primitives.map((p) => (p.kind === 'circle' ? { ...p, x: p.x + 0.6 } : p)),
          },
          50,
          80,
          fonts,
        ),
      );
      expect(pixels(shifted, `shifted-${periods}`).equals(theirs)).toBe(false);
    });
  }
});
