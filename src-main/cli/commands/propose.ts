import { describeFinding } from '../../../shared-core/result.js';
import { firstNewPeriod, proposeChange } from '../../../shared-core/changes/propose-change.js';
import { localTime } from '../../../shared-core/study/local-time.js';
import { reasonCategorySchema, reasonForChangeList } from '../../../shared-core/study/revision-schema.js';
import { addPeriods, deriveState } from '../../../shared-core/study/study-state.js';
import { openStudyFile, saveStudyFile } from '../../services/study-file.js';
import { importFlagHelp, importFlags } from '../import-flags.js';
import { exitOnInputError, InputError, parseCommandArgs } from '../input-error.js';
import { periodIndex } from '../method-flags.js';
import { importPeriods, isStudyPath } from './compare.js';

export const usage = `Usage: limit-ledger propose STUDY --reason-category CATEGORY --reason TEXT --who NAME
  [--add NEWDATA --count COL [--units COL] [--label COL] [--skip-invalid]] [--from LABEL]

Proposes a change of the approved limits of STUDY (.ledger), saved in place. With --add, the new
periods of NEWDATA are first appended to the study (their source file's hash on record). The
history is split at the first period of the new study (the first new period, or --from) and a
draft revision is opened with the reason; its Phase I is that last segment. Then sign it with
\`limit-ledger sign\` and make the change packet with \`limit-ledger packet\`.

  --reason-category C   ${reasonForChangeList.map((r) => r.id).join(', ')}
  --reason TEXT         what changed and why the approved limits no longer serve
  --who NAME            your printed name, on the audit trail
  --add NEWDATA         a data file of new periods to append first
  --from LABEL          the first period of the new study (a label or #ROW)
  ${importFlagHelp.join('\n  ')}
  --skip-invalid        leave out invalid rows of NEWDATA
`;

export const run = exitOnInputError('propose', propose);

async function propose(argv: string[]): Promise<number> {
  const { values, positionals } = parseCommandArgs(
    argv,
    {
      ...importFlags,
      'reason-category': { type: 'string' },
      reason: { type: 'string' },
      who: { type: 'string' },
      add: { type: 'string' },
      from: { type: 'string' },
      'skip-invalid': { type: 'boolean' },
      help: { type: 'boolean', short: 'h' },
    },
    usage,
  );
  if (values.help) {
    process.stdout.write(usage);
    return 0;
  }
  if (positionals.length !== 1 || !isStudyPath(positionals[0]))
    throw new InputError(`name one study (.ledger)\n\n${usage}`);
  const file = positionals[0];
  const category = reasonCategorySchema.safeParse(values['reason-category']);
  if (!category.success)
    throw new InputError(
      `--reason-category must be one of ${reasonForChangeList.map((r) => r.id).join(', ')}`,
    );
  if (!values.reason?.trim()) throw new InputError('--reason: a change needs its reason in words');
  if (!values.who?.trim()) throw new InputError('--who: name the person proposing the change');

  const opened = await openStudyFile(file);
  if (!opened.ok) throw new InputError(opened.findings.map(describeFinding).join('\n'));
  if (opened.value.readOnly)
    throw new InputError(`${file}: the study does not verify; a change cannot be proposed on it`);
  let study = opened.value.study;
  const now = localTime(Date.now(), -new Date().getTimezoneOffset());
  const notes: string[] = [];

  if (values.add !== undefined) {
    const outcome = await importPeriods(values.add, values, values['skip-invalid'] === true);
    const added = addPeriods(
      study,
      {
        who: values.who.trim(),
        file: outcome.report.file ?? values.add,
        sourceSha256: outcome.report.sha256 ?? '0'.repeat(64),
        observations: outcome.observations,
      },
      now,
    );
    if (!added.ok)
      throw new InputError(added.findings.map((f) => describeFinding({ file: values.add, ...f })).join('\n'));
    study = added.value;
    notes.push(`${outcome.observations.length} new period(s) added from ${values.add}`);
  }

  let firstIndex = firstNewPeriod(study);
  if (values.from !== undefined) {
    const index = periodIndex(values.from, deriveState(study).observations);
    if (typeof index === 'string') throw new InputError(`--from: ${index}`);
    firstIndex = index;
  }
  if (firstIndex >= study.observations.length)
    throw new InputError(
      `${file}: there are no periods after the approved revision's; add them with --add, or name the first period of the new study with --from`,
    );
  const proposed = proposeChange(
    study,
    { who: values.who.trim(), category: category.data, reason: values.reason, firstIndex },
    now,
  );
  if (!proposed.ok)
    throw new InputError(proposed.findings.map((f) => describeFinding({ file, ...f })).join('\n'));
  const saved = await saveStudyFile(file, proposed.value, { expectedDiskHash: opened.value.diskHash });
  if (!saved.ok) throw new InputError(saved.findings.map(describeFinding).join('\n'));
  const draft = proposed.value.revisions.at(-1)!;
  const start = proposed.value.observations[firstIndex].label;
  notes.push(
    `revision ${draft.number} drafted: a change of revision ${draft.supersedes?.replace(/^rev-/, '')} for "${values.reason.trim()}", its study from period ${start} (${draft.included.length} included)`,
  );
  process.stdout.write(notes.map((n) => `${n}\n`).join(''));
  return 0;
}
