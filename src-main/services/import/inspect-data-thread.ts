import { existsSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { Worker } from 'node:worker_threads';
import type { Result } from '../../../shared-core/result.js';
import { inspectData, type DataPreview } from './inspect-data.js';

/** Below this a file is looked at at once: a thread would cost more than it saves. */
export const threadFromBytes = 1 << 20;

/**
 * `inspectData` in a thread of its own for a file of a megabyte or more: a first look decodes the
 * whole file (and loads a whole workbook), which would hold up the host's other requests. Where
 * there is no built worker script (the TypeScript sources under test) the look is taken here.
 */
export async function inspectDataInThread(fileName: string, bytes: Uint8Array): Promise<Result<DataPreview>> {
  const script = new URL('./inspect-data-worker.js', import.meta.url);
  if (bytes.byteLength < threadFromBytes || script.protocol !== 'file:' || !existsSync(fileURLToPath(script)))
    return inspectData(fileName, bytes);
  return new Promise((resolve, reject) => {
    const worker = new Worker(script, { workerData: { fileName, bytes } });
    worker.once('message', (preview: Result<DataPreview>) => resolve(preview));
    worker.once('error', reject);
    worker.once('exit', (code) => reject(new Error(`the look at ${fileName} stopped (exit code ${code})`)));
  });
}
