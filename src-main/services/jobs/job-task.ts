/**
 * What a job does, as the worker runs it: a function of its input that reports progress, stops when
 * its signal aborts, and writes any file only to `outputPath` (a temporary file the runner renames
 * into place when the job succeeds and deletes when it fails or is cancelled).
 */
export interface JobContext {
  signal: AbortSignal;
  progress(fraction: number, message: string): void;
  outputPath: string | null;
}

export type JobTask = (input: unknown, context: JobContext) => Promise<unknown>;

/** The module a worker loads: a table of tasks by kind. */
export interface JobTaskModule {
  tasks: Record<string, JobTask>;
}

/** Messages from a worker to its runner. */
export type WorkerMessage =
  | { type: 'progress'; fraction: number; message: string }
  | { type: 'done'; result: unknown }
  | { type: 'failed'; message: string; findings?: { message: string }[] }
  | { type: 'cancelled' };

export interface WorkerInput {
  taskModule: string;
  kind: string;
  input: unknown;
  outputPath: string | null;
}

/** Thrown by a task (or its services) when its signal aborted. */
export function isAbort(error: unknown, signal: AbortSignal): boolean {
  return signal.aborted || (error instanceof Error && error.name === 'AbortError');
}
