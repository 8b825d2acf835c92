import { describeFinding } from '../../../shared-core/result.js';
import type { AnalysisResult } from '../../../shared-core/study/analysis-types.js';
import { iterationHistory, iterationSnapshot } from '../../../shared-core/study/iteration-history.js';
import { analyzePhaseOne } from '../../../shared-core/study/phase-one.js';
import { rejectionFinding, type ImportOutcome } from '../../../shared-core/import/import-report.js';
import { importFile } from '../../services/import/import-file.js';
import { importFlagHelp, importFlags, importRequestFromFlags } from '../import-flags.js';
import { exitOnInputError, InputError, parseCommandArgs } from '../input-error.js';
import { analysisOptions, exclusionFromFlag, exclusionsFromFile, methodFlags } from '../method-flags.js';
import { writeAnalysisJson } from '../analysis-json.js';

export const usage = `Usage: limit-ledger analyze FILE --count COL [--units COL] [--label COL] [--chart c|u]
  [--limits sigma|probability|laney] [--sigma L] [--alpha A | --fap F] [--rate R]
  [--exclude LABEL=REASON]... [--exclusions FILE] [--rules LIST] [--skip-invalid] [--json] [--save STUDY]

  ${importFlagHelp.join('\n  ')}
  --chart c|u             c needs the same units in every period (default: c when they are equal, else u)
  --limits METHOD         sigma (default), probability (exact Poisson) or laney (u′)
  --sigma L               the multiplier of sigma and Laney limits (default 3)
  --alpha A               per-point false-alarm probability of probability limits (default 0.0027)
  --fap F                 Phase I false-alarm probability over the included periods instead of --alpha
  --rate R                a known (standard) rate per inspection unit instead of the estimate
  --exclude L=REASON      exclude period L (its label, or #ROW) with an assignable cause,
                          REASON as "CATEGORY: description" or a description alone
  --exclusions FILE       a table with columns label, category, description, reference
  --rules LIST            signal rules: beyond (default), zone-a, zone-b, run (run:8), run:9, trend,
                          alternate, hug, avoid, or all
  --skip-invalid          analyze the valid rows and list each left-out row under "rejected"
  --json                  print one JSON object (the contract in DESIGN.md)
  --save STUDY            also write the study (.ledger): the import, each exclusion and the iterations
`;

export const run = exitOnInputError('analyze', analyze);

async function analyze(argv: string[]): Promise<number> {
  const { values, positionals } = parseCommandArgs(
    argv,
    {
      ...importFlags,
      ...methodFlags,
      'skip-invalid': { type: 'boolean' },
      json: { type: 'boolean' },
      save: { type: 'string' },
      help: { type: 'boolean', short: 'h' },
    },
    usage,
  );
  if (values.help) {
    process.stdout.write(usage);
    return 0;
  }
  if (positionals.length !== 1) throw new InputError(`name exactly one data file\n\n${usage}`);
  const file = positionals[0];

  const options = analysisOptions(values);
  const request = importRequestFromFlags(values);
  if (!request.ok) throw new InputError(request.findings.map(describeFinding).join('\n'));

  const imported = await importFile(file, request.value);
  if (!imported.ok) throw new InputError(imported.findings.map(describeFinding).join('\n'));
  const outcome = imported.value;
  if (outcome.rejected.length > 0 && !values['skip-invalid']) {
    const lines = outcome.rejected.map((r) => describeFinding(rejectionFinding(outcome.report.location, r)));
    throw new InputError(
      `${lines.join('\n')}\n${outcome.rejected.length} invalid cell(s); fix them, or use --skip-invalid to analyze the other rows`,
    );
  }
  const observations = outcome.observations;

  const exclusions = [
    ...(values.exclude ?? []).map((text) => exclusionFromFlag(text, observations)),
    ...(values.exclusions ? await exclusionsFromFile(values.exclusions, observations) : []),
  ];

  const result = analyzePhaseOne(observations, exclusions, options);
  if (!result.ok)
    throw new InputError(result.findings.map((f) => describeFinding({ file, ...f })).join('\n'));
  // The iterations: the trial limits before any exclusion, then the result above.
  const trial = exclusions.length > 0 ? iterationHistory(observations, [[]], options) : undefined;
  const iterations = [...(trial?.ok ? trial.value : []), iterationSnapshot(result.value)];

  if (values.save) {
    // The study document (and its schema library) loads only when a study is written.
    const { saveAnalysisStudy } = await import('../../services/study-from-analysis.js');
    const saved = await saveAnalysisStudy(values.save, {
      file,
      outcome,
      method: options,
      exclusions,
      iterations,
    });
    if (!saved.ok) throw new InputError(saved.findings.map(describeFinding).join('\n'));
  }
  if (values.json) {
    // A reader that stops early (`| head`) closes the pipe: that ends the output, quietly.
    process.stdout.on('error', (error: NodeJS.ErrnoException) => {
      if (error.code !== 'EPIPE') throw error;
      process.exit(0);
    });
    // Written in chunks of bytes as it is made: a long history's text is never held as one string.
    writeAnalysisJson(result.value, outcome, iterations, (bytes) => process.stdout.write(bytes));
    process.stdout.write('\n');
  } else {
    const { analysisTable } = await import('../analysis-table.js');
    process.stdout.write(analysisTable(result.value, outcome, file));
  }
  return 0;
}

export type { AnalysisResult, ImportOutcome };
