import { parentPort } from 'node:worker_threads';
import type { PacketFacts } from './packet-facts.js';
import type { PdfThreadMessage, ThreadReply } from './packet-threads.js';
import { deferWoff2Decoder } from './woff2-on-demand.js';

/**
 * Draws the packet's PDF in a worker thread (see packet-threads.ts). pdfkit and its fonts load at
 * once, while the main thread is still opening the study; the content arrives in one message and
 * the facts (the workbook's hash, which the cover prints) in a later one, so the pages after the
 * cover are drawn meanwhile. The unsigned PDF goes back as bytes (or the error's message).
 */
deferWoff2Decoder();
const loading = import('./packet-pdf.js');
let factsArrived: (facts: PacketFacts) => void = () => undefined;
const facts = new Promise<PacketFacts>((resolve) => (factsArrived = resolve));
const reply = (message: ThreadReply) => parentPort?.postMessage(message);

parentPort?.on('message', async (message: PdfThreadMessage) => {
  if (message.kind === 'facts') return factsArrived(message.facts);
  try {
    const { buildPacketPdf } = await loading;
    const pdf = await buildPacketPdf(message.content, {
      paper: message.paper,
      facts,
      onProgress: (fraction) => reply({ kind: 'progress', fraction }),
    });
    reply({ kind: 'done', bytes: new Uint8Array(pdf.buffer, pdf.byteOffset, pdf.length) });
  } catch (error) {
    reply({ kind: 'failed', message: error instanceof Error ? error.message : String(error) });
  }
});
