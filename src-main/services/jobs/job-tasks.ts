/**
 * The long work the hosts run in workers: import, packet export and signing. Each task calls its
 * service with the job's AbortSignal and progress reporter.
 */
import type { ImportRequest } from '../import/import-request.js';
import { importBytes } from '../import/import-file.js';
import type { JobTask } from './job-task.js';

const notYet =
  (what: string): JobTask =>
  async () => {
    throw new Error(`${what} is not part of this build yet`);
  };

/** Import phases as rough fractions of the whole, so a bar moves even where a phase has no count. */
const importPhases = { reading: 0.1, checking: 0.2, decoding: 0.4, validating: 0.8 } as const;

const importData: JobTask = async (input, { signal, progress }) => {
  const { fileName, bytes, request } = input as {
    fileName: string;
    bytes: Uint8Array;
    request: ImportRequest;
  };
  const outcome = await importBytes(fileName, bytes, request, signal, {
    onProgress: ({ phase, fraction }) => {
      const start = importPhases[phase];
      const end = phase === 'validating' ? 1 : start + 0.2;
      progress(start + (fraction ?? 0) * (end - start), `${phase} ${fileName}`);
    },
  });
  if (signal.aborted) throw Object.assign(new Error('cancelled'), { name: 'AbortError' });
  return outcome;
};

export const tasks: Record<string, JobTask> = {
  importData,
  exportPacket: notYet('exporting the packet'),
  signStudy: notYet('signing'),
};
