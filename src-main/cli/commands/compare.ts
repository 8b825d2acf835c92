import { describeFinding } from '../../../shared-core/result.js';
import type { ImportOutcome } from '../../../shared-core/import/import-report.js';
import type { Observation, Warning } from '../../../shared-core/study/analysis-types.js';
import { dispersionCheck } from '../../../shared-core/study/dispersion-check.js';
import { rateRatioTest } from '../../../shared-core/changes/rate-ratio-test.js';
import { approvedBaseline, type ApprovedBaseline } from '../../../shared-core/changes/approved-baseline.js';
import { importFile } from '../../services/import/import-file.js';
import { openStudyFile } from '../../services/study-file.js';
import { importFlagHelp, importFlags, importRequestFromFlags } from '../import-flags.js';
import { exitOnInputError, InputError, parseCommandArgs } from '../input-error.js';

export const usage = `Usage: limit-ledger compare BASE NEW --count COL [--units COL] [--label COL]
  [--confidence C] [--skip-invalid] [--json]

Compares the rate of nonconformities per inspection unit in NEW with the rate in BASE: the ratio
new/base, its exact interval and the exact conditional test of "no change" (Przyborowski &
Wilenski 1940). BASE is a data file with the same columns as NEW, or a study (.ledger), meaning
the included periods of its latest approved revision.

  ${importFlagHelp.join('\n  ')}
  --confidence C          confidence of the interval (default 0.95)
  --skip-invalid          leave out invalid rows, each listed under "rejected"
  --json                  print one JSON object
`;

/** Over-dispersion at this level in either sample makes the exact test optimistic. */
const DISPERSION_LEVEL = 0.01;

export const run = exitOnInputError('compare', compare);

/**
 * The periods of a data file through the import module; invalid cells stop the command with every
 * one listed (file, row, column), unless `skipInvalid`, when they are returned under `rejected`.
 */
export async function importPeriods(
  file: string,
  values: Record<string, unknown>,
  skipInvalid: boolean,
): Promise<ImportOutcome> {
  const request = importRequestFromFlags(values);
  if (!request.ok) throw new InputError(request.findings.map(describeFinding).join('\n'));
  const imported = await importFile(file, request.value);
  if (!imported.ok) throw new InputError(imported.findings.map(describeFinding).join('\n'));
  const outcome = imported.value;
  if (outcome.rejected.length > 0 && !skipInvalid) {
    const lines = outcome.rejected.map((r) =>
      describeFinding({
        file: r.file ?? outcome.report.file ?? file,
        row: r.row,
        column: r.column,
        value: r.value,
        message: r.message,
      }),
    );
    throw new InputError(
      `${lines.join('\n')}\n${outcome.rejected.length} invalid cell(s); fix them, or use --skip-invalid to leave those rows out`,
    );
  }
  if (outcome.observations.length === 0)
    throw new InputError(`${outcome.report.file ?? file}: no periods to compare`);
  return outcome;
}

/** A path that names a study document rather than a data file. */
export const isStudyPath = (path: string) => path.toLowerCase().endsWith('.ledger');

/** The latest approved revision of a study file, recomputed as it was approved. */
export async function openBaseline(file: string): Promise<ApprovedBaseline> {
  const opened = await openStudyFile(file);
  if (!opened.ok) throw new InputError(opened.findings.map(describeFinding).join('\n'));
  if (opened.value.readOnly)
    throw new InputError(
      `${file}: the study does not verify, so its approved limits cannot be trusted as a baseline:\n${opened.value.problems
        .filter((p) => p.level === 'error')
        .map((p) => `  ${p.message}`)
        .join('\n')}`,
    );
  const baseline = approvedBaseline(opened.value.study);
  if (!baseline.ok)
    throw new InputError(baseline.findings.map((f) => describeFinding({ file, ...f })).join('\n'));
  return baseline.value;
}

function sampleOf(file: string, observations: readonly Observation[]) {
  const count = observations.reduce((sum, o) => sum + o.count, 0);
  const units = observations.reduce((sum, o) => sum + o.units, 0);
  const dispersion =
    count > 0 && observations.length > 1
      ? dispersionCheck(
          observations.map((o) => o.count),
          observations.map((o) => o.units),
          count / units,
          false,
        )
      : null;
  return {
    file,
    revision: undefined as number | undefined,
    periods: observations.length,
    count,
    units,
    rate: count / units,
    dispersion,
  };
}

