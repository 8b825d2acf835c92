import { mkdir, mkdtemp, readdir, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import { hasChromium, launchChromium, startServe, type ServedApp } from './helpers/browser.js';
import { seriousViolations } from './screens-harness.js';
import { newStudy, observationsHash } from '../../shared-core/study/new-study.js';
import { localTime } from '../../shared-core/study/local-time.js';
import { defaultOptions, type Observation } from '../../shared-core/study/analysis-types.js';

const output = join(import.meta.dirname, '..', '..', 'test-output', 'screens');
const leftover = 'Line 4 baseline.0123456789ab.recovery.ledger';

/** Invented data (not a published example): twelve shifts of an imaginary coating line. */
function leftoverStudy(): unknown {
  const observations: Observation[] = [7, 9, 6, 8, 10, 7, 5, 8, 9, 6, 7, 8].map((count, i) => ({
    label: `Shift ${i + 1}`,
    row: i + 2,
    count,
    units: 4,
  }));
  return newStudy({
    id: '5b0c7f2e-8d1a-4c3b-9e6f-2a7d4c1b8e90',
    identity: {
      part: 'Line 4 baseline',
      processStep: '',
      characteristic: '',
      inspectionUnit: 'one coated panel',
      owner: 'engineer',
    },
    source: {
      file: 'line4.csv',
      sha256: observationsHash(observations),
      importSettings: {},
      importReport: {},
    },
    observations,
    method: { ...defaultOptions },
    who: 'engineer',
    now: localTime(Date.parse('2026-03-02T09:15:00Z'), 0),
  });
}

describe.skipIf(!hasChromium())('the recovery offer in Chromium', () => {
  let data: string;
  let served: ServedApp;
  let chromium: { browser: Browser; close(): Promise<void> };

  beforeAll(async () => {
    // A copy as a run that did not close cleanly leaves it (another run's id in the name).
    data = await mkdtemp(join(tmpdir(), 'll-recovery-'));
    await mkdir(join(data, 'recovery'), { recursive: true });
    await writeFile(join(data, 'recovery', leftover), JSON.stringify(leftoverStudy()));
    served = await startServe(['--data', data]);
    chromium = await launchChromium();
    await mkdir(output, { recursive: true });
  });
  afterAll(async () => {
    await chromium?.close();
    await served?.stop();
    await rm(data, { recursive: true, force: true });
  });

  async function openApp(): Promise<{ page: Page; problems: string[]; close(): Promise<void> }> {
    // bypassCSP lets the test inject axe-core; the app runs under the host's policy otherwise.
    const context = await chromium.browser.newContext({
      viewport: { width: 1280, height: 860 },
      bypassCSP: true,
    });
    const page = await context.newPage();
    const problems: string[] = [];
    page.on('pageerror', (error) => problems.push(`page error: ${error.message}`));
    await page.goto(served.url);
    return { page, problems, close: () => context.close() };
  }

  it('offers the copy in a labelled modal dialog that Escape closes without deleting it', async () => {
    const { page, problems, close } = await openApp();
    const dialog = page.getByRole('dialog', { name: 'Recover unsaved work?' });
    await dialog.waitFor({ state: 'visible', timeout: 20_000 });
    await expect(dialog.textContent()).resolves.toContain('Line 4 baseline.ledger');
    // The untouched demo behind it is no unsaved work.
    await expect(page.getByTestId('save-study').textContent()).resolves.toBe('Save');
    // Focus is inside the dialog, and Tab keeps it there (the page behind is inert).
    const inside = () => page.evaluate(() => !!document.activeElement?.closest('dialog'));
    await expect(inside()).resolves.toBe(true);
    for (let i = 0; i < 4; i++) await page.keyboard.press('Tab');
    await expect(inside()).resolves.toBe(true);
    await page.screenshot({ path: join(output, 'recovery-offer.png') });
    expect(await seriousViolations(page)).toEqual([]);

    await page.keyboard.press('Escape');
    await dialog.waitFor({ state: 'hidden' });
    await expect(page.getByTestId('study-title').textContent()).resolves.not.toBe('Line 4 baseline');
    expect(await readdir(join(data, 'recovery'))).toContain(leftover);
    expect(problems).toEqual([]);
    await close();
  });

  it('takes a data file dropped on the Review screen to the import preview instead of leaving the app', async () => {
    const { page, problems, close } = await openApp();
    await page.getByRole('dialog').waitFor({ state: 'visible', timeout: 20_000 });
    await page.keyboard.press('Escape');
    await page.getByTestId('control-chart').waitFor();
    // Invented rows of an imaginary line.
    const csv = 'shift,defects,panels\nA1,4,10\nA2,6,12\nA3,5,11\n';
    await page.evaluate((text) => {
      const transfer = new DataTransfer();
      transfer.items.add(new File([text], 'line 7.csv', { type: 'text/csv' }));
      const target = document.querySelector('main')!;
      target.dispatchEvent(
        new DragEvent('dragover', { dataTransfer: transfer, bubbles: true, cancelable: true }),
      );
      target.dispatchEvent(
        new DragEvent('drop', { dataTransfer: transfer, bubbles: true, cancelable: true }),
      );
    }, csv);
    await page.getByTestId('data-preview').waitFor({ timeout: 20_000 });
    await expect(page.getByTestId('data-preview').textContent()).resolves.toContain('A2');
    expect(page.url()).toBe(`${served.origin}/`);
    expect(problems).toEqual([]);
    await close();
  });

  it('restores the copy as an unsaved study and replaces the old copy with this run’s own', async () => {
    const { page, problems, close } = await openApp();
    await page.getByTestId('recovery-restore').click({ timeout: 20_000 });
    await page.getByRole('dialog').waitFor({ state: 'hidden' });
    await expect(page.getByTestId('study-title').textContent()).resolves.toBe('Line 4 baseline');
    await expect(page.getByRole('status').first().textContent()).resolves.toMatch(
      /Restored the recovery copy of Line 4 baseline\.ledger/,
    );
    await expect(page.getByTestId('save-study').textContent()).resolves.toBe('Save *');
    const copies = await readdir(join(data, 'recovery'));
    expect(copies).not.toContain(leftover);
    expect(copies.filter((name) => name.endsWith('.recovery.ledger'))).toHaveLength(1);
    await page.screenshot({ path: join(output, 'recovery-restored.png') });
    expect(problems).toEqual([]);
    await close();
  });
});
