import { changePointInWords } from '../../../shared-core/view/change-words.js';
import { perWhat } from '../../../shared-core/view/scale-words.js';
import type { AnalysisResult } from '../../../shared-core/study/analysis-types.js';
import { beforeAfterDrawing, drawArlCurve } from './change-chart-pdf.js';
import { drawChartOnPdf, type PdfDoc, type PdfFonts } from './chart-pdf.js';
import { limitsTable } from './limits-table.js';
import type { ChangeContent, PacketContent } from './packet-content.js';
import {
  arlWords,
  comparisonWords,
  methodWords,
  ratioShown,
  shown,
  shownProbability,
  signOffWords,
} from './packet-words.js';

/** The part of the packet's page writer (packet-pdf.ts) that the change section writes with. */
export interface SectionWriter {
  readonly doc: PdfDoc;
  readonly width: number;
  readonly bottom: number;
  heading(text: string): void;
  paragraph(text: string, size?: number): void;
  facts(rows: [string, string][]): void;
  table(
    columns: { header: string; width: number; align?: 'left' | 'right'; wrap?: boolean }[],
    rows: string[][],
    size?: number,
  ): void;
}

/**
 * "Limit change": on its own pages after the cover of a change packet, everything a manager needs
 * to decide the change: the reason, the revision it replaces with its sign-offs and limits, the
 * exact rate comparison, old against new limits at typical k (wider ones flagged), the average run
 * lengths as a table and a curve, the check for a step in the rate, and the before/after chart.
 */
