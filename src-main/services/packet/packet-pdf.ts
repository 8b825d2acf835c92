import { createRequire } from 'node:module';
import PDFDocument from 'pdfkit';
import { layoutChart } from './chart-layout.js';
import { drawChartOnPdf, type PdfDoc } from './chart-pdf.js';
import { limitsTable } from './limits-table.js';
import { factsFileName, type PacketFacts } from './packet-facts.js';
import type { PacketContent } from './packet-content.js';
import { cautions, formulaWords, methodWords, shown, shownProbability } from './packet-words.js';
import { palette } from './chart-layout.js';
import { changeSection } from './change-section-pdf.js';
import { drawTable, type TableColumn } from './pdf-table.js';
import { installLayoutShortcut } from './pdf-text-layout.js';
import { perWhat } from '../../../shared-core/view/scale-words.js';

export type Paper = 'a4' | 'letter';

export interface PdfRequest {
  paper: Paper;
  facts: PacketFacts;
  /** Called with 0…1 as pages are laid out. */
  onProgress?: (fraction: number) => void;
}

const require = createRequire(import.meta.url);
// DejaVu Sans (free licence, npm dejavu-fonts-ttf), embedded so text extracts and prints the same everywhere.
const fontFiles = {
  regular: require.resolve('dejavu-fonts-ttf/ttf/DejaVuSans.ttf'),
  bold: require.resolve('dejavu-fonts-ttf/ttf/DejaVuSans-Bold.ttf'),
};
const fonts = { regular: 'Body', bold: 'Body-Bold' };
const margin = 50;

/**
 * The approval packet as an (unsigned) PDF in memory; pdf-signature.ts signs it. The facts may
 * still be on their way (the workbook's hash, which the cover prints): the cover is drawn last,
 * on the first page left blank for it, so the pages after it need not wait. Those pages start on
 * a page of their own and do not depend on the cover, unless the cover runs over its page (a long
 * reaction plan); then the document is drawn again in order, cover first.
 */
export async function buildPacketPdf(
  content: PacketContent,
  pending: Omit<PdfRequest, 'facts'> & { facts: PacketFacts | Promise<PacketFacts> },
): Promise<Buffer> {
  const coverLast = await drawPacketPdf(content, pending, 'cover last');
  if (coverLast) return coverLast;
  return (await drawPacketPdf(content, { paper: pending.paper, facts: await pending.facts }, 'in order'))!;
}

type DrawingOrder = 'in order' | 'cover last';

/**
 * Draws the packet with the cover in the given order; null when the cover, drawn last, needed
 * more than its one page. Exported for the test that both orders render the same pages.
 */
