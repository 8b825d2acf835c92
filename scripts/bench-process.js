// Timing whole node processes for `npm run bench`: wall and CPU seconds, commands taken in turn.
import { spawnSync } from 'node:child_process';
import { closeSync, openSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';

const root = resolve(dirname(fileURLToPath(import.meta.url)), '..');
// Five rounds: on a small shared machine the best of three still lands on a disturbed run now and then.
export const repeats = Number(process.env.LL_BENCH_REPEATS ?? 5);

/**
 * Waits a moment before a timed process: the one before it is still giving back its memory, and a
 * process started at once is slowed by that (it would make whichever command follows the heavier one
 * look slower).
 */
function settle(ms = 400) {
  Atomics.wait(new Int32Array(new SharedArrayBuffer(4)), 0, 0, ms);
}

/** Wall and CPU seconds of one whole node process (CPU of all its threads, from cpu-report.cjs). */
function processRun(args, env) {
  settle();
  const devNull = openSync('/dev/null', 'w');
  const start = process.hrtime.bigint();
  const child = spawnSync(process.execPath, ['-r', join(root, 'scripts/cpu-report.cjs'), ...args], {
    stdio: ['ignore', devNull, 'pipe'],
    maxBuffer: 1 << 26,
    ...(env ? { env } : {}),
  });
  const wall = Number(process.hrtime.bigint() - start) / 1e9;
  closeSync(devNull);
  if (child.status !== 0) throw new Error(`${args.join(' ')} failed: ${child.stderr}`);
  const reported = /cpu-seconds ([0-9.]+)/.exec(String(child.stderr));
  return { wall, cpu: reported ? Number(reported[1]) : Infinity };
}

/**
 * The best wall and CPU seconds of each command over a few rounds, the commands taken in turn in
 * each round: a machine whose speed drifts during the run then slows every command alike, rather
 * than whichever ran during a slow spell.
 */
export function processSecondsInTurn(commands, env) {
  const bests = commands.map(() => ({ wall: Infinity, cpu: Infinity }));
  for (let round = 0; round < repeats; round++) {
    commands.forEach((args, i) => {
      const run = processRun(args, env);
      bests[i].wall = Math.min(bests[i].wall, run.wall);
      bests[i].cpu = Math.min(bests[i].cpu, run.cpu);
    });
  }
  return bests;
}
