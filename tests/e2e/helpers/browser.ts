import { spawn, type ChildProcess } from 'node:child_process';
import { existsSync } from 'node:fs';
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { createInterface } from 'node:readline';
import { chromium, type Browser } from 'playwright-core';

const repo = join(import.meta.dirname, '..', '..', '..');

/** Debian's Chromium (apt-get install chromium); the tests never download a browser. */
export const chromiumPath = process.env.LL_CHROMIUM ?? '/usr/lib/chromium/chromium';

export const hasChromium = (): boolean => existsSync(chromiumPath);

/**
 * Headless Chromium with no background traffic and no first-run screens. Playwright gives every
 * launch a fresh temporary profile of its own (it refuses a --user-data-dir argument).
 */
export async function launchChromium(): Promise<{ browser: Browser; close(): Promise<void> }> {
  const browser = await chromium.launch({
    executablePath: chromiumPath,
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
  return {
    browser,
    async close() {
      await browser.close();
    },
  };
}

export interface ServedApp {
  /** The address `serve` printed on its first line (with the run's token). */
  url: string;
  origin: string;
  workspace: string;
  process: ChildProcess;
  /** What `serve` wrote to stderr (its log). */
  log: string[];
  stop(): Promise<void>;
}

/**
 * Starts the real `limit-ledger serve` from dist/ (npm test builds first) on a free port, with a
 * fresh workspace and data folder, and resolves with the URL from its first line of stdout.
 */
export async function startServe(extraArgs: string[] = []): Promise<ServedApp> {
  const root = await mkdtemp(join(tmpdir(), 'll-serve-'));
  const workspace = join(root, 'workspace');
  const child = spawn(
    process.execPath,
    [
      join(repo, 'bin', 'limit-ledger.js'),
      'serve',
      '--no-open',
      '--port',
      '0',
      '--workspace',
      workspace,
      '--data',
      join(root, 'data'),
      ...extraArgs,
    ],
    { stdio: ['ignore', 'pipe', 'pipe'], env: { ...process.env, BROWSER: 'none' } },
  );
  const log: string[] = [];
  child.stderr!.setEncoding('utf8').on('data', (chunk: string) => log.push(chunk));
  const url = await new Promise<string>((resolve, reject) => {
    const lines = createInterface({ input: child.stdout! });
    const timer = setTimeout(() => reject(new Error(`serve printed no URL: ${log.join('')}`)), 20_000);
    lines.once('line', (line) => {
      clearTimeout(timer);
      resolve(line.trim());
    });
    child.once('exit', (code) => reject(new Error(`serve exited with ${code}: ${log.join('')}`)));
  });
  return {
    url,
    origin: new URL(url).origin,
    workspace,
    process: child,
    log,
    async stop() {
      if (child.exitCode === null) {
        const exited = new Promise((resolve) => child.once('exit', resolve));
        child.kill('SIGTERM');
        await exited;
      }
      await rm(root, { recursive: true, force: true });
    },
  };
}
