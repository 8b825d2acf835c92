import type { ImportOutcome } from '../../shared-core/import/import-report.js';
import type { AnalysisResult, Iteration, PeriodResult } from '../../shared-core/study/analysis-types.js';

/**
 * The `analyze --json` object: DESIGN.md's contract first (chart, limits, center, sigmaZ, periods,
 * dispersion, stable, warnings, rejected), then the fields added since (they keep their meaning).
 */
/** One period in the shape of the analyze contract (also used by `check` for new periods). */
export function periodJson(p: PeriodResult) {
  return {
    label: p.label,
    row: p.row,
    ...(p.rows ? { rows: p.rows } : {}),
    count: p.count,
    units: p.units,
    rate: p.rate,
    lcl: p.lcl,
    ucl: p.ucl,
    z: p.z,
    status: p.status,
    rules: p.rules,
    ...(p.cause ? { cause: p.cause } : {}),
  };
}

export function analysisJson(result: AnalysisResult, outcome: ImportOutcome, iterations: Iteration[]) {
  return {
    chart: result.chart,
    limits: result.limits,
    center: result.center,
    sigmaZ: result.sigmaZ,
    periods: result.periods.map(periodJson),
    dispersion: result.dispersion,
    stable: result.stable,
    warnings: [
      ...outcome.report.warnings.map((w) => ({ code: w.code, message: w.message })),
      ...result.warnings,
    ],
    rejected: outcome.rejected,
    rate: result.rate,
    rateSource: result.rateSource,
    rateInterval: result.rateInterval,
    rateEffect: result.rateEffect,
    multiplier: result.multiplier,
    alpha: result.alpha,
    fap: result.fap,
    m: result.m,
    totals: result.totals,
    averageK: result.averageK,
    iterations,
    noProduction: outcome.noProduction.map((o) => ({ label: o.label, row: o.row })),
    import: outcome.report,
  };
}
