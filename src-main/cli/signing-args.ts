import { parseArgs, type ParseArgsConfig } from 'node:util';
import { keyOptions, refuseCommandLinePassphrase } from '../services/signing/key-flags.js';

/** The options of every signing command: the key, its passphrase's source, and --help. */
export const signingOptions = { ...keyOptions, help: { type: 'boolean', short: 'h' } } as const;

/**
 * The arguments of a signing command (sign, packet, countersign): a passphrase typed on the command
 * line is refused before anything else is read, then the options (`signingOptions` and the
 * command's own) are parsed strictly. Null when --help was asked: the usage is written, nothing else.
 */
export function signingCommandArgs<T extends ParseArgsConfig['options'] & typeof signingOptions>(
  argv: string[],
  options: T,
  usage: string,
) {
  refuseCommandLinePassphrase(argv);
  const parsed = parseArgs({ args: argv, strict: true, allowPositionals: true, options });
  if ((parsed.values as { help?: boolean }).help) {
    process.stdout.write(usage);
    return null;
  }
  return parsed;
}