export async function drawPacketPdf(
  content: PacketContent,
  pending: Omit<PdfRequest, 'facts'> & { facts: PacketFacts | Promise<PacketFacts> },
  order: DrawingOrder,
): Promise<Buffer | null> {
  const doc = new PDFDocument({
    size: pending.paper === 'a4' ? 'A4' : 'LETTER',
    margins: { top: margin + 14, bottom: margin + 10, left: margin, right: margin },
    bufferPages: true,
    autoFirstPage: true,
    pdfVersion: '1.7',
    lang: 'en-US',
    displayTitle: true,
    info: {
      Title: `${content.change ? 'Change packet' : 'Approval packet'}: ${content.title}`,
      Subject: `Control limits, study ${content.studyId}, revision ${content.revision.number}`,
      Creator: 'Limit Ledger',
      Producer: 'Limit Ledger',
    },
  });
  const chunks: Buffer[] = [];
  doc.on('data', (chunk: Buffer) => chunks.push(chunk));
  const done = new Promise<Buffer>((resolve, reject) => {
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', reject);
  });
  doc.registerFont(fonts.regular, fontFiles.regular);
  doc.registerFont(fonts.bold, fontFiles.bold);
  // Numbers and labels skip OpenType shaping that cannot change them (pdf-text-layout.ts).
  // Measuring a word decodes each font's substitution and positioning tables, which the first
  // text would otherwise wait for; it adds nothing to the page or to the embedded subset.
  doc.font(fonts.regular);
  installLayoutShortcut(doc);
  doc.widthOfString('Approval');
  doc.font(fonts.bold);
  installLayoutShortcut(doc);
  doc.widthOfString('Approval');
  doc.font(fonts.regular).fontSize(9.5).fillColor(palette.ink);

  const writer = new PageWriter(doc);
  // Each starts on a page of its own (the change section, else the chart page, adds one).
  const afterCover: ((w: PageWriter, c: PacketContent) => void)[] = [
    (w, c) => changeSection(w, c, fonts),
    chartPage,
    approvedLimits,
    dataTable,
    exclusionLog,
    iterationHistory,
    checks,
    signOffBlock,
    cautionPage,
  ];
  const progress = (stepsDone: number) => pending.onProgress?.(stepsDone / (afterCover.length + 2));
  const drawAfterCover = () =>
    afterCover.forEach((step, i) => {
      step(writer, content);
      progress(i + 2);
    });
  let facts: PacketFacts;
  if (order === 'in order') {
    facts = await pending.facts;
    cover(writer, content, facts);
    progress(1);
    drawAfterCover();
  } else {
    drawAfterCover();
    facts = await pending.facts;
    const pages = doc.bufferedPageRange().count;
    doc.switchToPage(0);
    doc.x = doc.page.margins.left;
    doc.y = doc.page.margins.top;
    cover(writer, content, facts);
    if (doc.bufferedPageRange().count !== pages) return null;
    progress(afterCover.length + 1);
  }

  const factsBytes = Buffer.from(JSON.stringify(facts, null, 2), 'utf8');
  doc.file(factsBytes, {
    name: factsFileName,
    type: 'application/json',
    description: 'What this packet states, for verify',
  });
  if (content.studyDocument) {
    doc.file(Buffer.from(content.studyDocument.bytes), {
      name: content.studyDocument.fileName,
      type: 'application/json',
      description: 'The study document: observations, decisions, audit chain and sign-offs',
    });
  }
  stampEveryPage(doc, content);
  doc.end();
  return done;
}

/** Running text with headings and simple tables that break across pages and repeat their header. */
class PageWriter {
  constructor(readonly doc: PdfDoc) {}

  get width(): number {
    return this.doc.page.width - this.doc.page.margins.left - this.doc.page.margins.right;
  }

  get bottom(): number {
    return this.doc.page.height - this.doc.page.margins.bottom;
  }

  heading(text: string): void {
    if (this.doc.y > this.bottom - 60) this.doc.addPage();
    this.doc
      .moveDown(0.6)
      .font(fonts.bold)
      .fontSize(13)
      .fillColor(palette.center)
      .text(text, this.doc.page.margins.left);
    this.doc.moveDown(0.3).font(fonts.regular).fontSize(9.5).fillColor(palette.ink);
  }

  paragraph(text: string, size = 9.5): void {
    this.doc
      .font(fonts.regular)
      .fontSize(size)
      .fillColor(palette.ink)
      .text(text, this.doc.page.margins.left, undefined, { width: this.width });
    this.doc.moveDown(0.3);
  }

  /** Label: value lines. */
  facts(rows: [string, string][]): void {
    const labelWidth = 140;
    for (const [label, value] of rows) {
      const y = this.doc.y;
      const height = Math.max(
        this.doc
          .font(fonts.regular)
          .fontSize(9.5)
          .heightOfString(value, { width: this.width - labelWidth }),
        12,
      );
      if (y + height > this.bottom) this.doc.addPage();
      const top = this.doc.y;
      this.doc
        .font(fonts.bold)
        .fontSize(9)
        .text(label, this.doc.page.margins.left, top, { width: labelWidth - 8 });
      this.doc
        .font(fonts.regular)
        .fontSize(9.5)
        .text(value, this.doc.page.margins.left + labelWidth, top, { width: this.width - labelWidth });
      this.doc.y = Math.max(this.doc.y, top + height) + 2;
    }
    this.doc.x = this.doc.page.margins.left;
  }

  table(columns: TableColumn[], rows: string[][], size = 7.5): void {
    drawTable(this.doc, columns, rows, { fonts, size });
  }
}

