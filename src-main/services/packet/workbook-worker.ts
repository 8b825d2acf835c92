import { parentPort } from 'node:worker_threads';
import type { PacketContent } from './packet-content.js';

/**
 * Builds the packet's workbook in a worker thread (see startWorkbookWorker in make-packet.ts),
 * so that loading exceljs and filling the sheets run beside the PDF's own start on another core.
 * Loading exceljs starts at once; the content arrives in one message and the workbook goes back
 * as bytes (or the error's message).
 */
const loading = import('./packet-workbook.js');
parentPort?.once('message', async (content: PacketContent) => {
  try {
    const { buildWorkbook } = await loading;
    const bytes = await buildWorkbook(content);
    parentPort?.postMessage({
      ok: true,
      bytes: new Uint8Array(bytes.buffer, bytes.byteOffset, bytes.length),
    });
  } catch (error) {
    parentPort?.postMessage({ ok: false, message: error instanceof Error ? error.message : String(error) });
  }
});
