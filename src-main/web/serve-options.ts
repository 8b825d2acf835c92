import { isAbsolute, resolve } from 'node:path';

export interface ServeOptions {
  port: number;
  workspace: string | null;
  open: boolean;
  dataFolder: string | null;
  help: boolean;
}

export const serveUsage = `Usage: limit-ledger serve [--port N] [--workspace DIR] [--no-open] [--data DIR]

Serves Limit Ledger to your browser on 127.0.0.1 only. The first line printed is the address to
open; it carries this run's token, which the page swaps for a session cookie.

  --port N          the port to listen on (default: a free port)
  --workspace DIR   the folder that holds your studies (default: "workspace" in the data folder)
  --data DIR        the application's data folder (site settings, recovery copies, logs)
  --no-open         do not open the default browser
`;

/** Parses `serve`'s arguments; an unknown or malformed option is an error naming it. */
export function parseServeOptions(
  argv: readonly string[],
  cwd = process.cwd(),
): ServeOptions | { error: string } {
  const options: ServeOptions = { port: 0, workspace: null, open: true, dataFolder: null, help: false };
  for (let index = 0; index < argv.length; index++) {
    const argument = argv[index];
    const [flag, inline] =
      argument.startsWith('--') && argument.includes('=')
        ? argument.split(/=(.*)/s, 2)
        : [argument, undefined];
    const value = (): string | null => {
      if (inline !== undefined) return inline;
      const next = argv[index + 1];
      if (next === undefined || next.startsWith('--')) return null;
      index++;
      return next;
    };
    switch (flag) {
      case '--port': {
        const text = value();
        const port = Number(text);
        if (text === null || !Number.isInteger(port) || port < 0 || port > 65535) {
          return { error: `--port needs a whole number from 0 to 65535, not "${text ?? ''}"` };
        }
        options.port = port;
        break;
      }
      case '--workspace':
      case '--data': {
        const text = value();
        if (text === null || text === '') return { error: `${flag} needs a folder` };
        const folder = isAbsolute(text) ? text : resolve(cwd, text);
        if (flag === '--workspace') options.workspace = folder;
        else options.dataFolder = folder;
        break;
      }
      case '--no-open':
        options.open = false;
        break;
      case '--help':
      case '-h':
        options.help = true;
        break;
      default:
        return { error: `unknown option "${argument}"` };
    }
  }
  return options;
}
