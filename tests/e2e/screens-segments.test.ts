import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import {
  hasChromium,
  hasServe,
  launchChromium,
  newPage,
  screenshot,
  seriousViolations,
  startServe,
} from './screens-harness.js';
import { analyzeSegments } from '../../shared-core/study/segments.js';
import { demoObservations } from '../../shared-core/study/demo-scenario.js';
import { defaultOptions } from '../../shared-core/study/analysis-types.js';

const reason = 'new frit supplier lot FR-2207 from this shift (invented)';

/** The centers the Segments list shows, read back as numbers. */
async function shownCenters(page: Page): Promise<number[]> {
  const texts = await page.locator('[data-testid="segment-center"]').allInnerTexts();
  return texts.map((t) => Number(t.replace(/,/g, '')));
}

describe.skipIf(!hasChromium || !hasServe)('Segments on the Review screen, in Chromium against serve', () => {
  let browser: Browser;
  let closeBrowser: () => Promise<void>;

  beforeAll(async () => {
    ({ browser, close: closeBrowser } = await launchChromium());
  });
  afterAll(async () => {
    await closeBrowser?.();
  });

  it('splits the demo study at a known change with a reason, shows each segment with its own center, undoes and redoes', async () => {
    // The same split, computed here by the core directly: the page reaches it through the screens.
    const expected = analyzeSegments(demoObservations, [], { ...defaultOptions, chart: 'u' }, [
      { index: 18, label: 'S19', reason },
    ]);
    if (!expected.ok) throw new Error(expected.findings[0].message);
    const centers = expected.value.map((s) => s.result.center);
    expect(centers).toHaveLength(2);

    const served = await startServe();
    try {
      const { page, context } = await newPage(browser, { width: 1280, height: 800 });
      await page.goto(served.url);
      await page.locator('[data-testid="control-chart"][data-ready="true"]').waitFor();
      await expect.poll(() => page.locator('[data-testid="segment"]').count()).toBe(0);

      // Select S19 from the keyboard in the table, then start a segment there.
      await page.locator('[data-testid="period-table"]').focus();
      await page.keyboard.press('Home');
      for (let i = 0; i < 18; i++) await page.keyboard.press('ArrowDown');
      await expect.poll(() => page.locator('[data-testid="details-label"]').innerText()).toMatch(/^S19/);
      expect(await page.locator('[data-testid="open-split"]').innerText()).toMatch(/new segment here/);
      // From the keyboard: N opens the form with its field focused; Enter without a reason is refused in words.
      await page.keyboard.press('n');
      await page.locator('[data-testid="split-reason"]:focus').waitFor();
      await page.keyboard.press('Enter');
      await expect.poll(() => page.locator('#split-error').innerText()).toMatch(/what changed/i);
      await page.keyboard.type(reason);
      await page.keyboard.press('Enter');

      await expect.poll(() => page.locator('[data-testid="segment"]').count()).toBe(2);
      const shown = await shownCenters(page);
      // Shown to 4 significant digits (the screens' number format).
      shown.forEach((value, i) => expect(value).toBeCloseTo(centers[i], 3));
      expect(await page.locator('[data-testid="segments"]').innerText()).toContain(reason);
      expect(await page.locator('[data-testid="review-summary"]').innerText()).toMatch(
        /2 segments · current S19–S30/,
      );
      expect(await page.locator('[data-testid="details-segment"]').innerText()).toBe('S19–S30');
      expect(await page.locator('[data-testid="row-segment"]').first().innerText()).toBe('1');
      await screenshot(page, 'review-segments');
      expect(await seriousViolations(page)).toEqual([]);

      // Undo joins the history again; redo splits it again.
      await page.locator('[data-testid="undo"]').click();
      await expect.poll(() => page.locator('[data-testid="segment"]').count()).toBe(0);
      await page.locator('[data-testid="redo"]').click();
      await expect.poll(() => page.locator('[data-testid="segment"]').count()).toBe(2);
      expect(await shownCenters(page)).toEqual(shown);

      // The checks judge the current segment only, and say so.
      await page.keyboard.press('Alt+3');
      expect(await page.locator('[data-testid="checks-segment"]').innerText()).toContain('S19–S30');
      await screenshot(page, 'checks-segments');

      // Removing a split asks first.
      await page.keyboard.press('Alt+2');
      await page.locator('[data-testid="remove-split"]').click();
      await page.locator('[data-testid="confirm-remove-split"]').click();
      await expect.poll(() => page.locator('[data-testid="segment"]').count()).toBe(0);

      // The History screen words the split.
      await page.keyboard.press('Alt+5');
      await expect.poll(() => page.locator('main').innerText()).toContain('New segment');
      await context.close();
    } finally {
      await served.close();
    }
  });
});
