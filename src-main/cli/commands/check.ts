import { parseRuleList } from '../../../shared-core/rules/rule-catalog.js';
import { checkNewPeriods } from '../../../shared-core/changes/new-periods-check.js';
import { importFlagHelp, importFlags } from '../import-flags.js';
import { periodJson } from '../analysis-json.js';
import { exitOnInputError, InputError, parseCommandArgs } from '../input-error.js';
import { importPeriods, isStudyPath, openBaseline } from './compare.js';

export const usage = `Usage: limit-ledger check STUDY NEWDATA --count COL [--units COL] [--label COL]
  [--rules LIST] [--skip-invalid] [--json]

Judges new periods against the limits of the latest approved revision of STUDY (.ledger), as they
were approved: no recomputation. Each period gets its limits at its own inspection units and the
signal rules run over the new periods in order (the revision's rules unless --rules is given).

  ${importFlagHelp.join('\n  ')}
  --rules LIST            signal rules: beyond, zone-a, zone-b, run, run:9, trend, alternate, hug, avoid, all
  --skip-invalid          leave out invalid rows, each listed under "rejected"
  --json                  print one JSON object: the periods in the shape of analyze --json
`;

export const run = exitOnInputError('check', check);

async function check(argv: string[]): Promise<number> {
  const { values, positionals } = parseCommandArgs(
    argv,
    {
      ...importFlags,
      rules: { type: 'string' },
      'skip-invalid': { type: 'boolean' },
      json: { type: 'boolean' },
      help: { type: 'boolean', short: 'h' },
    },
    usage,
  );
  if (values.help) {
    process.stdout.write(usage);
    return 0;
  }
  if (positionals.length !== 2 || !isStudyPath(positionals[0]))
    throw new InputError(`name a study (.ledger) and a data file of new periods\n\n${usage}`);
  const [studyFile, dataFile] = positionals;
  const baseline = await openBaseline(studyFile);
  let rules = baseline.revision.method.rules;
  if (values.rules !== undefined) {
    const parsedRules = parseRuleList(values.rules);
    if ('unknown' in parsedRules)
      throw new InputError(`--rules: unknown rule(s) ${parsedRules.unknown.map((r) => `"${r}"`).join(', ')}`);
    rules = parsedRules.rules;
  }
  const outcome = await importPeriods(dataFile, values, values['skip-invalid'] === true);
  const approved = baseline.analysis;
  const periods = checkNewPeriods(approved, outcome.observations, rules);
  const signals = periods.filter((p) => p.status === 'signal');

  if (values.json) {
    const json = {
      revision: { id: baseline.revision.id, number: baseline.revision.number },
      chart: approved.chart,
      limits: approved.limits,
      center: approved.center,
      rate: approved.rate,
      sigmaZ: approved.sigmaZ,
      rules,
      periods: periods.map(periodJson),
      signals: signals.map((p) => p.label),
      warnings: outcome.report.warnings.map((w) => ({ code: w.code, message: w.message })),
      rejected: outcome.rejected,
    };
    process.stdout.write(`${JSON.stringify(json)}\n`);
    return 0;
  }
  const fixed = (x: number | null) => (x === null ? 'none' : x.toPrecision(4));
  const lines = [
    `${dataFile} against approved revision ${baseline.revision.number} of ${studyFile} (${approved.limits} limits, center ${fixed(approved.center)}; rules ${rules.join(', ')})`,
    ...periods.map(
      (p) =>
        `${p.label.padEnd(12)} ${String(p.count).padStart(6)} in ${String(p.units).padStart(6)}  LCL ${fixed(p.lcl).padStart(8)}  UCL ${fixed(p.ucl).padStart(8)}  ${p.status === 'signal' ? `signal: ${p.rules.join(', ')}` : 'in control'}`,
    ),
    signals.length === 0
      ? 'No new period signals against the approved limits.'
      : `${signals.length} period(s) signal against the approved limits: ${signals.map((p) => p.label).join(', ')}. Look for an assignable cause; a lasting change of rate calls for a proposed change of limits.`,
    '',
  ];
  process.stdout.write(lines.join('\n'));
  return 0;
}
