import { createHash } from 'node:crypto';
import { readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { afterEach, describe, expect, it } from 'vitest';
import type { PacketFacts } from '../../src-main/services/packet/packet-facts.js';
import { buildPacketPdf } from '../../src-main/services/packet/packet-pdf.js';
import type * as Threads from '../../src-main/services/packet/packet-threads.js';
import { inventedContent } from './packet-fixtures.js';
import { run, scratch } from './packet-tools.js';

/**
 * The packet's worker threads as the command runs them: from the built scripts (npm test builds
 * first), since the TypeScript sources have none and make the packet in one thread. The PDF a
 * thread draws renders to the same pixels as the one drawn here, and a workbook that fails ends the
 * PDF thread's wait for its hash instead of leaving the command hanging. Invented data.
 */
const built = pathToFileURL(join(process.cwd(), 'dist/src-main/services/packet/packet-threads.js')).href;
const folder = scratch('threads');
let threads: Threads.PacketThreads | undefined;
afterEach(async () => threads?.stop());

async function start(): Promise<Threads.PacketThreads> {
  const { startPacketThreads } = (await import(built)) as typeof Threads;
  threads = startPacketThreads();
  return threads;
}

const factsFor = (workbook: Buffer): PacketFacts => ({
  format: 'limit-ledger-packet-facts',
  version: 1,
  studyId: 'st-invented-0001',
  revision: 1,
  chart: 'u',
  limits: 'sigma',
  center: 0,
  rate: 0,
  table: [],
  periods: [],
  studySha256: null,
  workbookSha256: createHash('sha256').update(workbook).digest('hex'),
  generatedAt: '2026-12-01T12:00:00+01:00',
});

function pagePixels(pdf: Buffer, name: string): Buffer[] {
  const path = join(folder, `${name}.pdf`);
  writeFileSync(path, pdf);
  run('pdftoppm', ['-r', '40', path, join(folder, name)]);
  return readdirSync(folder)
    .filter((file) => file.startsWith(`${name}-`) && file.endsWith('.ppm'))
    .sort()
    .map((file) => readFileSync(join(folder, file)));
}

describe('the packet threads', () => {
  it('build a workbook and draw a PDF that renders as the one drawn here', { timeout: 60_000 }, async () => {
    const content = inventedContent(80);
    const packet = await start();
    const workbook = await packet.buildWorkbook(content);
    expect(workbook.subarray(0, 2).toString('latin1')).toBe('PK'); // a zip, as .xlsx files are
    const facts = factsFor(workbook);
    const progress: number[] = [];
    const threaded = await packet.drawPdf(content, {
      paper: 'a4',
      facts: Promise.resolve(facts),
      onProgress: (f) => progress.push(f),
    });
    expect(progress.length).toBeGreaterThan(5);
    const here = await buildPacketPdf(content, { paper: 'a4', facts });
    const threadedPages = pagePixels(threaded, 'threaded');
    const herePages = pagePixels(here, 'here');
    expect(threadedPages.length).toBe(herePages.length);
    threadedPages.forEach((pixels, page) =>
      expect(pixels.equals(herePages[page]!), `page ${page + 1}`).toBe(true),
    );
  });

  it('stop waiting for the hash when the workbook fails, with its error', { timeout: 60_000 }, async () => {
    const packet = await start();
    const failed = Promise.reject(new Error('the invented workbook failed'));
    await expect(packet.drawPdf(inventedContent(20), { paper: 'a4', facts: failed })).rejects.toThrow(
      'the invented workbook failed',
    );
  });

  it('pass on an error the PDF thread meets', { timeout: 60_000 }, async () => {
    const packet = await start();
    const content = inventedContent(20);
    const broken = { ...content, result: { ...content.result, periods: null } } as unknown as typeof content;
    await expect(
      packet.drawPdf(broken, { paper: 'a4', facts: new Promise<PacketFacts>(() => undefined) }),
    ).rejects.toThrow();
  });
});
