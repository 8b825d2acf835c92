/* global document, requestAnimationFrame -- the function passed to page.evaluate runs in the page */
// The screens' speed, measured in the page in headless Chromium against `limit-ledger serve`:
// the time from an exclusion to the redrawn chart at 500 and 5,000 periods, and from starting
// `serve` to the first drawn chart. Called by scripts/bench.js; run alone with `node scripts/bench-screens.js`.
import { spawn } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { chromium } from 'playwright-core';

const root = resolve(dirname(fileURLToPath(import.meta.url)), '..');
const chromiumPath = '/usr/lib/chromium/chromium';
const chromiumArgs = [
  '--headless',
  '--no-sandbox',
  '--disable-gpu',
  '--disable-quic',
  '--no-first-run',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
];

/** Invented history (seeded, so every run measures the same data): about 2 per unit, 8 to 12 units. */
function inventedCsv(periods) {
  let state = periods >>> 0;
  const random = () => {
    state = (Math.imul(state, 1664525) + 1013904223) >>> 0;
    return state / 2 ** 32;
  };
  const lines = ['period,units,count'];
  for (let i = 1; i <= periods; i++) {
    const units = 8 + Math.floor(random() * 5);
    const count = Math.max(0, Math.round(2 * units + (random() - 0.5) * 4 * Math.sqrt(2 * units)));
    lines.push(`P${i},${units},${i === 3 ? count * 3 : count}`);
  }
  return `${lines.join('\n')}\n`;
}

function startServe(work) {
  const child = spawn(
    process.execPath,
    [
      join(root, 'bin/limit-ledger.js'),
      'serve',
      '--no-open',
      '--workspace',
      join(work, 'ws'),
      '--data',
      join(work, 'data'),
    ],
    { stdio: ['ignore', 'pipe', 'pipe'] },
  );
  const url = new Promise((done, failed) => {
    let out = '';
    child.stdout.on('data', (chunk) => {
      out += String(chunk);
      if (out.includes('\n')) done(out.split('\n')[0].trim());
    });
    child.on('exit', (code) => failed(new Error(`serve exited with ${code}`)));
  });
  return { child, url };
}

async function stop(child) {
  if (child.exitCode !== null) return;
  const exited = new Promise((done) => child.once('exit', done));
  child.kill('SIGTERM');
  await exited;
}

async function importHistory(page, periods) {
  await page.locator('[data-testid="nav-data"]').click();
  const another = page.getByRole('button', { name: 'Import another file' });
  if (await another.count()) await another.click();
  await page.locator('[data-testid="data-file"]').setInputFiles({
    name: `bench-${periods}.csv`,
    mimeType: 'text/csv',
    buffer: Buffer.from(inventedCsv(periods)),
  });
  await page.locator('[data-testid="map-count"]').selectOption('count');
  await page.locator('[data-testid="map-units"]').selectOption('units');
  await page.locator('[data-testid="map-label"]').selectOption('period');
  await page.locator('[data-testid="run-import"]').click();
  await page.locator('[data-testid="go-review"]').click({ timeout: 120_000 });
  await page.locator('[data-testid="control-chart"][data-ready="true"]').waitFor();
}

/** Median over `repeats` exclusions of period 3: from the click on "Exclude" to the end of the chart's draw. */
async function exclusionToRedraw(page, repeats) {
  const times = [];
  for (let i = 0; i < repeats; i++) {
    await page.locator('[data-testid="period-row"]', { hasText: /^3\s/ }).first().click();
    await page.locator('[data-testid="open-exclude"]').click();
    await page.locator('[data-testid="cause-description"]').fill('benchmark exclusion');
    const ms = await page.evaluate(
      () =>
        new Promise((done) => {
          const canvas = document.querySelector('[data-testid="control-chart"]');
          const button = document.querySelector('[data-testid="confirm-exclude"]');
          const start = performance.now();
          button.click();
          const check = () => {
            const drawn = Number(canvas.dataset.drawnAt ?? 0);
            if (drawn > start) done(drawn - start);
            else requestAnimationFrame(check);
          };
          check();
        }),
    );
    times.push(ms);
    await page.locator('[data-testid="undo"]').click();
  }
  times.sort((a, b) => a - b);
  return times[Math.floor(times.length / 2)];
}

export async function benchScreens({ sizes = [500, 5000], repeats = 7 } = {}) {
  if (!existsSync(chromiumPath))
    return [{ name: 'screens: skipped (no Chromium at /usr/lib/chromium/chromium)', ms: NaN }];
  if (
    !existsSync(join(root, 'dist/src-main/cli/main.js')) ||
    !existsSync(join(root, 'dist/renderer/index.html'))
  )
    return [{ name: 'screens: skipped (run npm run build first)', ms: NaN }];
  const work = mkdtempSync(join(tmpdir(), 'limit-ledger-bench-screens-'));
  const browser = await chromium.launch({ executablePath: chromiumPath, args: chromiumArgs });
  const rows = [];
  const started = performance.now();
  const serve = startServe(work);
  try {
    const url = await serve.url;
    const page = await browser.newPage({ viewport: { width: 1280, height: 800 } });
    await page.goto(url);
    await page.locator('[data-testid="control-chart"][data-ready="true"]').waitFor({ timeout: 60_000 });
    rows.push({ name: 'serve start to first drawn chart (demo study)', ms: performance.now() - started });
    for (const periods of sizes) {
      await importHistory(page, periods);
      rows.push({
        name: `exclusion to redrawn chart, ${periods} periods (median of ${repeats})`,
        ms: await exclusionToRedraw(page, repeats),
      });
    }
  } finally {
    await browser.close();
    await stop(serve.child);
    rmSync(work, { recursive: true, force: true });
  }
  return rows;
}

if (process.argv[1] && resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  for (const row of await benchScreens()) console.log(`${row.name}: ${row.ms.toFixed(1)} ms`);
}
