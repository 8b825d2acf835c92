// Renders build/icon.svg to build/icon.png (1024 px, transparent corners) with Debian's Chromium:
//   node build/render-icon.mjs
import { readFile } from 'node:fs/promises';
import { join } from 'node:path';
import { chromium } from 'playwright-core';

const here = import.meta.dirname;
const svg = await readFile(join(here, 'icon.svg'), 'utf8');
const browser = await chromium.launch({
  executablePath: process.env.LL_CHROMIUM ?? '/usr/lib/chromium/chromium',
  args: ['--headless', '--no-sandbox', '--disable-gpu', '--no-first-run', '--disable-background-networking'],
});
try {
  const page = await browser.newPage({ viewport: { width: 1024, height: 1024 } });
  await page.setContent(`<!doctype html><style>html,body{margin:0;background:transparent}</style>${svg}`);
  await page.locator('svg').screenshot({ path: join(here, 'icon.png'), omitBackground: true });
} finally {
  await browser.close();
}
