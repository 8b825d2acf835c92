import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import {
  hasChromium,
  hasServe,
  startServe,
  launchChromium,
  newPage,
  screenshot,
  seriousViolations,
  startStaticHost,
} from './screens-harness.js';

describe.skipIf(!hasChromium)('Review screen in Chromium', () => {
  let browser: Browser;
  let closeBrowser: () => Promise<void>;
  let host: { url: string; close: () => Promise<void> };

  beforeAll(async () => {
    host = await startStaticHost();
    ({ browser, close: closeBrowser } = await launchChromium());
  });
  afterAll(async () => {
    await closeBrowser?.();
    await host?.close();
  });

  it('opens the invented demo study from serve on first start, labelled as invented', async () => {
    if (!hasServe) return;
    const served = await startServe();
    try {
      const { page, context } = await newPage(browser, { width: 1280, height: 800 });
      await page.goto(served.url);
      await page.locator('[data-testid="control-chart"][data-ready="true"]').waitFor();
      expect(await page.locator('[data-testid="demo-label"]').innerText()).toMatch(/invented/i);
      await screenshot(page, 'demo-review');
      await context.close();
    } finally {
      await served.close();
    }
  });

  it('opens the first study with a drawn chart and both planted signals', async () => {
    const { page, context } = await newPage(browser, { width: 1280, height: 800 });
    await page.goto(host.url);
    await page.locator('[data-testid="control-chart"][data-ready="true"]').waitFor();
    await expect
      .poll(() => page.locator('[data-testid="review-summary"]').innerText())
      .toContain('2 signals');
    await screenshot(page, 'review');
    expect(await seriousViolations(page)).toEqual([]);
    await context.close();
  });
});
