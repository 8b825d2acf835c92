import { parseArgs, type ParseArgsConfig } from 'node:util';

/** A usage or input problem: exit status 2 with a message that names file, row and column. */
export class InputError extends Error {}

const isInputError = (error: unknown) => error instanceof InputError;

/**
 * A command's `run`: the body's exit status, or status 2 with `limit-ledger NAME: message` on
 * stderr when the body stops on an input error (an InputError unless the command says otherwise).
 * Other errors are the program's own and propagate.
 */
export function exitOnInputError(
  name: string,
  body: (argv: string[]) => Promise<number>,
  inputError: (error: unknown) => boolean = isInputError,
) {
  return async (argv: string[]): Promise<number> => {
    try {
      return await body(argv);
    } catch (error) {
      if (inputError(error)) {
        process.stderr.write(`limit-ledger ${name}: ${(error as Error).message}\n`);
        return 2;
      }
      throw error;
    }
  };
}

/** node's parseArgs (strict, with positionals), an unknown or malformed flag as an InputError with the usage. */
export function parseCommandArgs<T extends ParseArgsConfig['options']>(
  argv: string[],
  options: T,
  usage: string,
) {
  try {
    return parseArgs({ args: argv, allowPositionals: true, strict: true, options });
  } catch (error) {
    throw new InputError(`${(error as Error).message}\n\n${usage}`);
  }
}
