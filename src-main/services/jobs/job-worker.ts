/**
 * The worker_threads entry of a job: loads the task table, runs one task, and reports progress and
 * the outcome to the runner. Cancel arrives as a message and aborts the task's signal.
 */
import { parentPort, workerData } from 'node:worker_threads';
import { isAbort, type JobTaskModule, type WorkerInput, type WorkerMessage } from './job-task.js';

const port = parentPort!;
const { taskModule, kind, input, outputPath } = workerData as WorkerInput;
const controller = new AbortController();
const send = (message: WorkerMessage): void => port.postMessage(message);

port.on('message', (message: { type: string }) => {
  if (message.type === 'cancel') controller.abort();
});

let lastProgress = 0;
try {
  const { tasks } = (await import(taskModule)) as JobTaskModule;
  const task = tasks[kind];
  if (task === undefined) throw new Error(`no job of kind "${kind}"`);
  const result = await task(input, {
    signal: controller.signal,
    outputPath,
    progress(fraction, message) {
      // At most about twenty updates a second: progress is for people, not a log.
      const now = Date.now();
      if (now - lastProgress < 50 && fraction < 1) return;
      lastProgress = now;
      send({ type: 'progress', fraction: Math.min(1, Math.max(0, fraction)), message });
    },
  });
  send(controller.signal.aborted ? { type: 'cancelled' } : { type: 'done', result });
} catch (error) {
  if (isAbort(error, controller.signal)) send({ type: 'cancelled' });
  else {
    const findings = (error as { findings?: { message: string }[] }).findings;
    send({ type: 'failed', message: error instanceof Error ? error.message : String(error), findings });
  }
} finally {
  port.close();
}
