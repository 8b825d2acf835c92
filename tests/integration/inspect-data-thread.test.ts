import { existsSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { describe, expect, it } from 'vitest';
import { inspectData } from '../../src-main/services/import/inspect-data.js';
import type * as Thread from '../../src-main/services/import/inspect-data-thread.js';

/**
 * The first look at a large data file, as the host takes it: in a thread from the built script (npm
 * test builds first; the TypeScript sources have none and look in this thread). What the thread
 * sends back is what the look here gives. Invented counts of an invented line.
 */
const built = pathToFileURL(join(process.cwd(), 'dist/src-main/services/import/inspect-data-thread.js')).href;
const load = async () => (await import(built)) as typeof Thread;

function largeCsv(): Uint8Array {
  const lines = ['lot;boards;defects'];
  for (let i = 1; lines.length < 60_000; i++) lines.push(`Lot ${i} (invented);${40 + (i % 7)};${i % 5}`);
  return new TextEncoder().encode(lines.join('\n') + '\n');
}

describe('inspectDataInThread', () => {
  it('gives a large file the same first look in its thread as here', async () => {
    const { inspectDataInThread, threadFromBytes } = await load();
    const bytes = largeCsv();
    // Large enough for a thread, and the built worker is there to take it.
    expect(bytes.byteLength).toBeGreaterThan(threadFromBytes);
    expect(existsSync(fileURLToPath(new URL('./inspect-data-worker.js', built)))).toBe(true);
    const threaded = await inspectDataInThread('invented-lots.csv', bytes);
    expect(threaded).toEqual(await inspectData('invented-lots.csv', bytes));
    expect(threaded.ok && threaded.value.columns).toEqual(['lot', 'boards', 'defects']);
  });

  it('brings back why a large file cannot be read', async () => {
    const { inspectDataInThread } = await load();
    // A zip header on a megabyte of nothing: not a workbook.
    const bytes = new Uint8Array(2 << 20);
    bytes.set([0x50, 0x4b, 0x03, 0x04]);
    const threaded = await inspectDataInThread('broken.xlsx', bytes);
    expect(threaded.ok).toBe(false);
    expect(threaded).toEqual(await inspectData('broken.xlsx', bytes));
  });
});
