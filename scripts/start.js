#!/usr/bin/env node
// `npm start` (after `npm run build`): the desktop app in Electron, downloading its runtime on first
// use; where it cannot be had, one line saying why, and the same app through the loopback browser host.
import { spawn, spawnSync } from 'node:child_process';
import { existsSync, readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { dirname, join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const args = process.argv.slice(2);

/**
 * The Electron executable, or why there is none. This reads the package's own record instead of
 * calling require('electron'), which would try to download the runtime (it cannot, offline).
 */
function electronRuntime() {
  let packageDir;
  try {
    packageDir = dirname(createRequire(import.meta.url).resolve('electron/package.json'));
  } catch {
    return { missing: 'the electron package is not installed' };
  }
  const override = process.env.ELECTRON_OVERRIDE_DIST_PATH;
  const pathFile = join(packageDir, 'path.txt');
  const relative = existsSync(pathFile) ? readFileSync(pathFile, 'utf8').trim() : null;
  if (override) {
    const executable = join(override, relative ?? 'electron');
    return existsSync(executable)
      ? { executable }
      : { missing: `ELECTRON_OVERRIDE_DIST_PATH has no ${relative ?? 'electron'}` };
  }
  if (relative === null) return { missing: 'the Electron runtime was never downloaded' };
  const executable = join(packageDir, 'dist', relative);
  return existsSync(executable) ? { executable } : { missing: 'the Electron runtime files are incomplete' };
}

function noDisplay() {
  return process.platform === 'linux' && !process.env.DISPLAY && !process.env.WAYLAND_DISPLAY;
}

/**
 * On first start the Electron runtime is not there yet (electron 45 downloads nothing at install):
 * fetch it with the package's own installer, quietly, and report only whether that worked.
 */
function downloadRuntime() {
  let installer;
  try {
    installer = join(dirname(createRequire(import.meta.url).resolve('electron/package.json')), 'install.js');
  } catch {
    return false;
  }
  if (!existsSync(installer)) return false;
  process.stderr.write('Limit Ledger: first start: downloading the Electron runtime…\n');
  const result = spawnSync(process.execPath, [installer], { stdio: 'ignore', timeout: 10 * 60 * 1000 });
  return result.status === 0;
}

let runtime = electronRuntime();
if (runtime.missing && !process.env.ELECTRON_OVERRIDE_DIST_PATH && downloadRuntime())
  runtime = electronRuntime();
if (runtime.executable && !noDisplay()) {
  const child = spawn(runtime.executable, [root, ...args], { stdio: 'inherit' });
  child.on('exit', (code, signal) => {
    if (signal) process.kill(process.pid, signal);
    else process.exitCode = code ?? 0;
  });
  for (const signal of ['SIGINT', 'SIGTERM']) process.on(signal, () => child.kill(signal));
} else {
  const why = runtime.executable
    ? 'there is no display for a desktop window'
    : `${runtime.missing}, and it cannot be downloaded here`;
  process.stderr.write(
    `Limit Ledger: the Electron runtime cannot start (${why}); opening the app in your browser instead.\n`,
  );
  const cli = await import(pathToFileURL(join(root, 'dist', 'src-main', 'cli', 'main.js')).href).catch(
    () => null,
  );
  if (cli === null) {
    process.stderr.write('Limit Ledger: the program is not built yet; run `npm run build` first\n');
    process.exitCode = 1;
  } else {
    process.exitCode = await cli.main(['serve', ...args]);
  }
}
