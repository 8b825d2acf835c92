import { createHash } from 'node:crypto';
import { readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import type { PacketContent } from '../../src-main/services/packet/packet-content.js';
import type { PacketFacts } from '../../src-main/services/packet/packet-facts.js';
import { buildPacketPdf, drawPacketPdf, type Paper } from '../../src-main/services/packet/packet-pdf.js';
import { inventedContent } from './packet-fixtures.js';
import { run, scratch } from './packet-tools.js';

/**
 * The cover is drawn last (it prints the workbook's hash, which the workbook thread delivers while
 * the other pages are drawn). Poppler renders both drawing orders to the same pixels, page by page,
 * for hashes that take one line of the cover and for hashes that take two; a cover that runs over
 * its page is drawn in order instead. Invented data (packet-fixtures.ts).
 */
const folder = scratch('cover-order');

const factsWith = (content: PacketContent, workbookSha256: string): PacketFacts => ({
  format: 'limit-ledger-packet-facts',
  version: 1,
  studyId: content.studyId,
  revision: content.revision.number,
  chart: content.result.chart,
  limits: content.result.limits,
  center: content.result.center,
  rate: content.result.rate,
  table: [],
  periods: [],
  studySha256: createHash('sha256').update('invented study bytes').digest('hex'),
  workbookSha256,
  generatedAt: content.generatedAt,
});

/** Each page rendered by pdftoppm at 50 dpi, as PPM bytes. */
function pagePixels(pdf: Buffer, name: string): Buffer[] {
  const path = join(folder, `${name}.pdf`);
  writeFileSync(path, pdf);
  run('pdftoppm', ['-r', '50', path, join(folder, name)]);
  return readdirSync(folder)
    .filter((file) => file.startsWith(`${name}-`) && file.endsWith('.ppm'))
    .sort()
    .map((file) => readFileSync(join(folder, file)));
}

const pageText = (pdf: Buffer, page: number) =>
  run('pdftotext', ['-f', String(page), '-l', String(page), '-', '-'], { input: pdf }).stdout;

describe('the packet cover, drawn last', () => {
  // A digit is the widest hex character and f the narrowest: 64 zeros take two lines of the
  // cover on either paper, 64 f's one; a real hash takes one or two depending on its digits.
  const hashes = ['0'.repeat(64), 'f'.repeat(64), createHash('sha256').update('invented').digest('hex')];
  for (const paper of ['a4', 'letter'] as Paper[]) {
    it(`renders the same pages as the cover drawn first (${paper})`, { timeout: 60_000 }, async () => {
      const content = inventedContent(120);
      for (const [i, hash] of hashes.entries()) {
        const facts = factsWith(content, hash);
        const last = await drawPacketPdf(content, { paper, facts }, 'cover last');
        const first = await drawPacketPdf(content, { paper, facts }, 'in order');
        expect(last).not.toBeNull();
        const lastPages = pagePixels(last!, `${paper}-${i}-last`);
        const firstPages = pagePixels(first!, `${paper}-${i}-first`);
        expect(lastPages.length).toBeGreaterThan(3);
        expect(lastPages.length).toBe(firstPages.length);
        lastPages.forEach((pixels, page) =>
          expect(pixels.equals(firstPages[page]!), `page ${page + 1}`).toBe(true),
        );
        expect(pageText(last!, 1).replace(/\s+/g, '')).toContain(hash);
      }
    });
  }

  it('draws the pages after the cover before the workbook’s hash arrives', async () => {
    const content = inventedContent(60);
    let deliver: (facts: PacketFacts) => void = () => undefined;
    const facts = new Promise<PacketFacts>((resolve) => (deliver = resolve));
    const reported: number[] = [];
    const drawing = buildPacketPdf(content, { paper: 'a4', facts, onProgress: (f) => reported.push(f) });
    // Each page step reports when it is done; all but the cover's must come without the facts.
    await expect.poll(() => reported.length, { timeout: 30_000 }).toBe(9);
    deliver(factsWith(content, 'e'.repeat(64)));
    const pdf = await drawing;
    expect(reported.length).toBe(10);
    expect(pageText(pdf, 1)).toContain('Approval packet: control limits');
    expect(pageText(pdf, 1).replace(/\s+/g, '')).toContain('e'.repeat(64));
  }, 60_000);

  it('draws a cover that runs over its page in order, cover first', { timeout: 60_000 }, async () => {
    const long = inventedContent(40);
    const steps = Array.from(
      { length: 60 },
      (_, i) => `Step ${i + 1}: hold the invented line and re-inspect the boards of the shift.`,
    );
    const content: PacketContent = { ...long, revision: { ...long.revision, reactionPlan: steps.join(' ') } };
    const facts = factsWith(content, 'c'.repeat(64));
    expect(await drawPacketPdf(content, { paper: 'a4', facts }, 'cover last')).toBeNull();
    const pdf = await buildPacketPdf(content, { paper: 'a4', facts });
    expect(pageText(pdf, 1)).toContain('Approval packet: control limits');
    expect(pageText(pdf, 1)).toContain('Step 1:');
    expect(pageText(pdf, 2)).toContain('Step 60:');
    expect(pageText(pdf, 2)).not.toContain('Chart');
    expect(pageText(pdf, 3)).toContain('Chart');
    const inOrder = await drawPacketPdf(content, { paper: 'a4', facts }, 'in order');
    const pages = pagePixels(pdf, 'long-built');
    const expected = pagePixels(inOrder!, 'long-first');
    expect(pages.length).toBe(expected.length);
    pages.forEach((pixels, page) => expect(pixels.equals(expected[page]!), `page ${page + 1}`).toBe(true));
  });
});
