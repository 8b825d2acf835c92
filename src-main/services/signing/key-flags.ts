import { readPassphrase, type PassphraseSource } from './passphrase.js';
import { KeyError } from './signing-identity.js';

/** What a signing command reports as bad input (exit status 2): a key problem or a malformed flag. */
export const keyOrUsageError = (error: unknown): boolean =>
  error instanceof KeyError || (error as { code?: string }).code?.startsWith('ERR_PARSE_ARGS') === true;

/** The command-line options every signing command shares (node:util parseArgs form). */
export const keyOptions = {
  p12: { type: 'string' },
  'passphrase-env': { type: 'string' },
  'passphrase-fd': { type: 'string' },
} as const;

export const keyUsage = `  --p12 FILE             the signing key: a PKCS#12 file (.p12/.pfx) or a personal key file
  --passphrase-env VAR   read the key's passphrase from environment variable VAR
  --passphrase-fd N      read it from file descriptor N (e.g. 3 with 3<passfile)
                         (neither: you are asked on the terminal; never on the command line)`;

/** Refuses a passphrase typed as a command-line value before anything else is parsed. */
export function refuseCommandLinePassphrase(argv: string[]): void {
  if (argv.some((arg) => arg === '--passphrase' || arg.startsWith('--passphrase='))) {
    throw new KeyError(
      'a passphrase is never taken as a command-line value (other users and the shell history could read it); use --passphrase-env VAR, --passphrase-fd N or the prompt',
    );
  }
}

export function passphraseSource(
  values: { 'passphrase-env'?: string; 'passphrase-fd'?: string },
  question: string,
): PassphraseSource {
  if (values['passphrase-env'] && values['passphrase-fd'])
    throw new KeyError('give --passphrase-env or --passphrase-fd, not both');
  if (values['passphrase-env']) return { kind: 'env', variable: values['passphrase-env'] };
  if (values['passphrase-fd'] !== undefined) {
    const fd = Number(values['passphrase-fd']);
    if (!Number.isInteger(fd) || fd < 0)
      throw new KeyError(`--passphrase-fd needs a file descriptor number, not "${values['passphrase-fd']}"`);
    return { kind: 'fd', fd };
  }
  return { kind: 'prompt', question };
}

export const passphraseFrom = (
  values: { 'passphrase-env'?: string; 'passphrase-fd'?: string },
  question: string,
) => readPassphrase(passphraseSource(values, question));
