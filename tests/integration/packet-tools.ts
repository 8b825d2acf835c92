import { spawnSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { basename, join } from 'node:path';

/**
 * The outside tools the packet tests check against: poppler (pdfsig, pdftotext, pdftoppm),
 * OpenSSL and LibreOffice. CI installs them (.ci/run); a missing tool fails the test loudly.
 */
export function run(
  tool: string,
  args: string[],
  options: { input?: Buffer; env?: NodeJS.ProcessEnv; allowFailure?: boolean } = {},
) {
  const result = spawnSync(tool, args, {
    input: options.input,
    env: options.env ?? process.env,
    maxBuffer: 256 * 1024 * 1024,
  });
  if (result.error)
    throw new Error(
      `${tool} is needed by this test and cannot run (${result.error.message}); install it (see .ci/run)`,
    );
  if (result.status !== 0 && !options.allowFailure) {
    throw new Error(`${tool} ${args.join(' ')} failed (${result.status}): ${result.stderr.toString()}`);
  }
  return {
    status: result.status,
    stdout: result.stdout.toString('utf8'),
    stderr: result.stderr.toString('utf8'),
  };
}

export const scratch = (name: string) => mkdtempSync(join(tmpdir(), `ll-${name}-`));

/**
 * Opens spreadsheets in LibreOffice headless and saves them again as .xlsx, so every formula is
 * computed by LibreOffice rather than by us. The profile forces recalculation on load for OOXML
 * files (Calc's "Recalculation on File Load: Always"), in case a cached value was left anywhere.
 */
export function recalculateWithLibreOffice(files: string[]): string[] {
  const home = scratch('soffice-home');
  const profile = join(home, 'profile');
  mkdirSync(join(profile, 'user'), { recursive: true });
  writeFileSync(
    join(profile, 'user', 'registrymodifications.xcu'),
    `<?xml version="1.0" encoding="UTF-8"?>
<oor:items xmlns:oor="http://openoffice.org/2001/registry" xmlns:xs="http://www.w3.org/2001/XMLSchema" xmlns:xsi="http://www.w3.org/2001/XMLSchema-instance">
<item oor:path="/org.openoffice.Office.Calc/Formula/Load"><prop oor:name="OOXMLRecalcMode" oor:op="fuse"><value>0</value></prop></item>
<item oor:path="/org.openoffice.Office.Calc/Formula/Load"><prop oor:name="ODFRecalcMode" oor:op="fuse"><value>0</value></prop></item>
</oor:items>
`,
  );
  const out = join(home, 'out');
  mkdirSync(out);
  run(
    'soffice',
    [
      `-env:UserInstallation=file://${profile}`,
      '--headless',
      '--norestore',
      '--convert-to',
      'xlsx:Calc MS Excel 2007 XML',
      '--outdir',
      out,
      ...files,
    ],
    {
      env: { ...process.env, HOME: home },
    },
  );
  return files.map((file) => join(out, basename(file)));
}

export const readBytes = (path: string) => readFileSync(path);
