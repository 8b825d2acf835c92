import { existsSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { Worker } from 'node:worker_threads';
import type { PacketContent } from './packet-content.js';
import type { PacketFacts } from './packet-facts.js';
import type { Paper } from './packet-pdf.js';

/** What a packet thread sends back: progress, then the bytes it made or why it could not. */
export type ThreadReply =
  | { kind: 'progress'; fraction: number }
  | { kind: 'done'; bytes: Uint8Array }
  | { kind: 'failed'; message: string };

/** What the PDF thread is sent: the content to draw, then the facts the cover prints. */
export type PdfThreadMessage =
  { kind: 'content'; content: PacketContent; paper: Paper } | { kind: 'facts'; facts: PacketFacts };

export interface PdfJob {
  paper: Paper;
  facts: Promise<PacketFacts>;
  onProgress?: (fraction: number) => void;
}

/**
 * The packet's two worker threads: one builds the workbook, one draws the PDF, each on a core of
 * its own. Started before the study's own modules load, so that exceljs and pdfkit load while this
 * thread opens the study. Where a thread's built script is missing (the TypeScript sources under
 * test) or it cannot start, its work is done in this thread, as it is when a thread dies.
 */
export interface PacketThreads {
  buildWorkbook(content: PacketContent): Promise<Buffer>;
  drawPdf(content: PacketContent, job: PdfJob): Promise<Buffer>;
  stop(): Promise<void>;
}

export function startPacketThreads(): PacketThreads {
  const workbook = startThread('./workbook-worker.js');
  const pdf = startThread('./pdf-worker.js');
  return {
    async buildWorkbook(content) {
      const bytes = workbook && (await workbook.run([content]));
      return bytes ? Buffer.from(bytes.buffer, bytes.byteOffset, bytes.length) : buildWorkbookHere(content);
    },
    async drawPdf(content, job) {
      if (!pdf) return drawPdfHere(content, job);
      const drawn = pdf.run(
        [{ kind: 'content', content, paper: job.paper } satisfies PdfThreadMessage],
        job.onProgress,
      );
      job.facts.then(
        (facts) => pdf.send({ kind: 'facts', facts } satisfies PdfThreadMessage),
        () => undefined, // the caller meets the failure where it awaits the facts itself
      );
      // The cover waits for the facts: a workbook that fails ends the wait, with its error.
      const [bytes] = await Promise.all([drawn, job.facts]);
      return bytes ? Buffer.from(bytes.buffer, bytes.byteOffset, bytes.length) : drawPdfHere(content, job);
    },
    async stop() {
      await Promise.all([workbook?.stop(), pdf?.stop()]);
    },
  };
}

export async function buildWorkbookHere(content: PacketContent): Promise<Buffer> {
  const { buildWorkbook } = await import('./packet-workbook.js');
  return buildWorkbook(content);
}

export async function drawPdfHere(content: PacketContent, job: PdfJob): Promise<Buffer> {
  const { buildPacketPdf } = await import('./packet-pdf.js');
  return buildPacketPdf(content, job);
}

interface OneJobThread {
  /** Posts the messages; the bytes made, or null when the thread died or never started. */
  run(messages: unknown[], onProgress?: (fraction: number) => void): Promise<Uint8Array | null>;
  send(message: unknown): void;
  stop(): Promise<void>;
}

/**
 * The threads' young generation, where V8 puts new objects. What they allocate lives briefly (laid-out
 * text, XML strings, table rows); a small young generation is collected more often but keeps the
 * memory they touch small, so the kernel maps fewer fresh pages: packets of 50 to 5,000 periods
 * are made faster with 8 MB than with V8's default (npm run bench).
 */
const youngGenerationMb = 8;

function startThread(path: string): OneJobThread | null {
  const script = new URL(path, import.meta.url);
  if (script.protocol !== 'file:' || !existsSync(fileURLToPath(script))) return null;
  let worker: Worker;
  try {
    worker = new Worker(script, { resourceLimits: { maxYoungGenerationSizeMb: youngGenerationMb } });
  } catch {
    return null;
  }
  let progress: ((fraction: number) => void) | undefined;
  const ended = new Promise<ThreadReply | null>((resolve) => {
    worker.on('message', (reply: ThreadReply) => {
      if (reply.kind === 'progress') progress?.(reply.fraction);
      else resolve(reply);
    });
    worker.once('error', () => resolve(null));
    worker.once('exit', () => resolve(null));
  });
  return {
    async run(messages, onProgress) {
      progress = onProgress;
      for (const message of messages) worker.postMessage(message);
      const reply = await ended;
      if (!reply || reply.kind === 'progress') return null;
      if (reply.kind === 'failed') throw new Error(reply.message);
      return reply.bytes;
    },
    send(message) {
      worker.postMessage(message);
    },
    async stop() {
      await worker.terminate();
    },
  };
}