function cover(w: PageWriter, c: PacketContent, facts: PacketFacts): void {
  const doc = w.doc;
  doc
    .font(fonts.bold)
    .fontSize(20)
    .fillColor(palette.center)
    .text(c.change ? 'Change packet: control limits' : 'Approval packet: control limits');
  doc.moveDown(0.2).font(fonts.regular).fontSize(12).fillColor(palette.ink).text(c.title);
  if (c.identity.demo) {
    doc.moveDown(0.5);
    w.paragraph('DEMONSTRATION: the plant, parts and counts in this study are invented.', 10);
  }
  w.heading('Study');
  const result = c.result;
  const excluded = result.periods.filter((p) => p.status === 'excluded').length;
  w.facts([
    ['Study id', c.studyId],
    ['Part', c.identity.part || '(not given)'],
    ['Process step', c.identity.processStep || '(not given)'],
    ['Nonconformity counted', c.identity.characteristic || '(not given)'],
    ['Inspection unit', c.identity.inspectionUnit || '(not given)'],
    ['Owner', c.identity.owner || '(not given)'],
    ...(c.identity.site ? ([['Site', c.identity.site]] as [string, string][]) : []),
    ['Data source', c.source.file],
    ['Source SHA-256', c.source.sha256],
    ['Periods', `${result.periods.length} (${result.m} included, ${excluded} excluded)`],
    ['Σx (included)', String(result.totals.count)],
    ['Σk (included)', shown(result.totals.units, 10)],
    ['Revision', `${c.revision.number} (${c.revision.status})`],
    ['Effective date', c.revision.effectiveDate ?? '(not set)'],
    ['Review date', c.revision.reviewDate ?? '(not set)'],
    ['Packet made', c.generatedAt],
    ['Workbook SHA-256', facts.workbookSha256 ?? '(no workbook exported with this packet)'],
    ['Study file SHA-256', facts.studySha256 ?? '(study not embedded)'],
  ]);
  w.heading('Result');
  w.facts([
    ['Method', methodWords(result)],
    [
      'Center line',
      `${shown(result.center, 6)} ${perWhat(result.chart, c.identity.inspectionUnit, result.periods[0]?.units ?? 1, 'en-US')}`,
    ],
    ['Control limits', limitsSummary(c)],
    ['Stable', result.stable ? 'yes: no included period signals' : 'no: included periods still signal'],
  ]);
  w.heading('Reaction plan');
  w.paragraph(c.revision.reactionPlan?.trim() || '(no reaction plan recorded)');
  w.heading('Caution');
  w.paragraph(cautions[0]!);
}

function limitsSummary(c: PacketContent): string {
  const table = limitsTable(c.result);
  if (table.length === 1) return `UCL ${shown(table[0]!.ucl, 6)}, LCL ${shown(table[0]!.lcl, 6)}`;
  return `stepped with the number of units: ${table.length} values of k, see "Approved limits"`;
}

function chartPage(w: PageWriter, c: PacketContent): void {
  w.doc.addPage();
  w.heading('Chart');
  const height = Math.min(360, w.width * 0.68);
  const drawing = layoutChart(
    c.result,
    {
      inspectionUnit: c.identity.inspectionUnit || 'inspection unit',
      title: `${c.result.chart} chart: ${c.title}`,
    },
    w.width,
    height,
  );
  const top = w.doc.y;
  drawChartOnPdf(w.doc, drawing, w.doc.page.margins.left, top, fonts);
  // Text drawn inside the chart moves pdfkit's cursor; the running text continues below the chart.
  w.doc.x = w.doc.page.margins.left;
  w.doc.y = top + height + 10;
  w.paragraph(
    'Center line solid; control limits dashed (stepped where the number of inspection units changes; no line where there is no lower limit). Dots: periods in control. Triangles: periods that signal. Crossed squares: periods excluded for an assignable cause; they stay on the chart but out of the estimate.',
    8.5,
  );
}

