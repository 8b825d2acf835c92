import type { AnalysisResult } from '../../../shared-core/study/analysis-types.js';
import { limitsTable } from '../../../shared-core/study/revision-limits.js';

export { limitsTable, type LimitsRow } from '../../../shared-core/study/revision-limits.js';

/**
 * A cell that a spreadsheet would otherwise read as a formula or command: a leading = + - @, tab
 * or carriage return gets a leading apostrophe (OWASP, "CSV Injection").
 */
export function neutralizeCell(text: string): string {
  return /^[=+\-@\t\r]/.test(text) ? `'${text}` : text;
}

function csvField(value: string | number | null): string {
  const text = typeof value === 'number' ? String(value) : neutralizeCell(value ?? '');
  return /[",\n\r]/.test(text) || text !== text.trim() ? `"${text.replace(/"/g, '""')}"` : text;
}

/** Numbers are written in full (round-trip) precision; "none" marks a missing lower limit. */
export function limitsCsv(result: AnalysisResult, inspectionUnit: string): string {
  const lines = [
    ['units', 'lcl', 'ucl', 'center', 'chart', 'limits', 'inspection_unit'].join(','),
    ...limitsTable(result).map((row) =>
      [
        csvField(row.units),
        csvField(row.lcl ?? 'none'),
        csvField(row.ucl),
        csvField(result.chart === 'u' ? result.center : result.rate * row.units),
        result.chart,
        result.limits,
        csvField(inspectionUnit),
      ].join(','),
    ),
  ];
  return lines.join('\r\n') + '\r\n';
}

export function limitsJson(result: AnalysisResult, inspectionUnit: string, studyId: string): string {
  return (
    JSON.stringify(
      {
        studyId,
        chart: result.chart,
        limits: result.limits,
        inspectionUnit,
        rate: result.rate,
        center: result.center,
        multiplier: result.multiplier,
        alpha: result.alpha,
        sigmaZ: result.sigmaZ,
        table: limitsTable(result),
      },
      null,
      2,
    ) + '\n'
  );
}
