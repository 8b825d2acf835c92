import { execFileSync, spawnSync } from 'node:child_process';
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import { rateRatioTest } from '../../shared-core/changes/rate-ratio-test.js';
import { demoObservations } from '../../shared-core/study/demo-scenario.js';
import {
  hasChromium,
  hasServe,
  launchChromium,
  newPage,
  screenshot,
  seriousViolations,
  startServe,
} from './screens-harness.js';
import { makeTestP12 } from './helpers/test-p12.js';

/**
 * Invented new production for the invented demo plant (not real data): 20 shifts of door panels
 * after the approval, at fewer blemishes per panel than the demo history, with shift N07 planted
 * far above the approved limit so that the check lists a signal.
 */
const newPanels = [46, 52, 41, 55, 48, 50, 44, 57, 49, 42, 53, 47, 51, 45, 56, 40, 50, 48, 54, 43];
const newBlemishes = [4, 3, 5, 2, 4, 6, 25, 3, 4, 2, 5, 3, 4, 2, 6, 3, 4, 3, 5, 2];
const newDate = (i: number) => new Date(Date.UTC(2026, 2, 4 + i)).toISOString().slice(0, 10);
const newCsv = [
  'shift,date,panels,defects',
  ...newPanels.map((k, i) => `N${String(i + 1).padStart(2, '0')},${newDate(i)},${k},${newBlemishes[i]}`),
].join('\n');

async function sign(page: Page, who: string, meaning: string, key: string): Promise<string> {
  await page.locator('[data-testid="sign-name"]').fill(who);
  await page
    .locator('[data-testid="sign-role"]')
    .fill(meaning === 'approved' ? 'Quality manager' : 'Quality engineer');
  await page.locator('[data-testid="sign-meaning"]').selectOption(meaning);
  await page.locator('[data-testid="sign-key"]').setInputFiles(key);
  await page.locator('[data-testid="sign-passphrase"]').fill('test-pass');
  await page.evaluate(() => {
    // Clear the last outcome so that the wait below sees this signature's.
    for (const el of (globalThis as unknown as { document: Document }).document.querySelectorAll(
      '[data-testid="signoff-message"], [data-testid="signoff-error"]',
    ))
      el.textContent = '';
  });
  await page.locator('[data-testid="sign-submit"]').click();
  const outcome = page
    .locator('[data-testid="signoff-message"], [data-testid="signoff-error"]')
    .filter({ hasText: /\S/ })
    .first();
  await outcome.waitFor({ timeout: 60_000 });
  return outcome.innerText();
}

/** The ratio, interval and p-value the screen shows, against rateRatioTest on the same totals. */
async function expectComparison(
  page: Page,
  base: { count: number; units: number },
  changed: { count: number; units: number },
) {
  const expected = rateRatioTest(base, changed);
  if (!expected.ok) throw new Error('the test refused the totals');
  const words = await page.locator('[data-testid="ratio-words"]').innerText();
  const shown =
    /new rate is ([\d.]+) times the approved one \(95 % interval ([\d.]+) to ([\d.]+); p (=|<) ([\d.]+)\)/.exec(
      words,
    );
  expect(shown, words).not.toBeNull();
  expect(Number(shown![1])).toBeCloseTo(expected.value.ratio!, 2);
  expect(Number(shown![2])).toBeCloseTo(expected.value.ciLow, 2);
  expect(Number(shown![3])).toBeCloseTo(expected.value.ciHigh!, 2);
  expect(expected.value.pValue).toBeLessThan(0.05);
  // The p-value is shown to two significant digits, or as "< 0.0001".
  if (shown![4] === '<') expect(expected.value.pValue).toBeLessThan(Number(shown![5]));
  else expect(Number(shown![5]) / expected.value.pValue).toBeCloseTo(1, 1);
}

async function audit(page: Page, name: string) {
  for (const size of [
    { width: 1280, height: 800 },
    { width: 1920, height: 1080 },
  ]) {
    await page.setViewportSize(size);
    await page.waitForTimeout(150);
    await screenshot(page, name);
    const overflow = await page.evaluate(() => {
      const root = (globalThis as unknown as { document: Document }).document.documentElement;
      return root.scrollWidth - root.clientWidth;
    });
    expect(overflow, `${name} at ${size.width}: nothing pushes the page sideways`).toBeLessThanOrEqual(0);
  }
  await page.setViewportSize({ width: 1280, height: 800 });
  const violations = await seriousViolations(page);
  expect(
    violations.map((v) => `${name}: ${v.id} (${v.impact}) ${v.help} at ${v.nodes[0]?.target.join(' ')}`),
  ).toEqual([]);
}