function approvedLimits(w: PageWriter, c: PacketContent): void {
  w.heading('Approved limits');
  w.paragraph(methodWords(c.result));
  for (const line of formulaWords(c.result)) w.paragraph(line);
  const scale = c.result.chart === 'u' ? 'rate per unit' : 'count';
  w.table(
    [
      { header: 'Units k', width: 2, align: 'right' },
      { header: `LCL (${scale})`, width: 3, align: 'right' },
      { header: `Center (${scale})`, width: 3, align: 'right' },
      { header: `UCL (${scale})`, width: 3, align: 'right' },
    ],
    limitsTable(c.result).map((row) => [
      shown(row.units, 8),
      shown(row.lcl, 8),
      shown(c.result.chart === 'u' ? c.result.center : c.result.rate * row.units, 8),
      shown(row.ucl, 8),
    ]),
    8.5,
  );
}

function dataTable(w: PageWriter, c: PacketContent): void {
  w.heading('Data');
  w.table(
    [
      { header: '#', width: 0.7, align: 'right' },
      { header: 'Period', width: 2 },
      { header: 'Row', width: 0.9, align: 'right' },
      { header: 'Count', width: 1, align: 'right' },
      { header: 'Units', width: 1.1, align: 'right' },
      { header: 'Rate', width: 1.4, align: 'right' },
      // Wide enough for six significant digits of a limit down to 0.000001, never cut.
      { header: 'LCL', width: 1.8, align: 'right' },
      { header: 'UCL', width: 1.8, align: 'right' },
      { header: 'Status', width: 1.2 },
      { header: 'Rules', width: 1.9, wrap: true },
    ],
    c.result.periods.map((p, i) => [
      String(i + 1),
      p.label,
      String(p.row),
      String(p.count),
      shown(p.units, 8),
      shown(p.rate, 5),
      shown(p.lcl, 6),
      shown(p.ucl, 6),
      p.status,
      p.rules.join(', '),
    ]),
  );
}

function exclusionLog(w: PageWriter, c: PacketContent): void {
  w.heading('Exclusion log');
  if (c.exclusions.length === 0) return w.paragraph('No period is excluded.');
  w.table(
    [
      { header: 'Period', width: 1.6 },
      { header: 'Cause', width: 1.6, wrap: true },
      { header: 'Description', width: 3.4, wrap: true },
      { header: 'Reference', width: 1.4, wrap: true },
      { header: 'Who', width: 1.4 },
      { header: 'When', width: 2.2, wrap: true },
    ],
    c.exclusions.map((e) => [
      e.label,
      e.cause.category,
      e.cause.description,
      e.cause.reference ?? '',
      e.who,
      readableTime(e.when),
    ]),
  );
}

function iterationHistory(w: PageWriter, c: PacketContent): void {
  w.heading('Iteration history');
  if (c.iterations.length === 0) return w.paragraph('No iterations recorded.');
  w.table(
    [
      { header: 'Step', width: 0.8, align: 'right' },
      { header: 'Excluded', width: 3, wrap: true },
      { header: 'Center', width: 1.4, align: 'right' },
      { header: 'LCL at k̄', width: 1.4, align: 'right' },
      { header: 'UCL at k̄', width: 1.4, align: 'right' },
      { header: 'Signals', width: 3, wrap: true },
    ],
    c.iterations.map((it, i) => [
      String(i + 1),
      it.excluded.join(', ') || '—',
      shown(it.center, 6),
      shown(it.lcl, 6),
      shown(it.ucl, 6),
      it.signals.join(', ') || 'none',
    ]),
  );
}

