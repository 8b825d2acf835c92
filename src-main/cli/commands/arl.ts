import { describeFinding } from '../../../shared-core/result.js';
import type { AnalysisResult, RuleId } from '../../../shared-core/study/analysis-types.js';
import { analyzePhaseOne } from '../../../shared-core/study/phase-one.js';
import {
  averageRunLength,
  defaultShifts,
  limitsAtUnits,
  typicalUnits,
} from '../../../shared-core/changes/average-run-length.js';
import { importFlagHelp, importFlags } from '../import-flags.js';
import { exitOnInputError, InputError, parseCommandArgs } from '../input-error.js';
import { analysisOptions, exclusionFromFlag, exclusionsFromFile, methodFlags } from '../method-flags.js';
import { importPeriods, isStudyPath, openBaseline } from './compare.js';

export const usage = `Usage: limit-ledger arl FILE --count COL [--units COL] [--label COL]
  [--chart c|u] [--limits sigma|probability|laney] [--sigma L] [--alpha A | --fap F] [--rate R]
  [--exclude LABEL=REASON]... [--exclusions FILE] [--rules LIST] [--shifts LIST] [--at-units K] [--skip-invalid] [--json]
       limit-ledger arl STUDY [--rules LIST] [--shifts LIST] [--at-units K] [--json]

The average run length of the limits the analysis of FILE sets, or of the latest approved
revision of STUDY (.ledger): the expected number of periods to the first signal when the rate
stays where it is, and when it rises by the shifts asked (exact Poisson counts; one-point rule
1/p, rule sets by a Markov chain).

  ${importFlagHelp.join('\n  ')}
  --chart, --limits, --sigma, --alpha, --fap, --rate, --exclude, --exclusions, --rules   as for analyze
  --shifts LIST           rates as multiples of the center, e.g. 1.25,1.5,2 (the default)
  --at-units K            the inspection units of a period (default: the mean k of the included periods)
  --skip-invalid          leave out invalid rows
  --json                  print one JSON object
`;

/** Flags that describe a data file and its analysis: a study already fixes them. */
const studyOnlyFlags = [
  ...Object.keys(importFlags),
  'chart',
  'limits',
  'sigma',
  'alpha',
  'fap',
  'rate',
  'exclude',
  'exclusions',
  'skip-invalid',
];

export const run = exitOnInputError('arl', arl);

function positiveNumber(text: string | undefined, flag: string, test: (x: number) => boolean, what: string) {
  if (text === undefined) return undefined;
  const value = Number(text);
  if (text.trim() === '' || !Number.isFinite(value) || !test(value))
    throw new InputError(`--${flag} "${text}" ${what}`);
  return value;
}

/** `1.25,1.5,2`: each a positive multiple of the rate. */
export function parseShifts(text: string): number[] {
  const parts = text.split(',').map((part) => part.trim());
  return parts.map((part) => {
    const value = Number(part);
    if (part === '' || !Number.isFinite(value) || !(value > 0))
      throw new InputError(`--shifts "${text}": "${part}" is not a positive multiple of the rate`);
    return value;
  });
}

async function arl(argv: string[]): Promise<number> {
  const { values, positionals } = parseCommandArgs(
    argv,
    {
      ...importFlags,
      ...methodFlags,
      shifts: { type: 'string' },
      'at-units': { type: 'string' },
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
  if (positionals.length !== 1)
    throw new InputError(`name exactly one data file or study (.ledger)\n\n${usage}`);
  const shifts = values.shifts !== undefined ? parseShifts(values.shifts) : [...defaultShifts];
  const atUnits = positiveNumber(
    values['at-units'],
    'at-units',
    (x) => x > 0,
    'must be a positive number of units',
  );
  const target = positionals[0];
  let file = target;
  let result: AnalysisResult;
  let rules: RuleId[];
  let revision: number | null = null;
  let rejected: unknown[] = [];
  if (isStudyPath(target)) {
    const fixed = studyOnlyFlags.filter((flag) => values[flag as keyof typeof values] !== undefined);
    if (fixed.length > 0)
      throw new InputError(
        `${fixed.map((f) => `--${f}`).join(', ')}: a study's approved revision fixes its method and data; only --rules, --shifts and --at-units apply`,
      );
    const baseline = await openBaseline(target);
    result = baseline.analysis;
    revision = baseline.revision.number;
    rules =
      values.rules !== undefined
        ? analysisOptions({ rules: values.rules }).rules
        : baseline.revision.method.rules;
  } else {
    const options = analysisOptions(values);
    // --shifts here are rises in the rate (the name the issue gives), not the work-shift starts of
    // an event list that the import flags also call --shifts.
    const { shifts: _rises, ...importValues } = values;
    const outcome = await importPeriods(target, importValues, values['skip-invalid'] === true);
    file = outcome.report.file ?? target;
    const observations = outcome.observations;
    const exclusions = [
      ...(values.exclude ?? []).map((text) => exclusionFromFlag(text, observations)),
      ...(values.exclusions ? await exclusionsFromFile(values.exclusions, observations) : []),
    ];
    const analysis = analyzePhaseOne(observations, exclusions, options);
    if (!analysis.ok)
      throw new InputError(analysis.findings.map((f) => describeFinding({ file, ...f })).join('\n'));
    result = analysis.value;
    rules = options.rules;
    rejected = outcome.rejected;
  }
  const units = atUnits ?? typicalUnits(result);
  const at = limitsAtUnits(result, units);
  const runLength = averageRunLength(at, rules, shifts);
  if (!runLength.ok) throw new InputError(runLength.findings.map(describeFinding).join('\n'));
  const curve = runLength.value;
  const scale = result.chart === 'c' ? 1 : 1 / units;

  if (values.json) {
    const json = {
      ...(revision !== null ? { revision } : {}),
      chart: result.chart,
      limits: result.limits,
      center: at.rate * units * scale,
      rate: result.rate,
      units,
      lcl: at.limits.lower === null ? null : at.limits.lower * scale,
      ucl: at.limits.upper * scale,
      sigmaZ: result.sigmaZ,
      rules: curve.rules,
      method: curve.method,
      states: curve.states,
      inControlArl: curve.points[0].arl,
      curve: curve.points,
      stable: result.stable,
      warnings: [...result.warnings, ...curve.warnings],
      rejected,
    };
    process.stdout.write(`${JSON.stringify(json)}\n`);
    return 0;
  }
  const show = (x: number | null) => (x === null ? 'never' : x >= 1e6 ? x.toExponential(3) : x.toFixed(1));
  const lines = [
    `${file}${revision !== null ? ` (approved revision ${revision})` : ''}: ${result.limits} limits at k = ${units} (center ${(at.rate * units * scale).toPrecision(4)}, UCL ${(at.limits.upper * scale).toPrecision(4)}, LCL ${at.limits.lower === null ? 'none' : (at.limits.lower * scale).toPrecision(4)}); rules ${curve.rules.join(', ')}`,
    'Rate (× center)   Average run length (periods to the first signal)',
    ...curve.points.map(
      (p) => `${`${p.shift}${p.shift === 1 ? ' (in control)' : ''}`.padEnd(18)}${show(p.arl)}`,
    ),
    ...[...result.warnings, ...curve.warnings].map((w) => `Note: ${w.message}`),
    '',
  ];
  process.stdout.write(lines.join('\n'));
  return 0;
}
