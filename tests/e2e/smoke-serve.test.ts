import { mkdir } from 'node:fs/promises';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { hasChromium, launchChromium, startServe, type ServedApp } from './helpers/browser.js';

const output = join(import.meta.dirname, '..', '..', 'test-output');

describe.skipIf(!hasChromium())('the served app in Chromium', () => {
  let served: ServedApp;
  let chromium: { browser: Browser; close(): Promise<void> };

  beforeAll(async () => {
    served = await startServe();
    chromium = await launchChromium();
    await mkdir(output, { recursive: true });
  });
  afterAll(async () => {
    await chromium?.close();
    await served?.stop();
  });

  it('prints a loopback URL with a token on the first line of stdout', () => {
    expect(served.url).toMatch(/^http:\/\/127\.0\.0\.1:\d+\/\?token=[A-Za-z0-9_-]+$/);
  });

  it('loads with no page errors, drops the token from the address and draws the demo study’s chart', async () => {
    const context = await chromium.browser.newContext({ viewport: { width: 1280, height: 860 } });
    const page = await context.newPage();
    const problems: string[] = [];
    page.on('pageerror', (error) => problems.push(`page error: ${error.message}`));
    page.on('console', (message) => {
      if (message.type() === 'error') problems.push(`console: ${message.text()}`);
    });
    page.on('requestfailed', (request) => problems.push(`request failed: ${request.url()}`));
    page.on('response', (response) => {
      if (response.status() >= 400) problems.push(`${response.status()} for ${response.url()}`);
    });

    await page.goto(served.url);
    expect(page.url()).toBe(`${served.origin}/`);
    const chart = page.getByTestId('control-chart');
    await chart.waitFor({ state: 'visible', timeout: 20_000 });
    await page.waitForSelector('[data-testid="control-chart"][data-ready="true"]', { timeout: 20_000 });
    await expect(page.getByTestId('demo-label').textContent()).resolves.toContain('invented');

    // The chart really has ink on it: some pixels differ from the background.
    const inked = await chart.evaluate((canvas: HTMLCanvasElement) => {
      const context2d = canvas.getContext('2d')!;
      const { data } = context2d.getImageData(0, 0, canvas.width, canvas.height);
      let count = 0;
      for (let index = 0; index < data.length; index += 4)
        if (data[index + 3] > 0 && data[index] < 200) count++;
      return count;
    });
    expect(inked).toBeGreaterThan(500);

    // The session cookie is HttpOnly: the page's scripts cannot read it.
    expect(await page.evaluate(() => document.cookie)).toBe('');
    const cookies = await context.cookies();
    expect(cookies).toEqual([
      expect.objectContaining({ name: 'll_session', httpOnly: true, sameSite: 'Strict' }),
    ]);

    await page.screenshot({ path: join(output, 'smoke-serve.png'), fullPage: true });
    expect(problems).toEqual([]);
    await context.close();
  });

  it('refuses the API to a page on another origin, even in the same browser', async () => {
    const context = await chromium.browser.newContext();
    const page = await context.newPage();
    await page.goto(served.url);
    // Another origin (a different port on the same machine stands in for a hostile site).
    const status = await page.evaluate(async (origin) => {
      const response = await fetch(`${origin}/api/hostInfo`, {
        method: 'POST',
        headers: { 'content-type': 'application/json' },
        body: '{}',
      });
      return response.status;
    }, served.origin);
    expect(status).toBe(200);
    const foreign = await context.newPage();
    await foreign.goto('about:blank');
    const refused = await foreign.evaluate(async (origin) => {
      try {
        const response = await fetch(`${origin}/api/hostInfo`, {
          method: 'POST',
          headers: { 'content-type': 'application/json' },
          body: '{}',
          credentials: 'include',
        });
        return response.status;
      } catch {
        return 'blocked';
      }
    }, served.origin);
    expect(refused === 'blocked' || refused === 401 || refused === 403).toBe(true);
    await context.close();
  });
});
