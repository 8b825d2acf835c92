#!/usr/bin/env node
// The built CLI lives in dist/ (npm run build); this shim keeps the "bin" path stable.
import('../dist/src-main/cli/main.js').then(
  (cli) => cli.main(process.argv.slice(2)).then((code) => (process.exitCode = code)),
  (error) => {
    if (error && error.code === 'ERR_MODULE_NOT_FOUND') {
      process.stderr.write('limit-ledger: the program is not built yet; run `npm run build` first\n');
      process.exitCode = 1;
    } else throw error;
  },
);
