import { extname, isAbsolute, resolve } from 'node:path';
import type { FilePurpose } from '../../shared-core/api.js';

/** File extensions the app opens, and what each is for. */
export const openableExtensions: Readonly<Record<string, FilePurpose>> = {
  '.ledger': 'study',
  '.csv': 'data',
  '.txt': 'data',
  '.tsv': 'data',
  '.xlsx': 'data',
};

export function purposeOfFile(path: string): FilePurpose | null {
  return openableExtensions[extname(path).toLowerCase()] ?? null;
}

/**
 * The files named on a command line (a double-clicked `.ledger`, or a second launch forwarded by
 * the single-instance lock): only arguments that are not switches and have an extension the app
 * opens; relative ones resolve against the launching folder.
 */
export function filesFromArgv(argv: readonly string[], cwd: string): string[] {
  return argv
    .slice(1)
    .filter((argument) => !argument.startsWith('-') && purposeOfFile(argument) !== null)
    .map((argument) => (isAbsolute(argument) ? argument : resolve(cwd, argument)));
}
