import { spawnSync } from 'node:child_process';
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import {
  hasChromium,
  hasServe,
  launchChromium,
  newPage,
  plantedCsv,
  screenshot,
  seriousViolations,
  startServe,
} from './screens-harness.js';
import { makeTestP12 } from './helpers/test-p12.js';

const summary = (page: Page) => page.locator('[data-testid="review-summary"]').innerText();

async function auditScreen(page: Page, name: string) {
  for (const size of [
    { width: 1280, height: 800 },
    { width: 1920, height: 1080 },
  ]) {
    await page.setViewportSize(size);
    await page.waitForTimeout(100);
    await screenshot(page, name);
    // Usable at this size: nothing pushes the page sideways.
    expect(
      await page.evaluate(
        () =>
          globalThis.innerWidth -
          (
            globalThis as unknown as {
              document: { documentElement: { clientWidth: number; scrollWidth: number } };
            }
          ).document.documentElement.scrollWidth,
      ),
      name,
    ).toBeGreaterThanOrEqual(0);
  }
  await page.setViewportSize({ width: 1280, height: 800 });
  const violations = await seriousViolations(page);
  expect(
    violations.map((v) => `${name}: ${v.id} (${v.impact}) ${v.help} at ${v.nodes[0]?.target.join(' ')}`),
  ).toEqual([]);
}

