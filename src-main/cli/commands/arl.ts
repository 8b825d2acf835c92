import { parseArgs } from 'node:util';
import { describeFinding } from '../../../shared-core/result.js';
import { parseRuleList } from '../../../shared-core/rules/rule-catalog.js';
import { normalQuantile } from '../../../shared-core/stats/normal.js';
import {
  defaultOptions,
  type AnalysisOptions,
  type AnalysisResult,
  type Exclusion,
  type Observation,
  type RuleId,
} from '../../../shared-core/study/analysis-types.js';
import { analyzePhaseOne } from '../../../shared-core/study/phase-one.js';
import {
  averageRunLength,
  defaultShifts,
  limitsAtUnits,
  typicalUnits,
} from '../../../shared-core/changes/average-run-length.js';
import { importFlagHelp, importFlags } from '../import-flags.js';
import { periodIndex } from './analyze.js';
import { importPeriods, InputError, isStudyPath, openBaseline } from './compare.js';

export const usage = `Usage: limit-ledger arl FILE --count COL [--units COL] [--label COL]
  [--chart c|u] [--limits sigma|probability|laney] [--sigma L] [--alpha A | --fap F] [--rate R]
  [--exclude LABEL=REASON]... [--rules LIST] [--shifts LIST] [--at-units K] [--skip-invalid] [--json]
       limit-ledger arl STUDY [--rules LIST] [--shifts LIST] [--at-units K] [--json]

The average run length of the limits the analysis of FILE sets, or of the latest approved
revision of STUDY (.ledger): the expected number of periods to the first signal when the rate
stays where it is, and when it rises by the shifts asked (exact Poisson counts; one-point rule
1/p, rule sets by a Markov chain).

  ${importFlagHelp.join('\n  ')}
  --chart, --limits, --sigma, --alpha, --fap, --rate, --exclude, --rules   as for analyze
  --shifts LIST           rates as multiples of the center, e.g. 1.25,1.5,2 (the default)
  --at-units K            the inspection units of a period (default: the mean k of the included periods)
  --skip-invalid          leave out invalid rows
  --json                  print one JSON object
`;

/** Flags that describe a data file and its analysis: a study already fixes them. */
const studyOnlyFlags = [
  ...Object.keys(importFlags).filter((flag) => flag !== 'shifts'),
  'chart',
  'limits',
  'sigma',
  'alpha',
  'fap',
  'rate',
  'exclude',
  'skip-invalid',
];

export async function run(argv: string[]): Promise<number> {
  try {
    return await arl(argv);
  } catch (error) {
    if (error instanceof InputError) {
      process.stderr.write(`limit-ledger arl: ${error.message}\n`);
      return 2;
    }
    throw error;
  }
}

function positiveNumber(text: string | undefined, flag: string, test: (x: number) => boolean, what: string) {
  if (text === undefined) return undefined;
  const value = Number(text);
  if (text.trim() === '' || !Number.isFinite(value) || !test(value))
    throw new InputError(`--${flag} "${text}" ${what}`);
  return value;
}

/** The method flags of analyze, with the same meaning and the same checks. */
function methodOptions(values: Record<string, string | boolean | string[] | undefined>): AnalysisOptions {
  const text = (name: string) => values[name] as string | undefined;
  const chart = text('chart');
  if (chart !== undefined && chart !== 'c' && chart !== 'u')
    throw new InputError(`--chart "${chart}" must be c or u`);
  const limits = text('limits') ?? 'sigma';
  if (limits !== 'sigma' && limits !== 'probability' && limits !== 'laney')
    throw new InputError(`--limits "${limits}" must be sigma, probability or laney`);
  const probability = (x: number) => x > 0 && x < 1;
  const sigma = positiveNumber(text('sigma'), 'sigma', (x) => x > 0, 'must be a positive multiplier');
  const alpha = positiveNumber(text('alpha'), 'alpha', probability, 'must be a probability between 0 and 1');
  const fap = positiveNumber(text('fap'), 'fap', probability, 'must be a probability between 0 and 1');
  const rate = positiveNumber(
    text('rate'),
    'rate',
    (x) => x > 0,
    'must be a positive rate per inspection unit',
  );
  if (alpha !== undefined && fap !== undefined) throw new InputError('give --alpha or --fap, not both');
  let multiplier = sigma ?? defaultOptions.multiplier;
  if (limits !== 'probability' && (alpha !== undefined || fap !== undefined)) {
    if (sigma !== undefined)
      throw new InputError('give --sigma or a false-alarm target (--alpha, --fap), not both');
    if (alpha !== undefined) multiplier = normalQuantile(1 - alpha / 2);
  }
  if (limits === 'probability' && sigma !== undefined)
    throw new InputError('--sigma sets sigma and Laney limits; probability limits take --alpha or --fap');
  let rules = defaultOptions.rules;
  if (text('rules') !== undefined) {
    const parsed = parseRuleList(text('rules') as string);
    if ('unknown' in parsed)
      throw new InputError(`--rules: unknown rule(s) ${parsed.unknown.map((r) => `"${r}"`).join(', ')}`);
    rules = parsed.rules;
  }
  return {
    ...(chart ? { chart } : {}),
    limits,
    multiplier,
    alpha: alpha ?? defaultOptions.alpha,
    ...(fap !== undefined ? { fap } : {}),
    ...(rate !== undefined ? { knownRate: rate } : {}),
    rules,
  };
}

function exclusionFrom(text: string, observations: readonly Observation[]): Exclusion {
  const equals = text.indexOf('=');
  if (equals <= 0) throw new InputError(`--exclude "${text}" must be LABEL=REASON`);
  const reason = text.slice(equals + 1).trim();
  if (reason === '') throw new InputError(`--exclude "${text}": an exclusion needs an assignable cause`);
  const index = periodIndex(text.slice(0, equals).trim(), observations);
  if (typeof index === 'string') throw new InputError(`--exclude: ${index}`);
  const colon = reason.indexOf(':');
  const cause =
    colon > 0 && colon < reason.length - 1
      ? { category: reason.slice(0, colon).trim(), description: reason.slice(colon + 1).trim() }
      : { category: 'unspecified', description: reason };
  return { index, cause };
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
  let parsed;
  try {
    parsed = parseArgs({
      args: argv,
      allowPositionals: true,
      strict: true,
      options: {
        ...importFlags,
        chart: { type: 'string' },
        limits: { type: 'string' },
        sigma: { type: 'string' },
        alpha: { type: 'string' },
        fap: { type: 'string' },
        rate: { type: 'string' },
        exclude: { type: 'string', multiple: true },
        rules: { type: 'string' },
        shifts: { type: 'string' },
        'at-units': { type: 'string' },
        'skip-invalid': { type: 'boolean' },
        json: { type: 'boolean' },
        help: { type: 'boolean', short: 'h' },
      },
    });
  } catch (error) {
    throw new InputError(`${(error as Error).message}\n\n${usage}`);
  }
  const { values, positionals } = parsed;
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
        ? methodOptions({ rules: values.rules }).rules
        : baseline.revision.method.rules;
  } else {
    const options = methodOptions(values);
    // --shifts here are rises in the rate (the name the issue gives), not the work-shift starts of
    // an event list that the import flags also call --shifts.
    const { shifts: _rises, ...importValues } = values;
    const outcome = await importPeriods(target, importValues, values['skip-invalid'] === true);
    file = outcome.report.file ?? target;
    const observations = outcome.observations;
    const exclusions = (values.exclude ?? []).map((text) => exclusionFrom(text, observations));
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
