import { mkdtemp, readdir, readFile, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import type { JobEvent } from '../../shared-core/api.js';
import { JobRunner } from '../../src-main/services/jobs/job-runner.js';

// The worker runs the compiled job-worker.js from dist/ (npm test builds first).
const taskModule = pathToFileURL(join(import.meta.dirname, 'host-fixture-tasks.mjs')).href;

describe('jobs in worker threads', () => {
  let folder: string;
  let events: JobEvent[];
  let runner: JobRunner;

  beforeEach(async () => {
    folder = await mkdtemp(join(tmpdir(), 'll-jobs-'));
    events = [];
    runner = new JobRunner((event) => events.push(event), taskModule, 300);
  });
  afterEach(async () => {
    await runner.cancelAll();
    await rm(folder, { recursive: true, force: true });
  });

  it('reports progress and renames the output into place when the job succeeds', async () => {
    const target = join(folder, 'packet.txt');
    const id = runner.start('write', { chunks: 5, delayMs: 60 }, { outputTarget: target });
    const final = await runner.settled(id);
    expect(final).toEqual({ jobId: id, state: 'done', result: { lines: 5 } });
    const progress = events.filter((event) => event.state === 'progress' && event.jobId === id);
    expect(progress.length).toBeGreaterThan(1);
    expect(progress.map((event) => (event.state === 'progress' ? event.fraction : -1))).toEqual(
      [...progress].map((event) => (event.state === 'progress' ? event.fraction : -1)).sort((a, b) => a - b),
    );
    expect(await readFile(target, 'utf8')).toBe('line 0\nline 1\nline 2\nline 3\nline 4\n');
    expect(await readdir(folder)).toEqual(['packet.txt']);
  });

  it('stops a cancelled job and leaves nothing half-written', async () => {
    const target = join(folder, 'packet.txt');
    const id = runner.start('write', { chunks: 200, delayMs: 20 }, { outputTarget: target });
    await waitFor(() =>
      events.some((event) => event.jobId === id && event.state === 'progress' && event.fraction > 0),
    );
    expect(await readdir(folder)).toHaveLength(1); // the temporary file is being written
    expect(await runner.cancel(id)).toBe(true);
    expect(runner.status(id)).toEqual({ jobId: id, state: 'cancelled' });
    expect(await readdir(folder)).toEqual([]);
    expect(events.at(-1)).toEqual({ jobId: id, state: 'cancelled' });
  });

  it('terminates a job that ignores its signal, and still removes its partial output', async () => {
    const target = join(folder, 'study.ledger');
    const id = runner.start('stubborn', { busyMs: 20_000 }, { outputTarget: target });
    await waitFor(async () => (await readdir(folder)).length === 1);
    const started = Date.now();
    await runner.cancel(id);
    expect(Date.now() - started).toBeLessThan(5000);
    expect(runner.status(id)?.state).toBe('cancelled');
    expect(await readdir(folder)).toEqual([]);
  });

  it('reports a failing task with its message and writes nothing', async () => {
    const target = join(folder, 'out.xlsx');
    const id = runner.start('fail', {}, { outputTarget: target });
    expect(await runner.settled(id)).toEqual({
      jobId: id,
      state: 'failed',
      findings: [{ message: 'the data file has no count column' }],
    });
    expect(await readdir(folder)).toEqual([]);
  });

  it('refuses to cancel a job that is not running', async () => {
    const id = runner.start('echo', { a: 1 });
    expect((await runner.settled(id))?.state).toBe('done');
    expect(await runner.cancel(id)).toBe(false);
    expect(await runner.cancel('job-nonexistent')).toBe(false);
  });
});

async function waitFor(condition: () => boolean | Promise<boolean>, timeoutMs = 10_000): Promise<void> {
  const until = Date.now() + timeoutMs;
  while (!(await condition())) {
    if (Date.now() > until) throw new Error('timed out waiting');
    await new Promise((resolve) => setTimeout(resolve, 10));
  }
}
