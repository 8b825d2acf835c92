import { spawn } from 'node:child_process';
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { createInterface } from 'node:readline';
import { describe, expect, it } from 'vitest';

const repo = join(import.meta.dirname, '..', '..');

describe('npm start without the Electron runtime', () => {
  it('says so in one line and serves the same app in the browser instead', async () => {
    const data = await mkdtemp(join(tmpdir(), 'll-start-'));
    // An override that points nowhere stands for a machine where the runtime is missing.
    const child = spawn(
      process.execPath,
      [join(repo, 'scripts', 'start.js'), '--no-open', '--port', '0', '--data', data],
      {
        env: { ...process.env, ELECTRON_OVERRIDE_DIST_PATH: join(data, 'no-electron-here') },
        stdio: ['ignore', 'pipe', 'pipe'],
      },
    );
    let stderr = '';
    child.stderr.setEncoding('utf8').on('data', (chunk: string) => (stderr += chunk));
    try {
      const url = await new Promise<string>((resolve, reject) => {
        createInterface({ input: child.stdout }).once('line', resolve);
        child.once('exit', (code) => reject(new Error(`start exited with ${code}: ${stderr}`)));
      });
      expect(url).toMatch(/^http:\/\/127\.0\.0\.1:\d+\/\?token=/);
      expect(stderr.trim().split('\n')).toEqual([
        expect.stringMatching(
          /^Limit Ledger: the Electron runtime cannot start \(.+\); opening the app in your browser instead\.$/,
        ),
      ]);
      const swap = await fetch(url, { redirect: 'manual' });
      expect(swap.status).toBe(303);
      const cookie = swap.headers.get('set-cookie')!.split(';')[0];
      const page = await fetch(new URL('/', url), { headers: { cookie } });
      expect(page.status).toBe(200);
      expect(await page.text()).toContain('<div id="app">');
    } finally {
      child.kill('SIGTERM');
      await new Promise((resolve) => child.once('exit', resolve));
      await rm(data, { recursive: true, force: true });
    }
  });
});
