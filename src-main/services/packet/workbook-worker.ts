import { parentPort } from 'node:worker_threads';
import type { PacketContent } from './packet-content.js';
import type { ThreadReply } from './packet-threads.js';

/**
 * Builds the packet's workbook in a worker thread (see packet-threads.ts), so that loading
 * exceljs and filling the sheets run beside the PDF on another core. Loading exceljs starts at
 * once; the content arrives in one message and the workbook goes back as bytes (or the error's
 * message).
 */
const loading = import('./packet-workbook.js');
const reply = (message: ThreadReply) => parentPort?.postMessage(message);

parentPort?.once('message', async (content: PacketContent) => {
  try {
    const { buildWorkbook } = await loading;
    const bytes = await buildWorkbook(content);
    reply({ kind: 'done', bytes: new Uint8Array(bytes.buffer, bytes.byteOffset, bytes.length) });
  } catch (error) {
    reply({ kind: 'failed', message: error instanceof Error ? error.message : String(error) });
  }
});