function checks(w: PageWriter, c: PacketContent): void {
  const r = c.result;
  w.heading('Checks');
  w.facts([
    ['Method and why', methodWords(r)],
    [
      'Dispersion',
      `D = Σ(xᵢ − kᵢū)²/(kᵢū) = ${shown(r.dispersion.statistic, 6)} on ${r.dispersion.df} degrees of freedom; P(χ² ≥ D) = ${shownProbability(r.dispersion.pOver)} (over-dispersion), P(χ² ≤ D) = ${shownProbability(r.dispersion.pUnder)} (under-dispersion). ${r.dispersion.smallExpected} included periods expect fewer than 5 nonconformities. ${r.dispersion.advice}`,
    ],
    [
      'Sufficiency',
      `${r.m} included periods, Σx = ${r.totals.count} over Σk = ${shown(r.totals.units, 10)} units; exact (Garwood) 95 % interval for the rate: ${shown(r.rateInterval.lower, 5)} to ${shown(r.rateInterval.upper, 5)} per unit.`,
    ],
    [
      'Phase I false-alarm probability',
      `${shownProbability(r.fap)}: the chance that at least one of the ${r.m} included periods signals when the process is in control at the center line.`,
    ],
  ]);
  if (r.warnings.length > 0) {
    w.paragraph('Warnings:');
    for (const warning of r.warnings) w.paragraph(`• ${warning.message}`);
  }
}

function signOffBlock(w: PageWriter, c: PacketContent): void {
  w.heading('Sign-off');
  w.paragraph(
    'Each sign-off is an electronic signature over the study’s signed content (observations, decisions, method, limits and revision fields) and the sign-offs before it. It shows the printed name, the date and time with zone, and the meaning of the signature (21 CFR 11.50).',
    8.5,
  );
  if (c.signOffs.length === 0) return w.paragraph('This revision has no sign-offs yet.');
  w.table(
    [
      { header: 'Printed name', width: 2.1, wrap: true },
      { header: 'Role', width: 1.9, wrap: true },
      { header: 'Meaning', width: 1.2 },
      { header: 'Date and time', width: 2.9, wrap: true },
      { header: 'Certificate', width: 1.9, wrap: true },
      { header: 'Signature', width: 2.2, wrap: true },
    ],
    c.signOffs.map((s) => [
      s.printedName,
      s.role,
      s.meaning,
      readableTime(s.time),
      `${s.fingerprint.slice(0, 8)}…${s.selfIssued ? ' self-issued' : ''}`,
      s.state === 'valid'
        ? 'valid'
        : s.state === 'void'
          ? `VOID: ${s.note ?? 'the content changed after signing'}`
          : `INVALID: ${s.note ?? ''}`,
    ]),
    8,
  );
  for (const s of c.signOffs) {
    w.paragraph(
      `${s.printedName}, certificate SHA-256 ${s.fingerprint}${s.selfIssued ? ' (self-issued: nobody but the holder vouches for the name)' : ''}`,
      7.5,
    );
  }
}

/** 2026-12-01T19:31:43.080+01:00 → 2026-12-01 19:31:43 UTC+01:00 (date, time and zone, 21 CFR 11.50). */
function readableTime(iso: string): string {
  const match = /^(\d{4}-\d{2}-\d{2})T(\d{2}:\d{2}:\d{2})(?:\.\d+)?(Z|[+-]\d{2}:\d{2})$/.exec(iso);
  if (!match) return iso;
  return `${match[1]} ${match[2]} UTC${match[3] === 'Z' ? '' : match[3]}`;
}

function cautionPage(w: PageWriter): void {
  w.heading('Cautions');
  for (const caution of cautions) w.paragraph(`• ${caution}`);
}

/** The study identity at the top and "page i of n" at the bottom of every page. */
function stampEveryPage(doc: PdfDoc, c: PacketContent): void {
  const range = doc.bufferedPageRange();
  for (let i = range.start; i < range.start + range.count; i++) {
    doc.switchToPage(i);
    const bottomMargin = doc.page.margins.bottom;
    doc.page.margins.bottom = 0;
    const left = doc.page.margins.left;
    const width = doc.page.width - left - doc.page.margins.right;
    doc.font(fonts.regular).fontSize(7.5).fillColor(palette.excluded);
    doc.text(
      `Limit Ledger · study ${c.studyId} · revision ${c.revision.number} · ${c.title}`,
      left,
      margin - 18,
      { width, lineBreak: false, ellipsis: true },
    );
    doc.text(`Page ${i + 1} of ${range.count}`, left, doc.page.height - margin + 6, {
      width,
      align: 'right',
      lineBreak: false,
    });
    doc.page.margins.bottom = bottomMargin;
  }
}
