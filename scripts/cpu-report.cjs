// Preloaded into benchmarked child processes: reports the CPU time the process used, so that
// ratios hold even when other work shares the machine.
process.on('exit', () => {
  const { user, system } = process.cpuUsage();
  process.stderr.write(`\ncpu-seconds ${(user + system) / 1e6}\n`);
});
