/** A usage or input problem: exit status 2 with a message that names file, row and column. */
export class InputError extends Error {}

/**
 * A command's `run`: the body's exit status, or status 2 with `limit-ledger NAME: message` on
 * stderr when the body stops on an InputError. Other errors are the program's own and propagate.
 */
export function exitOnInputError(name: string, body: (argv: string[]) => Promise<number>) {
  return async (argv: string[]): Promise<number> => {
    try {
      return await body(argv);
    } catch (error) {
      if (error instanceof InputError) {
        process.stderr.write(`limit-ledger ${name}: ${error.message}\n`);
        return 2;
      }
      throw error;
    }
  };
}
