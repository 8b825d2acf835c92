import { randomBytes } from 'node:crypto';
import { existsSync } from 'node:fs';
import { rename, rm } from 'node:fs/promises';
import { basename, dirname, join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { Worker } from 'node:worker_threads';
import type { JobEvent } from '../../../shared-core/api.js';
import type { WorkerInput, WorkerMessage } from './job-task.js';

export interface StartOptions {
  /** The file the job produces; it is written to a temporary name beside it and renamed on success. */
  outputTarget?: string;
  /** Turns the task's result into the value of the job's `done` event (e.g. issues a file handle). */
  finish?: (result: unknown) => Promise<unknown> | unknown;
}

interface RunningJob {
  worker: Worker;
  outputPath: string | null;
  settled: Promise<void>;
  cancelling: boolean;
}

/**
 * Runs long work (import, export, signing) in worker threads, one worker per job, so the main
 * process and the web host stay responsive. Each job has an id, reports progress, and can be
 * cancelled: the worker's AbortSignal fires, and a worker that does not stop within the grace time
 * is terminated. A cancelled or failed job leaves no output behind: its temporary file is removed and
 * the target is never touched.
 */
export class JobRunner {
  private readonly running = new Map<string, RunningJob>();
  private readonly last = new Map<string, JobEvent>();

  constructor(
    private readonly publish: (event: JobEvent) => void,
    private readonly taskModule: string = defaultTaskModule(),
    private readonly graceMs = 2000,
  ) {}

  start(kind: string, input: unknown, options: StartOptions = {}): string {
    const jobId = `job-${randomBytes(12).toString('base64url')}`;
    const outputPath = options.outputTarget
      ? join(dirname(options.outputTarget), `.${basename(options.outputTarget)}.${jobId}.part`)
      : null;
    const workerInput: WorkerInput = { taskModule: this.taskModule, kind, input, outputPath };
    const worker = new Worker(workerScript(), { workerData: workerInput });
    let finished = false;
    let settling: Promise<void> | null = null;

    // The first outcome wins; a later one (the worker's exit after its last message) waits for it.
    const settle = (message: WorkerMessage | { type: 'crashed'; message: string }): Promise<void> =>
      (settling ??= conclude(message));
    const conclude = async (message: WorkerMessage | { type: 'crashed'; message: string }): Promise<void> => {
      finished = true;
      this.running.delete(jobId);
      let event: JobEvent;
      if (message.type === 'done' && !job.cancelling) {
        try {
          if (outputPath && options.outputTarget) await rename(outputPath, options.outputTarget);
          const result = options.finish ? await options.finish(message.result) : message.result;
          event = { jobId, state: 'done', result };
        } catch (error) {
          event = { jobId, state: 'failed', findings: [{ message: describeError(error) }] };
        }
      } else if (message.type === 'cancelled' || job.cancelling) {
        event = { jobId, state: 'cancelled' };
      } else if (message.type === 'failed') {
        event = {
          jobId,
          state: 'failed',
          findings: message.findings?.length ? message.findings : [{ message: message.message }],
        };
      } else {
        event = {
          jobId,
          state: 'failed',
          findings: [{ message: message.type === 'crashed' ? message.message : 'the job stopped' }],
        };
      }
      if (event.state !== 'done' && outputPath) await rm(outputPath, { force: true });
      this.remember(event);
    };

    let resolveSettled!: () => void;
    const job: RunningJob = {
      worker,
      outputPath,
      cancelling: false,
      settled: new Promise((resolve) => (resolveSettled = resolve)),
    };
    this.running.set(jobId, job);
    this.remember({ jobId, state: 'progress', fraction: 0, message: 'starting' });

    worker.on('message', (message: WorkerMessage) => {
      if (message.type === 'progress') {
        if (!finished && !job.cancelling)
          this.remember({ jobId, state: 'progress', fraction: message.fraction, message: message.message });
      } else void settle(message).then(resolveSettled);
    });
    worker.on(
      'error',
      (error) => void settle({ type: 'crashed', message: describeError(error) }).then(resolveSettled),
    );
    worker.on(
      'exit',
      () => void settle({ type: 'crashed', message: 'the job stopped unexpectedly' }).then(resolveSettled),
    );
    return jobId;
  }

  /** Asks a job to stop; resolves once it has stopped and its partial output is gone. */
  async cancel(jobId: string): Promise<boolean> {
    const job = this.running.get(jobId);
    if (job === undefined) return false;
    job.cancelling = true;
    job.worker.postMessage({ type: 'cancel' });
    const timer = setTimeout(() => void job.worker.terminate(), this.graceMs);
    await job.settled;
    clearTimeout(timer);
    return true;
  }

  status(jobId: string): JobEvent | undefined {
    return this.last.get(jobId);
  }

  /** Resolves when the job has finished (done, failed or cancelled). */
  async settled(jobId: string): Promise<JobEvent | undefined> {
    await this.running.get(jobId)?.settled;
    return this.last.get(jobId);
  }

  /** Stops every job (the host is closing). */
  async cancelAll(): Promise<void> {
    await Promise.all([...this.running.keys()].map((id) => this.cancel(id)));
  }

  private remember(event: JobEvent): void {
    this.last.set(event.jobId, event);
    if (this.last.size > 500) this.last.delete(this.last.keys().next().value!);
    this.publish(event);
  }
}

function describeError(error: unknown): string {
  return error instanceof Error ? error.message : String(error);
}

/**
 * The compiled worker and task table sit beside this module in dist/. Under vitest this module is
 * the TypeScript source, which a worker cannot load, so the built copy is used (npm test builds first).
 */
function builtBeside(name: string): string {
  const here = dirname(fileURLToPath(import.meta.url));
  const beside = join(here, name);
  if (existsSync(beside)) return beside;
  return join(here, '..', '..', '..', 'dist', 'src-main', 'services', 'jobs', name);
}

function workerScript(): string {
  return builtBeside('job-worker.js');
}

function defaultTaskModule(): string {
  return pathToFileURL(builtBeside('job-tasks.js')).href;
}
