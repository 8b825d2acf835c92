/**
 * What the screen tests share: a headless Debian Chromium driven by playwright-core, and the page
 * served either by `limit-ledger serve`'s web host (when it is built) or, until then, by a tiny
 * static server that answers the two channels the first start needs from invented test data.
 */
import { spawn } from 'node:child_process';
import { createServer, type Server } from 'node:http';
import { mkdtemp, readFile, rm, mkdir } from 'node:fs/promises';
import { existsSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { extname, join, normalize, resolve, sep } from 'node:path';
import type { AddressInfo } from 'node:net';
import { chromium, type Browser, type BrowserContext, type Page } from 'playwright-core';
import type { StudyView } from '../../shared-core/api.js';
import { defaultSiteSettings } from '../../shared-core/settings/site-settings.js';
import { defaultOptions, type Observation } from '../../shared-core/study/analysis-types.js';

export const chromiumPath = '/usr/lib/chromium/chromium';
export const hasChromium = existsSync(chromiumPath);
export const rendererDir = resolve('dist/renderer');
export const outputDir = resolve('test-output/screens');

export async function launchChromium(): Promise<{ browser: Browser; close: () => Promise<void> }> {
  const profile = await mkdtemp(join(tmpdir(), 'll-screens-profile-'));
  const context = await chromium.launchPersistentContext(profile, {
    executablePath: chromiumPath,
    headless: true,
    args: [
      '--headless',
      '--no-sandbox',
      '--disable-gpu',
      '--disable-quic',
      '--no-first-run',
      '--disable-background-networking',
      '--disable-component-update',
      '--disable-sync',
    ],
  });
  const browser = context.browser();
  // launchPersistentContext owns one context; new contexts come from the same browser process.
  return {
    browser: browser ?? (context as unknown as Browser),
    close: async () => {
      await context.close();
      await rm(profile, { recursive: true, force: true });
    },
  };
}

/**
 * Invented test data (not a published example): 30 shifts of a made-up panel line, 8 to 12
 * panels per shift at about 2 nonconformities per panel, with shifts 9 and 21 planted far above
 * the upper limit.
 */
export function plantedObservations(): Observation[] {
  const units = [
    10, 12, 8, 10, 11, 9, 10, 12, 10, 8, 10, 11, 9, 10, 12, 10, 8, 10, 11, 9, 10, 12, 10, 8, 10, 11, 9, 10,
    12, 10,
  ];
  const wobble = [
    1, -2, 0, 3, -1, 2, -3, 1, 0, -2, 2, 0, -1, 1, 3, -2, 0, 1, -1, 2, 0, -3, 1, 2, -1, 0, 1, -2, 2, 0,
  ];
  return units.map((k, i) => ({
    label: `S${String(i + 1).padStart(2, '0')}`,
    row: i + 2,
    count: i === 8 ? 48 : i === 20 ? 44 : 2 * k + wobble[i],
    units: k,
  }));
}

export function plantedCsv(): string {
  return (
    ['shift,panels,defects', ...plantedObservations().map((o) => `${o.label},${o.units},${o.count}`)].join(
      '\n',
    ) + '\n'
  );
}

function stubStudy(): StudyView {
  return {
    file: null,
    title: 'Test panel line (invented test data)',
    unitName: 'panel',
    document: null,
    observations: plantedObservations(),
    exclusions: [],
    options: { ...defaultOptions },
    readOnly: false,
    findings: [],
  } as StudyView;
}

const mime: Record<string, string> = {
  '.html': 'text/html; charset=utf-8',
  '.js': 'text/javascript; charset=utf-8',
  '.css': 'text/css; charset=utf-8',
  '.svg': 'image/svg+xml',
};

/** Serves dist/renderer and answers `siteSettings` and `demoStudy`; every other channel is refused. */
export async function startStaticHost(): Promise<{ url: string; close: () => Promise<void> }> {
  const server: Server = createServer(async (request, response) => {
    const url = new URL(request.url ?? '/', 'http://127.0.0.1');
    if (url.pathname.startsWith('/api/')) {
      const channel = url.pathname.slice(5);
      const value =
        channel === 'demoStudy' ? stubStudy() : channel === 'siteSettings' ? defaultSiteSettings : undefined;
      response.writeHead(200, { 'content-type': 'application/json' });
      response.end(
        JSON.stringify(
          value === undefined
            ? { ok: false, error: { code: 'not-here', message: `the test host does not serve ${channel}` } }
            : { ok: true, value },
        ),
      );
      return;
    }
    const file = normalize(join(rendererDir, url.pathname === '/' ? 'index.html' : url.pathname));
    if (!file.startsWith(rendererDir + sep)) {
      response.writeHead(403).end();
      return;
    }
    try {
      const body = await readFile(file);
      response.writeHead(200, { 'content-type': mime[extname(file)] ?? 'application/octet-stream' });
      response.end(body);
    } catch {
      response.writeHead(404).end();
    }
  });
  await new Promise<void>((done) => server.listen(0, '127.0.0.1', done));
  const { port } = server.address() as AddressInfo;
  return {
    url: `http://127.0.0.1:${port}/`,
    close: () => new Promise<void>((done) => server.close(() => done())),
  };
}

export async function newPage(
  browser: Browser,
  size: { width: number; height: number },
): Promise<{ page: Page; context: BrowserContext }> {
  // bypassCSP lets the test inject axe-core; the app itself runs under the host's policy otherwise.
  const context = await browser.newContext({
    viewport: size,
    bypassCSP: true,
    acceptDownloads: true,
    locale: 'en-US',
  });
  const page = await context.newPage();
  // Fail fast with the locator in the message, well inside the test's own timeout.
  page.setDefaultTimeout(10_000);
  return { page, context };
}

export async function screenshot(page: Page, name: string): Promise<string> {
  await mkdir(outputDir, { recursive: true });
  const size = page.viewportSize();
  const path = join(outputDir, `${name}-${size?.width}x${size?.height}.png`);
  await page.screenshot({ path, fullPage: false });
  return path;
}

export interface AxeViolation {
  id: string;
  impact: string | null;
  help: string;
  nodes: { target: string[] }[];
}

/** Runs axe-core in the page; returns the serious and critical violations. */
export async function seriousViolations(page: Page): Promise<AxeViolation[]> {
  const source = await readFile(resolve('node_modules/axe-core/axe.min.js'), 'utf8');
  await page.evaluate(source);
  const violations = (await page.evaluate(async () => {
    const axe = (
      globalThis as unknown as {
        axe: { run: (context: unknown, options: unknown) => Promise<{ violations: unknown[] }> };
      }
    ).axe;
    const result = await axe.run('html', { resultTypes: ['violations'] });
    return result.violations;
  })) as AxeViolation[];
  return violations.filter((v) => v.impact === 'serious' || v.impact === 'critical');
}

export const hasServe = existsSync(resolve('dist/src-main/cli/main.js'));

/**
 * Starts `limit-ledger serve` (the built web host) on a free port with a fresh workspace and data
 * folder; resolves with the address it prints (carrying the run's token).
 */
export async function startServe(): Promise<{ url: string; workspace: string; close: () => Promise<void> }> {
  const root = await mkdtemp(join(tmpdir(), 'll-screens-serve-'));
  const workspace = join(root, 'workspace');
  const child = spawn(
    process.execPath,
    [
      resolve('bin/limit-ledger.js'),
      'serve',
      '--no-open',
      '--workspace',
      workspace,
      '--data',
      join(root, 'data'),
    ],
    { stdio: ['ignore', 'pipe', 'pipe'] },
  );
  let stderr = '';
  child.stderr.on('data', (chunk) => (stderr += String(chunk)));
  const url = await new Promise<string>((done, failed) => {
    let stdout = '';
    const timer = setTimeout(() => failed(new Error(`serve did not start: ${stderr}`)), 20_000);
    child.stdout.on('data', (chunk) => {
      stdout += String(chunk);
      const line = stdout.split('\n')[0];
      if (stdout.includes('\n') && line.startsWith('http')) {
        clearTimeout(timer);
        done(line.trim());
      }
    });
    child.on('exit', (code) => failed(new Error(`serve exited with ${code}: ${stderr}`)));
  });
  return {
    url,
    workspace,
    close: async () => {
      if (child.exitCode === null) {
        const exited = new Promise((done) => child.once('exit', done));
        child.kill('SIGTERM');
        await exited;
      }
      await rm(root, { recursive: true, force: true });
    },
  };
}