describe.skipIf(!hasChromium || !hasServe)('a change of approved limits, against limit-ledger serve', () => {
  let browser: Browser;
  let closeBrowser: () => Promise<void>;
  let served: Awaited<ReturnType<typeof startServe>>;
  let work: string;
  let preparerKey: string;
  let approverKey: string;

  beforeAll(async () => {
    work = await mkdtemp(join(tmpdir(), 'll-changes-e2e-'));
    preparerKey = makeTestP12(work, 'preparer', 'Test Preparer');
    approverKey = makeTestP12(work, 'approver', 'Test Approver');
    served = await startServe();
    ({ browser, close: closeBrowser } = await launchChromium());
  }, 120_000);
  afterAll(async () => {
    await closeBrowser?.();
    await served?.close();
    await rm(work, { recursive: true, force: true });
  });

  it(
    'approves the demo, checks new periods, proposes a change, reads the evidence, signs it and verifies the change packet',
    { timeout: 300_000 },
    async () => {
      const { page, context } = await newPage(browser, { width: 1280, height: 800 });
      await page.goto(served.url);
      await page.locator('[data-testid="control-chart"][data-ready="true"]').waitFor({ timeout: 30_000 });

      await page.locator('[data-testid="nav-changes"]').click();
      await page.locator('[data-testid="changes-none"]').waitFor();
      await audit(page, 'changes-none');

      // The baseline: prepared and approved by two different people, each with their own key.
      await page.locator('[data-testid="nav-signoff"]').click();
      expect(await sign(page, 'Test Preparer', 'prepared', preparerKey)).toContain('Signed as prepared');
      expect(await sign(page, 'Test Approver', 'approved', approverKey)).toContain('Signed as approved');

      // The approved revision, frozen; then the new periods, from the keyboard: Alt+6 and Tab.
      await page.keyboard.press('Alt+6');
      await page.locator('[data-testid="approved-revision"]').waitFor();
      expect(await page.locator('[data-testid="approved-revision"]').innerText()).toContain('revision 1');
      const paste = page.locator('[data-testid="changes-paste"]');
      for (let i = 0; i < 40 && !(await paste.evaluate((el) => el.matches(':focus'))); i++)
        await page.keyboard.press('Tab');
      expect(await paste.evaluate((el) => el.matches(':focus'))).toBe(true);
      await page.keyboard.insertText(newCsv);
      await page.keyboard.press('Tab');
      await page.keyboard.press('Enter');
      await page.locator('[data-testid="changes-map-count"]').waitFor();
      expect(await page.locator('[data-testid="changes-map-count"]').inputValue()).toBe('defects');
      expect(await page.locator('[data-testid="changes-map-units"]').inputValue()).toBe('panels');
      await page.locator('[data-testid="changes-map-label"]').selectOption('shift');
      await page.locator('[data-testid="changes-map-date"]').selectOption('date');
      await page.locator('[data-testid="changes-run-import"]').click();
      const summary = page.locator('[data-testid="check-summary"]');
      await summary.waitFor({ timeout: 30_000 });
      expect(await summary.innerText()).toContain('20 new periods (N01 to N20)');
      expect(await page.locator('[data-testid="check-signals"]').innerText()).toContain('N07');
      await audit(page, 'changes-check');

      // Propose the change: reason category and text, first period by default the first new one.
      expect(await page.locator('[data-testid="change-first"]').inputValue()).toBe(
        String(demoObservations.length),
      );
      // The change-point check proposes a split; accepting it sets the first period, which stays the user's choice.
      const point = page.locator('[data-testid="change-point"]');
      await point.waitFor();
      expect(await point.innerText()).toMatch(/seed \d+/);
      await page.locator('[data-testid="accept-change-point"]').click();
      const accepted = Number(await page.locator('[data-testid="change-first"]').inputValue());
      expect(accepted).toBeGreaterThan(0);
      expect(await point.innerText()).toContain('The new study starts there.');
      await page.locator('[data-testid="change-first"]').selectOption(String(demoObservations.length));
      await page.getByLabel('The process changed (equipment, material, method or site)').check();
      await page
        .locator('[data-testid="change-reason"]')
        .fill('Burner controls replaced on furnace line 2 (invented)');
      await page.locator('[data-testid="change-who"]').fill('Test Preparer');
      await audit(page, 'changes-propose');
      await page.locator('[data-testid="change-who"]').focus();
      const submit = page.locator('[data-testid="propose-submit"]');
      for (let i = 0; i < 5 && !(await submit.evaluate((el) => el.matches(':focus'))); i++)
        await page.keyboard.press('Tab');
      await page.keyboard.press('Enter');
      await page.locator('[data-testid="change-evidence"]').waitFor();

      // The evidence, against the exact test computed here from the same counts.
      const base = {
        count: demoObservations.reduce((s, o) => s + o.count, 0),
        units: demoObservations.reduce((s, o) => s + o.units, 0),
      };
      await expectComparison(page, base, {
        count: newBlemishes.reduce((s, c) => s + c, 0),
        units: newPanels.reduce((s, k) => s + k, 0),
      });
      expect(await page.locator('[data-testid="limits-comparison"] tbody tr').count()).toBeGreaterThan(0);
      expect(await page.locator('[data-testid="arl-table"] tbody tr').count()).toBe(4);
      await page.locator('[data-testid="arl-curve"] svg').waitFor();
      await page.locator('[data-testid="before-after-chart"] svg').waitFor();
      expect(await page.locator('[data-testid="evidence-change-point"]').innerText()).toContain(
        'splits between',
      );
      await audit(page, 'changes-evidence');
      await page.locator('[data-testid="arl-table"]').scrollIntoViewIfNeeded();
      await screenshot(page, 'changes-evidence-arl');

      // The draft's own Phase I is the Review flow on the last segment: exclude the planted N07
      // with its cause there, and the evidence follows.
      await page.locator('[data-testid="go-draft-review"]').click();
      await page.locator('[data-testid="control-chart"][data-ready="true"]').waitFor();
      const review = page.locator('[data-testid="review-summary"]');
      await expect.poll(() => review.innerText()).toContain('2 segments');
      expect(await review.innerText()).toContain('m = 20 included');
      // From the keyboard on the chart: End is N20, thirteen steps back is N07.
      await page.locator('[data-testid="chart-focus"]').focus();
      await page.keyboard.press('End');
      for (let i = 0; i < 13; i++) await page.keyboard.press('ArrowLeft');
      expect(await page.locator('[data-testid="details-label"]').innerText()).toContain('N07');
      await page.locator('[data-testid="open-exclude"]').click();
      await page.locator('[data-testid="cause-category"]').selectOption('Machine');
      await page
        .locator('[data-testid="cause-description"]')
        .fill('Burner 2 tripped during the trial (invented)');
      await page.locator('[data-testid="confirm-exclude"]').click();
      await expect.poll(() => review.innerText()).toContain('m = 19 included');
      await page.keyboard.press('Alt+6');
      await page.locator('[data-testid="change-evidence"]').waitFor();
      await expectComparison(page, base, {
        count: newBlemishes.reduce((s, c, i) => s + (i === 6 ? 0 : c), 0),
        units: newPanels.reduce((s, k, i) => s + (i === 6 ? 0 : k), 0),
      });

      // Sign the draft: prepared, then the preparer may not approve it; the approver does.
      await page.locator('[data-testid="go-signoff"]').click();
      expect(await sign(page, 'Test Preparer', 'prepared', preparerKey)).toContain('Signed as prepared');
      // The change's summary on Sign-off, once that screen includes it (src-renderer/changes/ChangeSummary.svelte).
      const changeSummary = page.locator('[data-testid="change-summary"]');
      if ((await changeSummary.count()) > 0) {
        expect(await changeSummary.innerText()).toContain('Burner controls replaced');
        await page.locator('[data-testid="sign-meaning"]').selectOption('approved');
        await page.locator('[data-testid="separate-roles-warning"]').waitFor();
        await screenshot(page, 'changes-signoff-summary');
      }
      const refused = await sign(page, 'Test Preparer', 'approved', preparerKey);
      expect(refused).toMatch(/different person/);
      await page.locator('[data-testid="signoff-error"]').scrollIntoViewIfNeeded();
      await screenshot(page, 'changes-signoff-refused');
      expect(await sign(page, 'Test Approver', 'approved', approverKey)).toContain('Signed as approved');

      // The change packet, signed with the approver's key, verified by the command line.
      await page.locator('[data-testid="packet-sign"]').check();
      await page.locator('[data-testid="packet-passphrase"]').fill('test-pass');
      const downloading = page.waitForEvent('download', { timeout: 90_000 });
      await page.locator('[data-testid="export-pdf"]').click();
      const pdf = join(work, 'change-packet.pdf');
      await (await downloading).saveAs(pdf);
      const verified = spawnSync(process.execPath, [resolve('bin/limit-ledger.js'), 'verify', pdf], {
        encoding: 'utf8',
      });
      expect(verified.status, verified.stderr + verified.stdout).toBe(0);
      expect(verified.stdout + verified.stderr).not.toMatch(/the PDF is not signed/);
      // The packet carries the change: its reason, the replaced revision and the comparison (pdftotext).
      const text = execFileSync('pdftotext', ['-layout', pdf, '-'], { encoding: 'utf8' });
      expect(text).toContain('Limit change');
      expect(text).toContain('Rate comparison');
      expect(text.replace(/\s+/g, ' ')).toContain('Burner controls replaced on furnace line 2');

      // Back on Changes: the approved revision is now the new one, and nothing is drafted.
      await page.keyboard.press('Alt+6');
      await expect
        .poll(() => page.locator('[data-testid="approved-revision"]').innerText())
        .toContain('revision 2');
      await page.locator('[data-testid="propose-later"]').waitFor();
      expect(await page.locator('[data-testid="changes-message"]').count()).toBe(0);
      await screenshot(page, 'changes-after-approval');
      await context.close();
    },
  );
});
