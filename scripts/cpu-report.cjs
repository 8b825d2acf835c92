// Preloaded into benchmarked child processes: reports the CPU time the process used (all its
// threads), so that ratios hold even when other work shares the machine. Preloads run in worker
// threads too; only the main thread reports, at the process's exit.
// eslint-disable-next-line @typescript-eslint/no-require-imports -- a CommonJS preload has only require
if (require('node:worker_threads').isMainThread) {
  process.on('exit', () => {
    const { user, system } = process.cpuUsage();
    process.stderr.write(`\ncpu-seconds ${(user + system) / 1e6}\n`);
  });
}
