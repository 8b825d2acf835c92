import { createHash, randomBytes } from 'node:crypto';
import { readFile, rename, writeFile, unlink } from 'node:fs/promises';
import { basename, dirname, join } from 'node:path';
import { fail, ok, type Result } from '../../../shared-core/result.js';
import { openStudyFile } from '../study-file.js';
import type { SigningIdentity } from '../signing/signing-identity.js';
import { layoutChart } from './chart-layout.js';
import { chartSvg } from './chart-svg.js';
import { limitsCsv, limitsJson, limitsTable } from './limits-table.js';
import type { PacketContent } from './packet-content.js';
import type { PacketFacts } from './packet-facts.js';
import { packetContent, packetRevision } from './packet-from-study.js';
import type { Paper } from './packet-pdf.js';
import { buildWorkbookHere, drawPdfHere, startPacketThreads, type PacketThreads } from './packet-threads.js';

export interface PacketFiles {
  pdf: Buffer;
  workbook: Buffer;
  facts: PacketFacts;
  csv: string;
  json: string;
  svg: string;
}

export interface PacketOptions {
  paper: Paper;
  /**
   * The signing key, or the promise of it while it opens (drawing the packet need not wait), or a
   * function that opens it, called once the workbook is built (see packetFiles).
   */
  identity?: SigningIdentity | Promise<SigningIdentity> | (() => Promise<SigningIdentity>);
  onProgress?: (fraction: number, what: string) => void;
  /** Where the workbook and the PDF are made; by default in this thread. makePacket passes its threads. */
  threads?: Pick<PacketThreads, 'buildWorkbook' | 'drawPdf'>;
}

const sha256 = (bytes: Uint8Array) => createHash('sha256').update(bytes).digest('hex');

/**
 * The packet's files in memory: the workbook first (the PDF states its SHA-256), then the PDF
 * with the study and the facts embedded, signed when a key is given; and the limits table as
 * CSV and JSON and the chart as SVG from the same layout as the PDF's chart.
 */
export async function packetFiles(content: PacketContent, options: PacketOptions): Promise<PacketFiles> {
  const progress = options.onProgress ?? (() => undefined);
  progress(0.05, 'workbook');
  const building = (options.threads?.buildWorkbook ?? buildWorkbookHere)(content);
  // The PDF is drawn meanwhile (in a thread of its own when there is one); only its cover waits for
  // the workbook's hash.
  const stated = building.then((workbook) => ({ workbook, facts: packetFacts(content, workbook) }));
  stated.catch(() => undefined); // awaited below; this only marks an early failure as handled
  const facts = stated.then((s) => s.facts);
  facts.catch(() => undefined); // the drawing awaits it only for the cover, after the other pages
  const drawing = (options.threads?.drawPdf ?? drawPdfHere)(content, {
    paper: options.paper,
    facts,
    onProgress: (f) => progress(0.05 + f * 0.8, 'PDF'),
  });
  drawing.catch(() => undefined); // awaited below; this only marks an early failure as handled
  // A key still to be opened opens once the workbook is built: its 600,000 PBKDF2 iterations then
  // take the core the workbook leaves rather than the PDF's, which the signature waits for anyway.
  const key = options.identity;
  const identity = typeof key === 'function' ? building.then(key, key) : key && Promise.resolve(key);
  identity?.catch(() => undefined); // awaited below; this only marks an early failure as handled
  const signer = identity && import('./pdf-signature.js'); // loads while the threads work
  // Made while the threads work: the exports, from the same layout as the PDF's chart.
  const result = content.result;
  const unit = content.identity.inspectionUnit || 'inspection unit';
  const title = `${result.chart} chart: ${content.title}`;
  const exports = {
    csv: limitsCsv(result, unit),
    json: limitsJson(result, unit, content.studyId),
    svg: chartSvg(layoutChart(result, { inspectionUnit: unit, title }, 720, 400), title),
  };
  let pdf = await drawing;
  const { workbook } = await stated;
  if (identity && signer) {
    progress(0.88, 'signature');
    const { signPdf } = await signer;
    pdf = await signPdf(pdf, await identity, {
      reason: `Approval packet, study ${content.studyId}, revision ${content.revision.number}`,
    });
  }
  progress(1, 'done');
  return { pdf, workbook, facts: await facts, ...exports };
}

/** What the PDF states for verify, with the SHA-256 of the workbook exported beside it. */
function packetFacts(content: PacketContent, workbook: Buffer): PacketFacts {
  const result = content.result;
  return {
    format: 'limit-ledger-packet-facts',
    version: 1,
    studyId: content.studyId,
    revision: content.revision.number,
    chart: result.chart,
    limits: result.limits,
    center: result.center,
    rate: result.rate,
    table: limitsTable(result),
    periods: result.periods.map((p) => ({ label: p.label, lcl: p.lcl, ucl: p.ucl, status: p.status })),
    studySha256: content.studyDocument ? sha256(content.studyDocument.bytes) : null,
    workbookSha256: sha256(workbook),
    generatedAt: content.generatedAt,
  };
}

export interface PacketRequest extends PacketOptions {
  studyPath: string;
  pdfPath: string;
  xlsxPath: string;
  /** The packet's time with its zone, as the cover prints it. */
  now: string;
}

/** Reads the study, makes the packet and writes every file (each atomically); returns the paths. */
export async function makePacket(request: PacketRequest): Promise<Result<string[]>> {
  // The threads start first, so that they load exceljs and pdfkit while this one opens the study.
  if (request.threads) return writePacket(request);
  const threads = startPacketThreads();
  try {
    return await writePacket({ ...request, threads });
  } finally {
    await threads.stop();
  }
}

async function writePacket(request: PacketRequest): Promise<Result<string[]>> {
  const opened = await openStudyFile(request.studyPath);
  if (!opened.ok) return opened;
  if (opened.value.readOnly) {
    return fail({
      file: request.studyPath,
      message: `the study’s record does not verify (${opened.value.problems.map((p) => p.message).join('; ')}); no packet is made from it`,
    });
  }
  const study = opened.value.study;
  const revision = packetRevision(study);
  if (!revision) {
    return fail({
      file: request.studyPath,
      message:
        'the study has no revision of its limits yet: sign it first (limit-ledger sign … --meaning prepared)',
    });
  }
  const studyBytes = await readFile(request.studyPath);
  const content = packetContent({
    study,
    revision,
    studyBytes,
    studyFileName: basename(request.studyPath),
    generatedAt: request.now,
  });
  if (!content.ok) return content;
  const files = await packetFiles(content.value, request);
  const stem = request.pdfPath.replace(/\.pdf$/i, '');
  const outputs: [string, Uint8Array | string][] = [
    [request.xlsxPath, files.workbook],
    [request.pdfPath, files.pdf],
    [`${stem}.limits.csv`, files.csv],
    [`${stem}.limits.json`, files.json],
    [`${stem}.chart.svg`, files.svg],
  ];
  // Each file is written and flushed on its own; side by side, their flushes overlap.
  await Promise.all(outputs.map(([path, bytes]) => writeAtomically(path, bytes)));
  return ok(outputs.map(([path]) => path));
}

export async function writeAtomically(path: string, bytes: Uint8Array | string): Promise<void> {
  const temporary = join(dirname(path), `.${basename(path)}.${randomBytes(6).toString('hex')}.tmp`);
  try {
    await writeFile(temporary, bytes, { flush: true });
    await rename(temporary, path);
  } catch (error) {
    await unlink(temporary).catch(() => undefined);
    throw error;
  }
}
