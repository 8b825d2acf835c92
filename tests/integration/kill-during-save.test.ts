import { spawn, spawnSync } from 'node:child_process';
import { cpSync, existsSync, mkdirSync, mkdtempSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { openStudyFile, saveStudyFile } from '../../src-main/services/study-file.js';
import { sampleStudy } from './fixtures/study-sample.js';

/**
 * A child saving in a loop is killed with SIGKILL at random moments; every time, the study must
 * open as the last version the child reported saved or the one after it, and the backup must open
 * as a whole, verified study one version older (or the same, when the kill fell between keeping
 * the backup and the rename). 50 kills in `npm test`, 1,000 in `npm run test:stress`.
 */
const here = dirname(fileURLToPath(import.meta.url));
const root = resolve(here, '..', '..');
const built = join(root, 'dist');
// The children run a private copy of the build, so that a rebuild meanwhile cannot change it under
// them; it stays inside the repository so that node_modules still resolves.
const dist = join(root, 'test-output', `kill-during-save-dist-${process.pid}`);
const child = join(here, 'fixtures', 'study-save-loop.mjs');
const kills = process.env.LL_STRESS === '1' ? 1000 : 50;

/**
 * Runs the saving child, measures one save's time from the gap between its first two reports, and
 * kills it at a uniformly random moment within the next save.
 */
function killAtRandom(path: string): Promise<{ confirmed: number }> {
  return new Promise((done, failed) => {
    const saver = spawn(process.execPath, [child, path, dist], { stdio: ['ignore', 'pipe', 'pipe'] });
    let confirmed = 0;
    let reports = 0;
    let firstAt = 0;
    let stderr = '';
    let buffer = '';
    let timer: NodeJS.Timeout | undefined;
    const read = () => {
      const lines = buffer.split('\n');
      buffer = lines.pop() ?? '';
      for (const line of lines) {
        const match = /^saved (\d+)$/.exec(line);
        if (!match) continue;
        confirmed = Number(match[1]);
        reports++;
        if (reports === 1) firstAt = performance.now();
        if (reports === 2) {
          const period = performance.now() - firstAt;
          timer = setTimeout(() => saver.kill('SIGKILL'), Math.random() * period);
        }
      }
    };
    saver.stdout.on('data', (chunk: Buffer) => {
      buffer += chunk.toString('utf8');
      read();
    });
    saver.stderr.on('data', (chunk: Buffer) => (stderr += chunk.toString('utf8')));
    saver.on('error', failed);
    saver.on('exit', (_code, signal) => {
      clearTimeout(timer);
      if (signal !== 'SIGKILL') return failed(new Error(`the saving child ended by itself: ${stderr}`));
      // A report still in the pipe when the kill landed is a save that completed.
      buffer += '\n';
      read();
      done({ confirmed });
    });
  });
}

/** Copies the build, retrying while a rebuild running meanwhile leaves it unloadable. */
function copyBuild(): void {
  for (let attempt = 1; ; attempt++) {
    rmSync(dist, { recursive: true, force: true });
    for (const part of ['shared-core', 'src-main'])
      cpSync(join(built, part), join(dist, part), { recursive: true });
    const probe = spawnSync(process.execPath, [child, '--probe', dist], { encoding: 'utf8' });
    if (probe.status === 0) return;
    if (attempt === 5) throw new Error(`the build in dist/ does not load: ${probe.stderr}`);
    spawnSync(process.execPath, ['-e', 'setTimeout(() => {}, 2000)']);
  }
}

describe(`a save killed at a random moment (${kills} times)`, () => {
  it(
    'leaves the old or the new version, and a whole backup',
    async () => {
      expect(
        existsSync(join(built, 'src-main', 'services', 'study-file.js')),
        'run `npm run build` first',
      ).toBe(true);
      copyBuild();
      const tally = { kills: 0, old: 0, new: 0, backupOneOlder: 0, backupSame: 0, leftoverTemporaries: 0 };
      // Four lanes in parallel, each its own folder and study, to keep `npm test` short.
      const lanes = 4;
      await Promise.all(
        Array.from({ length: lanes }, (_, lane) => runLane(lane, Math.ceil((kills - lane) / lanes), tally)),
      );
      const output = join(root, 'test-output');
      mkdirSync(output, { recursive: true });
      writeFileSync(join(output, `kill-during-save-${kills}.json`), `${JSON.stringify(tally, null, 2)}\n`);
      console.log(`kill during save: ${JSON.stringify(tally)}`);
      rmSync(dist, { recursive: true, force: true });
      expect(tally.kills).toBe(kills);
    },
    kills * 3_000,
  );
});

async function runLane(lane: number, trials: number, tally: Record<string, number>): Promise<void> {
  const folder = mkdtempSync(join(tmpdir(), 'll-kill-'));
  const path = join(folder, 'stress.ledger');
  const saved = await saveStudyFile(path, sampleStudy(400), { expectedDiskHash: null });
  expect(saved.ok).toBe(true);
  for (let t = 0; t < trials; t++) {
    const i = `${lane}.${t + 1}`;
    const { confirmed } = await killAtRandom(path);
    tally.kills++;
    const opened = await openStudyFile(path);
    if (!opened.ok) throw new Error(`kill ${i}: ${opened.findings[0].message}`);
    expect(opened.value.readOnly, `kill ${i}: ${JSON.stringify(opened.value.problems)}`).toBe(false);
    const count = opened.value.study.events.length;
    expect([confirmed, confirmed + 1], `kill ${i}`).toContain(count);
    tally[count === confirmed ? 'old' : 'new']++;

    const backup = await openStudyFile(`${path}.bak`);
    if (!backup.ok) throw new Error(`kill ${i}, backup: ${backup.findings[0].message}`);
    expect(backup.value.problems).toEqual([]);
    const backupCount = backup.value.study.events.length;
    expect([count - 1, count], `kill ${i}, backup`).toContain(backupCount);
    tally[backupCount === count ? 'backupSame' : 'backupOneOlder']++;
    // Temporaries of a killed save stay until the next save in the folder sweeps them.
    const temporaries = readdirSync(folder).filter((name) => name.endsWith('.tmp')).length;
    expect(temporaries, `kill ${i}`).toBeLessThanOrEqual(2);
    tally.leftoverTemporaries += temporaries;
  }
  rmSync(folder, { recursive: true, force: true });
}
