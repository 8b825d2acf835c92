/**
 * The long work the hosts run in workers: import, packet export and signing. Each task calls its
 * service with the job's AbortSignal and progress reporter.
 */
import type { JobTask } from './job-task.js';

const notYet =
  (what: string): JobTask =>
  async () => {
    throw new Error(`${what} is not part of this build yet`);
  };

export const tasks: Record<string, JobTask> = {
  importData: notYet('importing a data file'),
  exportPacket: notYet('exporting the packet'),
  signStudy: notYet('signing'),
};