export function changeSection(w: SectionWriter, c: PacketContent, fonts: PdfFonts): void {
  const change = c.change;
  if (!change) return;
  const { evidence, approved } = change;
  const scale = (r: AnalysisResult) => (r.chart === 'u' ? 'rate per unit' : 'count');
  w.doc.addPage();
  w.heading('Limit change');
  w.paragraph(
    `Revision ${c.revision.number} (${c.revision.status}) would replace the approved revision ${approved.number}. ${
      evidence.wider
        ? 'The proposed limits are WIDER than the approved ones at some k: a wider limit lets a worse process pass unsignalled, so this change needs extra scrutiny.'
        : 'The proposed limits are not wider than the approved ones at the k shown.'
    }`,
  );
  w.facts([
    ['Reason for the change', change.reasonWords ?? change.reasonCategory ?? '(no category recorded)'],
    ['In the proposer’s words', change.reason || '(not given)'],
    ['Replaces', replacedWords(change, c.identity.inspectionUnit)],
    ['Approved sign-offs', approved.signOffs.map(signOffWords).join('\n') || '(none)'],
    ['Approved study', studyWords(approved.result)],
    ['Proposed study', studyWords(c.result)],
  ]);

  w.heading('Rate comparison');
  const test = evidence.comparison;
  const words = comparisonWords(test);
  w.facts([
    ['Rate ratio', `${ratioShown(test.ratio)} (new rate / approved rate)`],
    [
      `${Math.round(test.confidence * 100)} % interval`,
      `${ratioShown(test.ciLow)} to ${test.ciHigh === null ? 'no upper bound' : ratioShown(test.ciHigh)}`,
    ],
    ['p-value, two-sided', shownProbability(test.pValue)],
    ['Test', words.test],
    ['Interval', words.interval],
    ['Reading', words.reading],
  ]);
  for (const warning of evidence.warnings) w.paragraph(`• ${warning.message}`, 8.5);

  w.heading('Old and new limits at typical k');
  w.table(
    [
      { header: 'Units k', width: 1.2, align: 'right' },
      { header: 'Old center', width: 1.6, align: 'right' },
      { header: 'Old LCL', width: 1.5, align: 'right' },
      { header: 'Old UCL', width: 1.5, align: 'right' },
      { header: 'New center', width: 1.6, align: 'right' },
      { header: 'New LCL', width: 1.5, align: 'right' },
      { header: 'New UCL', width: 1.5, align: 'right' },
      { header: 'Wider?', width: 1.8 },
    ],
    evidence.limits.map((l) => [
      shown(l.units, 6),
      shown(l.approved.center, 6),
      shown(l.approved.lcl, 6),
      shown(l.approved.ucl, 6),
      shown(l.proposed.center, 6),
      shown(l.proposed.lcl, 6),
      shown(l.proposed.ucl, 6),
      l.wider ? 'WIDER' : 'no',
    ]),
    8.5,
  );
  w.paragraph(
    `Old: the approved revision; new: the proposed one. k: the smallest, mean and largest number of units of the proposed study’s included periods. Values on each study’s plotted scale (approved: ${scale(approved.result)}; proposed: ${scale(c.result)}). A proposed UCL above the approved one is flagged: a worse rate would pass unsignalled.`,
    8,
  );

  w.heading('Average run length');
  if (evidence.arl) {
    const { approved: before, proposed: after } = evidence.arl;
    w.paragraph(arlWords(evidence.arl), 8.5);
    const labels = [
      'in control',
      ...after.points.slice(1).map((p) => `rate +${shown((p.shift - 1) * 100, 4)} %`),
    ];
    w.table(
      [
        { header: 'Rate', width: 2 },
        { header: 'Approved limits: periods to a signal', width: 3, align: 'right' },
        { header: 'Proposed limits: periods to a signal', width: 3, align: 'right' },
      ],
      labels.map((label, i) => [label, arlShown(before.points[i]?.arl), arlShown(after.points[i]?.arl)]),
      8.5,
    );
  } else {
    w.paragraph(`No run lengths: ${evidence.arlNote ?? 'they cannot be computed for these rules'}.`);
  }
  if (change.arlCurve) {
    const size = { width: w.width, height: Math.min(220, w.width * 0.42) };
    if (w.doc.y + size.height > w.bottom) w.doc.addPage();
    const top = w.doc.y;
    drawArlCurve(w.doc, change.arlCurve, w.doc.page.margins.left, top, size, fonts);
    w.doc.x = w.doc.page.margins.left;
    w.doc.y = top + size.height + 6;
    w.paragraph(
      'Each curve: the expected number of periods until the limits signal when the process runs at the rate on the x axis (a multiple of the approved rate). Approved limits dashed, proposed solid; the dotted guides mark the approved rate and the new one.',
      8,
    );
  }

  w.heading('Check for a step in the rate');
  if (evidence.changePoint) {
    const point = evidence.changePoint;
    const said = changePointInWords(point);
    w.paragraph(said.proposal);
    w.paragraph(
      `Likelihood-ratio statistic for one step in a Poisson rate over the approved periods followed by the proposed ones: G = ${shown(point.statistic, 5)} (Worsley 1986). ${said.reproduce} It proposes where the history splits; the user decides.`,
      8.5,
    );
  } else {
    w.paragraph('Too few included periods for the check (at least three are needed).');
  }

  const height = Math.min(300, w.width * 0.58);
  w.heading('Before and after');
  if (w.doc.y + height > w.bottom) w.doc.addPage();
  const drawing = beforeAfterDrawing(
    approved.result,
    c.result,
    `Before and after: revision ${approved.number} approved, revision ${c.revision.number} proposed`,
    c.identity.inspectionUnit || 'inspection unit',
    w.width,
    height,
  );
  const top = w.doc.y;
  drawChartOnPdf(w.doc, drawing, w.doc.page.margins.left, top, fonts);
  w.doc.x = w.doc.page.margins.left;
  w.doc.y = top + height + 8;
  w.paragraph(
    'Left of the dotted divider: the approved revision’s periods on its limits. Right: the proposed study’s periods on the proposed limits. Marks as on the chart page.',
    8,
  );

  w.heading(`Approved revision ${approved.number}: limits and periods`);
  w.paragraph(methodWords(approved.result), 8.5);
  w.table(
    [
      { header: 'Units k', width: 2, align: 'right' },
      { header: `LCL (${scale(approved.result)})`, width: 3, align: 'right' },
      { header: `Center (${scale(approved.result)})`, width: 3, align: 'right' },
      { header: `UCL (${scale(approved.result)})`, width: 3, align: 'right' },
    ],
    limitsTable(approved.result).map((row) => [
      shown(row.units, 8),
      shown(row.lcl, 8),
      shown(approved.result.chart === 'u' ? approved.result.center : approved.result.rate * row.units, 8),
      shown(row.ucl, 8),
    ]),
    8.5,
  );
  w.table(
    [
      { header: 'Period', width: 2.4 },
      { header: 'Count', width: 1.1, align: 'right' },
      { header: 'Units', width: 1.1, align: 'right' },
      { header: 'Rate', width: 1.3, align: 'right' },
      { header: 'Status', width: 1.2 },
    ],
    approved.result.periods.map((p) => [
      p.label,
      String(p.count),
      shown(p.units, 8),
      shown(p.rate, 5),
      p.status,
    ]),
  );
}

function replacedWords(change: ChangeContent, unit: string): string {
  const a = change.approved;
  const per = perWhat(a.result.chart, unit, a.result.periods[0]?.units ?? 1, 'en-US');
  return `revision ${a.number} (approved), effective ${a.effectiveDate ?? '(not set)'}, review ${a.reviewDate ?? '(not set)'}; center ${shown(a.result.center, 6)} ${per}`;
}

function studyWords(r: AnalysisResult): string {
  const first = r.periods[0]?.label ?? '';
  const last = r.periods[r.periods.length - 1]?.label ?? '';
  return `${r.periods.length} periods, ${first} to ${last} (${r.m} included); Σx = ${r.totals.count}, Σk = ${shown(r.totals.units, 10)}, rate ${shown(r.rate, 6)} per unit`;
}

const arlShown = (arl: number | null | undefined) =>
  arl === null || arl === undefined ? 'never (no count signals)' : shown(arl, 4);
