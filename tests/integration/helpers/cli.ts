import { execFile } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';

export const cliPath = resolve(import.meta.dirname, '../../../bin/limit-ledger.js');

export interface CliRun {
  status: number;
  stdout: string;
  stderr: string;
}

/** Runs the built `limit-ledger` command (npm test builds it first) and collects its output. */
export function runCli(
  args: string[],
  options: { env?: NodeJS.ProcessEnv; input?: string } = {},
): Promise<CliRun> {
  return new Promise((done) => {
    const child = execFile(
      process.execPath,
      [cliPath, ...args],
      { env: { ...process.env, ...options.env }, maxBuffer: 256 * 1024 * 1024 },
      (error, stdout, stderr) => {
        const status = error && typeof error.code === 'number' ? error.code : error ? 1 : 0;
        done({ status, stdout, stderr });
      },
    );
    if (options.input !== undefined) child.stdin?.end(options.input);
  });
}

/** A fresh temporary folder with the given files written into it. */
export function tempFiles(files: Record<string, string | Uint8Array>): string {
  const dir = mkdtempSync(join(tmpdir(), 'limit-ledger-'));
  for (const [name, content] of Object.entries(files)) writeFileSync(join(dir, name), content);
  return dir;
}