describe.skipIf(!hasChromium || !hasServe)('a baseline study by hand, against limit-ledger serve', () => {
  let browser: Browser;
  let closeBrowser: () => Promise<void>;
  let served: Awaited<ReturnType<typeof startServe>>;

  beforeAll(async () => {
    served = await startServe();
    ({ browser, close: closeBrowser } = await launchChromium());
  });
  afterAll(async () => {
    await closeBrowser?.();
    await served?.close();
  });

  it(
    'imports a CSV with two planted signals, excludes one with a cause and sees the limits recompute',
    { timeout: 120_000 },
    async () => {
      const { page, context } = await newPage(browser, { width: 1280, height: 800 });
      await page.goto(served.url);
      await page.locator('[data-testid="nav-data"]').click();
      await auditScreen(page, 'data-choose');
      await page.locator('[data-testid="data-file"]').setInputFiles({
        name: 'panel-line.csv',
        mimeType: 'text/csv',
        buffer: Buffer.from(plantedCsv()),
      });
      await page.locator('[data-testid="map-count"], [data-testid="data-error"]').first().waitFor();
      expect(await page.locator('[data-testid="data-error"]').allInnerTexts()).toEqual([]);
      await page.locator('[data-testid="map-count"]').selectOption('defects');
      await page.locator('[data-testid="map-units"]').selectOption('panels');
      await page.locator('[data-testid="map-label"]').selectOption('shift');
      await page.locator('[data-testid="map-unit-name"]').fill('panel');
      await auditScreen(page, 'data-mapping');
      await page.locator('[data-testid="run-import"]').click();
      await page.locator('[data-testid="import-report"]').waitFor();
      expect(await page.locator('[data-testid="import-report"]').innerText()).toContain(
        '30 periods imported',
      );
      await auditScreen(page, 'data-report');
      await page.locator('[data-testid="go-review"]').click();

      await page.locator('[data-testid="control-chart"][data-ready="true"]').waitFor();
      expect(await summary(page)).toContain('2 signals');
      const before = await summary(page);
      await auditScreen(page, 'review');

      await page.locator('[data-testid="period-row"]', { hasText: 'S09' }).click();
      expect(await page.locator('[data-testid="details-status"]').innerText()).toBe('Signal');
      expect(await page.locator('[data-testid="details-rules"]').innerText()).toContain(
        'beyond its control limit',
      );
      await page.locator('[data-testid="open-exclude"]').click();
      await page.locator('[data-testid="cause-category"]').selectOption('Material');
      await page
        .locator('[data-testid="cause-description"]')
        .fill('Panels from a resin lot later recalled by the supplier');
      await page.locator('[data-testid="cause-reference"]').fill('CA-0042');
      await auditScreen(page, 'review-exclude-form');
      await page.locator('[data-testid="confirm-exclude"]').click();

      await expect.poll(() => summary(page)).toContain('1 excluded');
      const after = await summary(page);
      expect(after).toContain('1 signal ');
      // The center line moves down once the planted high shift leaves the estimate.
      const center = (text: string) => Number(/center ([\d.]+)/.exec(text)?.[1]);
      expect(center(after)).toBeLessThan(center(before));
      await page.locator('[data-testid="iteration"]').first().click();
      expect(await page.locator('[data-testid="iteration-compare"]').innerText()).toContain('S09, S21 → S21');
      await auditScreen(page, 'review-after-exclusion');

      await page.locator('[data-testid="undo"]').click();
      await expect.poll(() => summary(page)).toContain('0 excluded');
      await page.locator('[data-testid="redo"]').click();
      await expect.poll(() => summary(page)).toContain('1 excluded');

      await page.locator('[data-testid="period-row"]', { hasText: 'S15' }).click();
      await page.locator('[data-testid="note-text"]').fill('new supplier lot from here');
      await page.getByRole('button', { name: 'Add note' }).click();
      await expect.poll(() => page.locator('.details').innerText()).toContain('Note by');

      await page.locator('[data-testid="save-study"]').click();
      await expect.poll(() => page.locator('.file-message').innerText()).toMatch(/^Saved .*\.ledger/);

      await page.locator('[data-testid="nav-checks"]').click();
      await page.locator('[data-testid="checks-dispersion"]').waitFor();
      await auditScreen(page, 'checks');

      await page.locator('[data-testid="nav-history"]').click();
      const trail = await page.locator('[data-testid="audit-trail"]').innerText();
      expect(trail).toContain('Excluded');
      expect(trail).toContain('CA-0042');
      expect(trail).toContain('Undo');
      expect(trail).toContain('S15: new supplier lot from here');
      await page.locator('[data-testid="history-search"]').fill('resin');
      await expect.poll(() => page.locator('[data-testid="audit-trail"] tbody tr').count()).toBe(1);
      await auditScreen(page, 'history');

      await page.locator('[data-testid="nav-signoff"]').click();
      await auditScreen(page, 'signoff');
      await context.close();
    },
  );

  it('does the same with the keyboard only', { timeout: 120_000 }, async () => {
    const { page, context } = await newPage(browser, { width: 1280, height: 800 });
    await page.goto(served.url);
    await page.keyboard.press('Alt+1');
    const paste = page.locator('[data-testid="data-paste"]');
    await paste.waitFor();
    // Tab until the paste box has focus: every control on the way is reachable by keyboard.
    for (let i = 0; i < 30 && !(await paste.evaluate((el) => el.matches(':focus'))); i++)
      await page.keyboard.press('Tab');
    expect(await paste.evaluate((el) => el.matches(':focus'))).toBe(true);
    await page.keyboard.insertText(plantedCsv());
    await page.keyboard.press('Tab');
    await page.keyboard.press('Enter');
    await page.locator('[data-testid="map-count"]').waitFor();
    await page.locator('[data-testid="map-count"]').focus();
    await page.keyboard.press('Tab');
    await page.keyboard.press('Tab');
    await page.keyboard.press('Tab');
    await page.keyboard.press('Tab');
    await page.keyboard.press('Control+A');
    await page.keyboard.type('panel');
    const run = page.locator('[data-testid="run-import"]');
    for (let i = 0; i < 20 && !(await run.evaluate((el) => el.matches(':focus'))); i++)
      await page.keyboard.press('Tab');
    await page.keyboard.press('Enter');
    await page.locator('[data-testid="go-review"]').waitFor();
    await page.keyboard.press('Alt+2');
    await page.locator('[data-testid="control-chart"][data-ready="true"]').waitFor();

    // Walk the chart with the arrow keys to the first signal, then exclude it with X.
    await page.locator('[data-testid="chart-focus"]').focus();
    for (let i = 0; i < 9; i++) await page.keyboard.press('ArrowRight');
    expect(await page.locator('[data-testid="details-label"]').innerText()).toContain('S09');
    await page.keyboard.press('x');
    await expect.poll(() => page.locator(':focus').getAttribute('data-testid')).toBe('cause-description');
    await page.keyboard.type('Panels from a resin lot later recalled by the supplier');
    await page.keyboard.press('Tab');
    await page.keyboard.type('CA-0042');
    await page.keyboard.press('Enter');
    await expect.poll(() => summary(page)).toContain('1 excluded');
    await page.keyboard.press('Control+z');
    await expect.poll(() => summary(page)).toContain('0 excluded');
    await page.keyboard.press('Control+y');
    await expect.poll(() => summary(page)).toContain('1 excluded');
    await page.keyboard.press('?');
    await page.locator('[data-testid="shortcuts"]').waitFor();
    await screenshot(page, 'shortcuts');
    await page.keyboard.press('Escape');
    await page.keyboard.press('Alt+3');
    await page.locator('[data-testid="checks-dispersion"]').waitFor();
    await context.close();
  });

  it(
    'signs with a test P12 made here, exports the packet and verifies the downloaded PDF',
    { timeout: 180_000 },
    async (context) => {
      const work = await mkdtemp(join(tmpdir(), 'll-screens-sign-'));
      try {
        // A throwaway RSA 3072 signer for this test only (never committed; removed below).
        const key = makeTestP12(work, 'signer', 'Test Signer');

        const { page, context: browserContext } = await newPage(browser, { width: 1280, height: 800 });
        await page.goto(served.url);
        await page
          .locator('[data-testid="control-chart"][data-ready="true"], [role="alert"]')
          .first()
          .waitFor();
        await page.locator('[data-testid="nav-signoff"]').click();
        await page.locator('[data-testid="sign-name"]').fill('Test Signer');
        await page.locator('[data-testid="sign-role"]').fill('Quality engineer');
        await page.locator('[data-testid="sign-key"]').setInputFiles(key);
        await page.locator('[data-testid="sign-passphrase"]').fill('test-pass');
        await page.locator('[data-testid="sign-submit"]').click();
        const outcome = page
          .locator('[data-testid="signoff-message"], [data-testid="signoff-error"]')
          .first();
        await outcome.waitFor({ timeout: 60_000 });
        const said = await outcome.innerText();
        if (/not part of this build yet/.test(said)) {
          await browserContext.close();
          context.skip();
        }
        expect(said).toContain('Signed as prepared by Test Signer');
        // The host forgot the uploaded key after signing; the screen uploads it again for the packet.
        await expect.poll(() => page.locator('[data-testid="packet-sign"]').isChecked()).toBe(true);
        await page.locator('[data-testid="packet-passphrase"]').fill('test-pass');
        const downloading = page.waitForEvent('download', { timeout: 60_000 });
        await page.locator('[data-testid="export-pdf"]').click();
        const download = await downloading;
        const pdf = join(work, 'packet.pdf');
        await download.saveAs(pdf);
        await page
          .locator('[data-testid="signoff-message"]')
          .filter({ hasText: 'signed with certificate' })
          .waitFor();
        // The screen names the file as the browser saved it, not by the host's temporary name.
        const message = page.locator('[data-testid="signoff-message"]');
        expect(await message.innerText()).toContain(
          `The PDF packet ${download.suggestedFilename()} is ready`,
        );
        await message.scrollIntoViewIfNeeded();
        await screenshot(page, 'signoff-done');
        const verified = spawnSync(process.execPath, [resolve('bin/limit-ledger.js'), 'verify', pdf], {
          encoding: 'utf8',
        });
        expect(verified.status, verified.stderr + verified.stdout).toBe(0);
        expect(verified.stdout + verified.stderr).not.toMatch(/the PDF is not signed/);
        await browserContext.close();
      } finally {
        await rm(work, { recursive: true, force: true });
      }
    },
  );

  it(
    'makes a personal certificate on the Sign-off screen, signs with it and exports a packet that verifies',
    { timeout: 180_000 },
    async () => {
      const work = await mkdtemp(join(tmpdir(), 'll-screens-newkey-'));
      try {
        const { page, context: browserContext } = await newPage(browser, { width: 1280, height: 800 });
        await page.goto(served.url);
        await page
          .locator('[data-testid="control-chart"][data-ready="true"], [role="alert"]')
          .first()
          .waitFor();
        await page.locator('[data-testid="nav-signoff"]').click();
        await page.locator('[data-testid="sign-name"]').fill('Invented Preparer');
        await page.locator('[data-testid="sign-role"]').fill('Process engineer');
        await page.locator('[data-testid="new-key"] summary').click();
        await page.locator('[data-testid="new-key-passphrase"]').fill('preparer passphrase');
        await page.locator('[data-testid="new-key-repeat"]').fill('not the same');
        await page.locator('[data-testid="new-key-create"]').click();
        await expect
          .poll(() => page.locator('[data-testid="signoff-error"]').innerText())
          .toContain('the same passphrase typed twice');
        await page.locator('[data-testid="new-key-repeat"]').fill('preparer passphrase');
        await page.locator('[data-testid="new-key-create"]').click();
        const made = page
          .locator('[data-testid="signoff-message"]')
          .filter({ hasText: 'self-issued certificate' });
        await made.waitFor({ timeout: 60_000 });
        expect(await made.innerText()).not.toContain('preparer passphrase');
        await screenshot(page, 'signoff-new-key');

        await page.locator('[data-testid="sign-passphrase"]').fill('preparer passphrase');
        await page.locator('[data-testid="sign-submit"]').click();
        await page
          .locator('[data-testid="signoff-message"]')
          .filter({ hasText: 'Signed as prepared by Invented Preparer' })
          .waitFor({ timeout: 60_000 });
        // The key made here stays with the host, so the packet is signed with the same handle.
        await page.locator('[data-testid="packet-passphrase"]').fill('preparer passphrase');
        const downloading = page.waitForEvent('download', { timeout: 60_000 });
        await page.locator('[data-testid="export-pdf"]').click();
        const pdf = join(work, 'packet.pdf');
        await (await downloading).saveAs(pdf);
        await page
          .locator('[data-testid="signoff-message"]')
          .filter({ hasText: 'signed with certificate' })
          .waitFor();
        const verified = spawnSync(process.execPath, [resolve('bin/limit-ledger.js'), 'verify', pdf], {
          encoding: 'utf8',
        });
        expect(verified.status, verified.stderr + verified.stdout).toBe(0);
        expect(verified.stdout).toMatch(/self-issued/);
        await browserContext.close();
      } finally {
        await rm(work, { recursive: true, force: true });
      }
    },
  );
});