/** The included periods of an approved revision, as one sample. */
function baselineSample(file: string, baseline: ApprovedBaseline): ReturnType<typeof sampleOf> {
  const { analysis, revision } = baseline;
  return {
    file,
    revision: revision.number,
    periods: analysis.m,
    count: analysis.totals.count,
    units: analysis.totals.units,
    rate: analysis.totals.count / analysis.totals.units,
    dispersion: analysis.dispersion,
  };
}

async function compare(argv: string[]): Promise<number> {
  const { values, positionals } = parseCommandArgs(
    argv,
    {
      ...importFlags,
      confidence: { type: 'string' },
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
  if (positionals.length !== 2) throw new InputError(`name two data files, BASE and NEW\n\n${usage}`);
  const [baseFile, newFile] = positionals;
  let confidence = 0.95;
  if (values.confidence !== undefined) {
    confidence = Number(values.confidence);
    if (values.confidence.trim() === '' || !(confidence > 0 && confidence < 1))
      throw new InputError(`--confidence "${values.confidence}" must be a probability between 0 and 1`);
  }
  const skip = values['skip-invalid'] === true;
  const studyBase = isStudyPath(baseFile) ? await openBaseline(baseFile) : null;
  const baseOutcome = studyBase ? null : await importPeriods(baseFile, values, skip);
  const newOutcome = await importPeriods(newFile, values, skip);
  const base = studyBase
    ? baselineSample(baseFile, studyBase)
    : sampleOf(baseOutcome?.report.file ?? baseFile, baseOutcome?.observations ?? []);
  const changed = sampleOf(newOutcome.report.file ?? newFile, newOutcome.observations);
  const overdispersed = [base, changed].some(
    (s) => s.dispersion !== null && s.dispersion.pOver < DISPERSION_LEVEL,
  );

  const test = rateRatioTest(base, changed, { confidence, overdispersed });
  if (!test.ok) throw new InputError(test.findings.map(describeFinding).join('\n'));
  const result = test.value;
  const warnings: Warning[] = [
    ...(baseOutcome?.report.warnings ?? []).map((w) => ({
      code: w.code,
      message: `${base.file}: ${w.message}`,
    })),
    ...newOutcome.report.warnings.map((w) => ({ code: w.code, message: `${changed.file}: ${w.message}` })),
    ...result.cautions,
  ];
  const sampleJson = (s: typeof base) => ({
    file: s.file,
    ...(s.revision !== undefined ? { revision: s.revision } : {}),
    periods: s.periods,
    count: s.count,
    units: s.units,
    rate: s.rate,
    dispersion: s.dispersion && {
      statistic: s.dispersion.statistic,
      df: s.dispersion.df,
      pOver: s.dispersion.pOver,
    },
  });

  if (values.json) {
    const json = {
      ratio: result.ratio,
      ciLow: result.ciLow,
      ciHigh: result.ciHigh,
      pValue: result.pValue,
      confidence: result.confidence,
      base: sampleJson(base),
      new: sampleJson(changed),
      test: 'exact conditional test of equal rates (Przyborowski & Wilenski 1940), Clopper–Pearson interval',
      warnings,
      rejected: [
        ...(baseOutcome?.rejected ?? []).map((r) => ({ file: base.file, ...r })),
        ...newOutcome.rejected.map((r) => ({ file: changed.file, ...r })),
      ],
    };
    process.stdout.write(`${JSON.stringify(json)}\n`);
    return 0;
  }
  const number = (x: number | null, digits = 4) => (x === null ? 'unbounded' : x.toPrecision(digits));
  const lines = [
    `Base: ${base.file}${base.revision !== undefined ? ` (approved revision ${base.revision})` : ''}: ${base.count} nonconformities in ${base.units} units over ${base.periods} periods (rate ${number(base.rate)})`,
    `New:  ${changed.file}: ${changed.count} nonconformities in ${changed.units} units over ${changed.periods} periods (rate ${number(changed.rate)})`,
    `Rate ratio new/base: ${number(result.ratio)}, ${Math.round(confidence * 100)} % interval ${number(result.ciLow)} to ${number(result.ciHigh)}`,
    `Exact test of no change: p = ${number(result.pValue, 3)}`,
    ...warnings.map((w) => `Note: ${w.message}`),
    '',
  ];
  process.stdout.write(lines.join('\n'));
  return 0;
}
