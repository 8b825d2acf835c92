/**
 * Errors are values inside the core: a finding names where the problem is (file, row as the
 * spreadsheet numbers it, column) and what is wrong. Only the CLI turns findings into exit codes.
 */
export interface Finding {
  file?: string;
  row?: number;
  column?: string;
  value?: string;
  message: string;
}

export type Result<T> = { ok: true; value: T } | { ok: false; findings: Finding[] };

export const ok = <T>(value: T): Result<T> => ({ ok: true, value });
export const fail = <T = never>(...findings: Finding[]): Result<T> => ({ ok: false, findings });

/** `h.csv, row 5, column "count": "2.5" is not a whole number of nonconformities` */
export function describeFinding(finding: Finding): string {
  const where = [
    finding.file,
    finding.row !== undefined ? `row ${finding.row}` : undefined,
    finding.column !== undefined ? `column "${finding.column}"` : undefined,
  ].filter((part) => part !== undefined);
  const value = finding.value !== undefined ? `"${finding.value}" ` : '';
  return where.length > 0 ? `${where.join(', ')}: ${value}${finding.message}` : `${value}${finding.message}`;
}
