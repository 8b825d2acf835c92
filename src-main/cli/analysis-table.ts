import type { ImportOutcome } from '../../shared-core/import/import-report.js';
import { ruleCatalog } from '../../shared-core/rules/rule-catalog.js';
import type { AnalysisResult, RuleId } from '../../shared-core/study/analysis-types.js';

const number = (x: number | null, digits = 4) =>
  x === null ? 'none' : Number(x.toPrecision(digits)).toString();

/** The readable form of an analysis: a table of periods and the verdict, for a terminal. */
export function analysisTable(result: AnalysisResult, outcome: ImportOutcome, file: string): string {
  const scale = 'rate';
  const method = {
    sigma: `${number(result.multiplier)}-sigma`,
    probability: 'exact Poisson probability',
    laney: 'Laney u′',
  }[result.limits];
  // A c chart plots the count itself; a u chart adds the rate column it plots.
  const header = [
    'period',
    'row',
    'count',
    'units',
    ...(result.chart === 'u' ? [scale] : []),
    'LCL',
    'UCL',
    'z',
    'status',
  ];
  const rows = result.periods.map((p) => [
    p.label,
    String(p.row),
    String(p.count),
    number(p.units),
    ...(result.chart === 'u' ? [number(p.rate)] : []),
    number(p.lcl),
    number(p.ucl),
    p.z.toFixed(2),
    p.status === 'signal' ? `signal: ${p.rules.join(', ')}` : p.status,
  ]);
  const widths = header.map((h, i) => Math.max(h.length, ...rows.map((r) => r[i].length)));
  const line = (cells: string[]) =>
    cells.map((c, i) => (i < 2 ? c.padEnd(widths[i]) : c.padStart(widths[i]))).join('  ');

  const signals = result.periods.filter((p) => p.status === 'signal');
  const out = [
    `${file}: ${result.chart} chart, ${method} limits, ${result.m} of ${result.periods.length} periods included`,
    `center ${number(result.center)} (rate ${number(result.rate)} per unit, ${result.rateSource}; 95 % interval ${number(result.rateInterval.lower)} to ${number(result.rateInterval.upper)})`,
    '',
    line(header),
    ...rows.map(line),
    '',
    `dispersion: D = ${number(result.dispersion.statistic)} on ${result.dispersion.df} df, P(over) = ${number(result.dispersion.pOver, 3)}, P(under) = ${number(result.dispersion.pUnder, 3)}`,
    `Phase I false-alarm probability of these limits: ${number(result.fap, 3)}`,
  ];
  for (const p of signals)
    out.push(
      `signal at ${p.label} (row ${p.row}): ${p.rules.map((r) => ruleCatalog[r as RuleId].words).join('; ')}`,
    );
  for (const w of [...outcome.report.warnings, ...result.warnings])
    out.push(`warning (${w.code}): ${w.message}`);
  for (const r of outcome.rejected)
    out.push(`left out: row ${r.row}, column "${r.column}": "${r.value}" ${r.message}`);
  out.push(
    result.stable
      ? 'verdict: stable: no included period signals under the selected rules'
      : `verdict: not stable: ${signals.length} included period(s) signal; look for assignable causes`,
    '',
  );
  return out.join('\n');
}
