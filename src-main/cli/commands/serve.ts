import { openBrowser } from '../../web/open-browser.js';
import { startBrowserHost } from '../../web/browser-host.js';
import { parseServeOptions, serveUsage } from '../../web/serve-options.js';

/**
 * `limit-ledger serve`: the app in the default browser, through the loopback host. The first line
 * of stdout is the address to open (with this run's token); the host runs until interrupted.
 */
export async function run(argv: string[]): Promise<number> {
  const options = parseServeOptions(argv);
  if ('error' in options) {
    process.stderr.write(`limit-ledger serve: ${options.error}\n\n${serveUsage}`);
    return 2;
  }
  if (options.help) {
    process.stdout.write(serveUsage);
    return 0;
  }
  let host;
  try {
    host = await startBrowserHost({
      port: options.port,
      workspace: options.workspace,
      dataFolder: options.dataFolder,
      log: (line) => process.stderr.write(`limit-ledger serve: ${line}\n`),
    });
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code;
    const why =
      code === 'EADDRINUSE' ? `port ${options.port} is in use; choose another with --port` : String(error);
    process.stderr.write(`limit-ledger serve: cannot start: ${why}\n`);
    return 1;
  }
  process.stdout.write(`${host.url}\n`);
  process.stdout.write(
    `Limit Ledger is serving on 127.0.0.1 only; studies are kept in ${host.workspace}. Press Ctrl+C to stop.\n`,
  );
  if (options.open && !(await openBrowser(host.url))) {
    process.stdout.write('No browser could be opened from here; open the address above yourself.\n');
  }
  return new Promise<number>((resolve) => {
    const stop = (): void => {
      process.off('SIGINT', stop);
      process.off('SIGTERM', stop);
      void host.close().then(() => resolve(0));
    };
    process.on('SIGINT', stop);
    process.on('SIGTERM', stop);
  });
}
