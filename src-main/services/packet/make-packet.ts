import { createHash, randomBytes } from 'node:crypto';
import { existsSync } from 'node:fs';
import { readFile, rename, writeFile, unlink } from 'node:fs/promises';
import { basename, dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { Worker } from 'node:worker_threads';
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
import { signPdf } from './pdf-signature.js';

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
  /** The signing key, or the promise of it while it opens (drawing the packet need not wait). */
  identity?: SigningIdentity | Promise<SigningIdentity>;
  onProgress?: (fraction: number, what: string) => void;
  /** Builds the workbook; by default in this thread. makePacket passes a worker thread's. */
  buildWorkbook?: (content: PacketContent) => Promise<Buffer>;
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
  const building = (options.buildWorkbook ?? buildWorkbookHere)(content);
  // pdfkit loads and the PDF's fonts open while the workbook is built (in a worker, on another core).
  const stated = building.then((workbook) => {
    progress(0.25, 'PDF');
    return { workbook, facts: packetFacts(content, workbook) };
  });
  stated.catch(() => undefined); // awaited below; this only marks an early failure as handled
  const { buildPacketPdf } = await import('./packet-pdf.js');
  let pdf = await buildPacketPdf(content, {
    paper: options.paper,
    facts: stated.then((s) => s.facts),
    onProgress: (f) => progress(0.25 + f * 0.6, 'PDF'),
  });
  const { workbook, facts } = await stated;
  if (options.identity) {
    progress(0.88, 'signature');
    pdf = await signPdf(pdf, await options.identity, {
      reason: `Approval packet, study ${content.studyId}, revision ${content.revision.number}`,
    });
  }
  const result = content.result;
  const unit = content.identity.inspectionUnit || 'inspection unit';
  const drawing = layoutChart(
    result,
    { inspectionUnit: unit, title: `${result.chart} chart: ${content.title}` },
    720,
    400,
  );
  progress(1, 'done');
  return {
    pdf,
    workbook,
    facts,
    csv: limitsCsv(result, unit),
    json: limitsJson(result, unit, content.studyId),
    svg: chartSvg(drawing, `${result.chart} chart: ${content.title}`),
  };
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
  // Started first, so that the worker loads exceljs while this thread opens the study.
  const worker = startWorkbookWorker();
  try {
    return await writePacket(request, worker);
  } finally {
    await worker?.stop();
  }
}

async function writePacket(request: PacketRequest, worker: WorkbookWorker | null): Promise<Result<string[]>> {
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
  const files = await packetFiles(content.value, {
    ...request,
    buildWorkbook: (c) => (worker ? worker.build(c) : buildWorkbookHere(c)),
  });
  const stem = request.pdfPath.replace(/\.pdf$/i, '');
  const outputs: [string, Uint8Array | string][] = [
    [request.xlsxPath, files.workbook],
    [request.pdfPath, files.pdf],
    [`${stem}.limits.csv`, files.csv],
    [`${stem}.limits.json`, files.json],
    [`${stem}.chart.svg`, files.svg],
  ];
  for (const [path, bytes] of outputs) await writeAtomically(path, bytes);
  return ok(outputs.map(([path]) => path));
}

async function buildWorkbookHere(content: PacketContent): Promise<Buffer> {
  const { buildWorkbook } = await import('./packet-workbook.js');
  return buildWorkbook(content);
}

interface WorkbookWorker {
  build(content: PacketContent): Promise<Buffer>;
  stop(): Promise<void>;
}

type WorkerReply = { ok: true; bytes: Uint8Array } | { ok: false; message: string };

/**
 * A worker thread that builds one workbook, or null where there is no built worker script (the
 * TypeScript sources under test): the workbook is then built in this thread, as it is when the
 * worker fails to start or dies.
 */
function startWorkbookWorker(): WorkbookWorker | null {
  const script = new URL('./workbook-worker.js', import.meta.url);
  if (script.protocol !== 'file:' || !existsSync(fileURLToPath(script))) return null;
  let worker: Worker;
  try {
    worker = new Worker(script);
  } catch {
    return null;
  }
  let failed: Error | null = null;
  const reply = new Promise<WorkerReply>((resolve, reject) => {
    worker.once('message', resolve);
    worker.once('error', (error) => reject((failed = error)));
    worker.once('exit', (code) => reject((failed ??= new Error(`the workbook worker stopped (${code})`))));
  });
  reply.catch(() => undefined);
  return {
    async build(content) {
      if (failed) return buildWorkbookHere(content);
      worker.postMessage(content);
      const answer = await reply.catch(() => null);
      if (!answer) return buildWorkbookHere(content);
      if (!answer.ok) throw new Error(answer.message);
      return Buffer.from(answer.bytes.buffer, answer.bytes.byteOffset, answer.bytes.length);
    },
    async stop() {
      await worker.terminate();
    },
  };
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
