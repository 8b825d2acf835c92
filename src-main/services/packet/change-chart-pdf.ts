import type { AnalysisResult } from '../../../shared-core/study/analysis-types.js';
import { beforeAfterSeries } from '../../../shared-core/view/change-chart.js';
import { curveLayout, decadeLabel, type ArlCurve } from '../../../shared-core/view/arl-curve.js';
import { layoutChart, palette, type ChartDrawing } from './chart-layout.js';
import type { PdfDoc, PdfFonts } from './chart-pdf.js';

/** layoutChart's plot margins: the divider between the two studies is placed on its x scale. */
const plotMargin = { left: 58, right: 14, top: 34, bottom: 46 };

/**
 * The before/after chart of a change: the approved periods on the approved limits, then the
 * proposed study's periods on the proposed limits, on one scale (beforeAfterSeries decides counts
 * or rates), drawn with the packet's own chart layout and a dotted divider between the two.
 */
export function beforeAfterDrawing(
  approved: AnalysisResult,
  proposed: AnalysisResult,
  title: string,
  inspectionUnit: string,
  width: number,
  height: number,
): ChartDrawing {
  const joined = beforeAfterSeries(approved, proposed);
  const onRate = joined.series.scale === 'rate';
  const scale = (value: number | null, units: number, chart: 'c' | 'u') =>
    value === null || !onRate || chart === 'u' ? value : value / units;
  const periods = [
    ...approved.periods.map((p) => ({ p, chart: approved.chart })),
    ...proposed.periods.map((p) => ({ p, chart: proposed.chart })),
  ].map(({ p, chart }) => ({
    ...p,
    center: scale(p.center, p.units, chart)!,
    ucl: scale(p.ucl, p.units, chart)!,
    lcl: scale(p.lcl, p.units, chart),
  }));
  const merged: AnalysisResult = { ...proposed, chart: onRate ? 'u' : 'c', periods };
  const drawing = layoutChart(merged, { inspectionUnit, title }, width, height);
  const plotWidth = width - plotMargin.left - plotMargin.right;
  const x = plotMargin.left + (joined.approvedCount / periods.length) * plotWidth;
  const top = plotMargin.top;
  const bottom = height - plotMargin.bottom;
  drawing.primitives.push(
    {
      kind: 'polyline',
      points: [
        [x, top],
        [x, bottom],
      ],
      stroke: palette.ink,
      lineWidth: 0.8,
      dash: [1.5, 2.5],
    },
    { kind: 'text', x: x - 4, y: top + 10, text: 'approved', size: 7.5, color: palette.ink, anchor: 'end' },
    { kind: 'text', x: x + 4, y: top + 10, text: 'proposed', size: 7.5, color: palette.ink, anchor: 'start' },
  );
  return drawing;
}

/**
 * The run-length curve as PDF vector graphics, on the screen's layout (curveLayout): approved
 * limits dashed slate, proposed solid teal, log y axis by decades, guides at each in-control rate.
 */
export function drawArlCurve(
  doc: PdfDoc,
  curve: ArlCurve,
  left: number,
  top: number,
  size: { width: number; height: number },
  fonts: PdfFonts,
): void {
  const layout = curveLayout(curve, size);
  const { margin, width, height } = layout;
  doc.save();
  doc.translate(left, top);
  doc.rect(0, 0, width, height).fill(palette.background);
  doc.font(fonts.regular).fontSize(7).fillColor(palette.ink);
  for (const d of layout.decades) {
    const y = layout.y(d);
    doc
      .moveTo(margin.left, y)
      .lineTo(width - margin.right, y)
      .lineWidth(0.4)
      .stroke(palette.grid);
    doc.fillColor(palette.ink).text(decadeLabel(d), 0, y - 3, {
      width: margin.left - 5,
      align: 'right',
      lineBreak: false,
    });
  }
  const lowX = curve.ratios[0]!;
  const highX = curve.ratios[curve.ratios.length - 1]!;
  const step = highX - lowX > 4 ? 1 : 0.5;
  for (let t = Math.ceil(lowX / step) * step; t <= highX + 1e-9; t += step)
    doc.text(String(Number(t.toFixed(2))), layout.x(t) - 15, height - margin.bottom + 5, {
      width: 30,
      align: 'center',
      lineBreak: false,
    });
  const guide = (ratio: number, color: string, label: string, row: number) => {
    const x = layout.x(ratio);
    doc
      .moveTo(x, margin.top)
      .lineTo(x, height - margin.bottom)
      .lineWidth(0.8)
      .dash(2, { space: 3 })
      .stroke(color)
      .undash();
    doc.fillColor(color).text(label, x + 3, margin.top + 3 + 10 * row, { lineBreak: false });
  };
  guide(1, palette.center, 'approved rate', 1);
  guide(curve.proposedRatio, palette.limit, 'new rate', 0);
  const line = (values: (number | null)[], color: string, dashed: boolean) => {
    let started = false;
    values.forEach((v, i) => {
      if (v === null || v > layout.high) {
        if (started) stroke(color, dashed);
        started = false;
        return;
      }
      const [x, y] = [layout.x(curve.ratios[i]!), layout.y(v)];
      if (started) doc.lineTo(x, y);
      else doc.moveTo(x, y);
      started = true;
    });
    if (started) stroke(color, dashed);
  };
  const stroke = (color: string, dashed: boolean) => {
    doc.lineWidth(1.6);
    if (dashed) doc.dash(5, { space: 3 });
    doc.stroke(color);
    if (dashed) doc.undash();
  };
  line(curve.approved, palette.center, true);
  line(curve.proposed, palette.limit, false);
  doc
    .rect(margin.left, margin.top, width - margin.left - margin.right, height - margin.top - margin.bottom)
    .lineWidth(0.6)
    .stroke(palette.ink);
  doc.font(fonts.bold).fontSize(8.5).fillColor(palette.ink);
  doc.text('Average run length of approved and proposed limits', margin.left, 8, { lineBreak: false });
  doc.font(fonts.regular).fontSize(7);
  doc.text('rate as a multiple of the approved rate', margin.left, height - 14, {
    width: width - margin.left - margin.right,
    align: 'center',
    lineBreak: false,
  });
  doc.save();
  doc.rotate(-90, { origin: [10, margin.top + (height - margin.top - margin.bottom) / 2] });
  doc.text('periods to a signal (log)', -40, margin.top + (height - margin.top - margin.bottom) / 2 - 3, {
    width: 100,
    align: 'center',
    lineBreak: false,
  });
  doc.restore();
  // Legend, top right.
  const legendX = width - margin.right - 150;
  const legendY = 12;
  doc
    .moveTo(legendX, legendY)
    .lineTo(legendX + 18, legendY)
    .lineWidth(1.6)
    .dash(5, { space: 3 });
  doc.stroke(palette.center).undash();
  doc.fillColor(palette.ink).text('approved', legendX + 22, legendY - 3.5, { lineBreak: false });
  doc
    .moveTo(legendX + 75, legendY)
    .lineTo(legendX + 93, legendY)
    .lineWidth(1.6)
    .stroke(palette.limit);
  doc.fillColor(palette.ink).text('proposed', legendX + 97, legendY - 3.5, { lineBreak: false });
  doc.restore();
}
