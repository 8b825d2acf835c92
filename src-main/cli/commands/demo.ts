import { randomUUID } from 'node:crypto';
import { parseArgs } from 'node:util';
import { describeFinding } from '../../../shared-core/result.js';
import { demoLabel, demoStudy } from '../../../shared-core/study/demo-scenario.js';
import { saveStudyFile } from '../../services/study-file.js';
import { hostClock, hostUser } from '../../services/study-from-analysis.js';

export const usage = `Usage: limit-ledger demo --out FILE [--force]

  Writes a demo study of an invented scenario (a made-up enamel plant, 30 shifts of blemish
  counts on oven-door panels, two planted assignable causes and the shift notes that explain them).
  Every output made from it says the data are invented.

  --out FILE   the study file to write (.ledger)
  --force      replace FILE if it exists (its previous version is kept as FILE.bak)
`;

export async function run(argv: string[]): Promise<number> {
  let values;
  try {
    ({ values } = parseArgs({
      args: argv,
      strict: true,
      options: { out: { type: 'string' }, force: { type: 'boolean' }, help: { type: 'boolean', short: 'h' } },
    }));
  } catch (error) {
    process.stderr.write(`limit-ledger demo: ${(error as Error).message}\n\n${usage}`);
    return 2;
  }
  if (values.help) {
    process.stdout.write(usage);
    return 0;
  }
  if (!values.out) {
    process.stderr.write(`limit-ledger demo: name the file to write with --out FILE\n\n${usage}`);
    return 2;
  }
  const study = demoStudy({ id: randomUUID(), who: hostUser(), now: hostClock() });
  const saved = await saveStudyFile(values.out, study, values.force ? {} : { expectedDiskHash: null });
  if (!saved.ok) {
    const hint = values.force ? '' : ' (use --force to replace it)';
    process.stderr.write(`limit-ledger demo: ${saved.findings.map(describeFinding).join('\n')}${hint}\n`);
    return 2;
  }
  process.stdout.write(`${values.out}: demo study written. ${demoLabel}.\n`);
  return 0;
}
