import type { Finding } from '../result.js';

/** Which header names hold the count, the inspection units, the label and the date of each period. */
export interface ColumnMapping {
  count: string;
  units?: string;
  label?: string;
  date?: string;
}

export type ColumnRole = keyof ColumnMapping;

const normal = (name: string) => name.normalize('NFC').trim().toLowerCase().replace(/\s+/g, ' ');

/**
 * The index of a header name: an exact match first, else the one match ignoring case and spacing.
 * Two columns that match only loosely are ambiguous (null with a reason).
 */
export function columnIndex(header: string[], name: string): { index: number } | { message: string } {
  const exact = header.indexOf(name);
  if (exact >= 0) return { index: exact };
  const loose = header.flatMap((candidate, index) => (normal(candidate) === normal(name) ? [index] : []));
  if (loose.length === 1) return { index: loose[0] };
  const found = header.map((candidate) => `"${candidate}"`).join(', ');
  if (loose.length > 1)
    return {
      message: `more than one column of the header row is named like "${name}" (columns found: ${found})`,
    };
  return { message: `there is no column "${name}" in the header row (columns found: ${found || 'none'})` };
}

export type ResolvedColumns = { [role in ColumnRole]?: number } & { count: number };

/** The column index of every mapped role, or one finding per missing or doubly used column. */
export function resolveColumns(
  file: string,
  headerRow: number,
  header: string[],
  mapping: ColumnMapping,
): { ok: true; columns: ResolvedColumns } | { ok: false; findings: Finding[] } {
  const findings: Finding[] = [];
  const columns: Partial<ResolvedColumns> = {};
  const usedBy = new Map<number, ColumnRole>();
  for (const role of ['count', 'units', 'label', 'date'] as const) {
    const name = mapping[role];
    if (name === undefined || name === '') {
      if (role === 'count') findings.push({ file, message: 'no count column was named (--count COLUMN)' });
      continue;
    }
    const found = columnIndex(header, name);
    if ('message' in found) {
      findings.push({ file, row: headerRow, column: name, message: found.message });
      continue;
    }
    const other = usedBy.get(found.index);
    if (
      other !== undefined &&
      !(other === 'label' && role === 'date') &&
      !(other === 'date' && role === 'label')
    ) {
      findings.push({
        file,
        row: headerRow,
        column: name,
        message: `is named as both the ${other} and the ${role}`,
      });
      continue;
    }
    usedBy.set(found.index, role);
    columns[role] = found.index;
  }
  return findings.length > 0 ? { ok: false, findings } : { ok: true, columns: columns as ResolvedColumns };
}

const hints: Record<ColumnRole, RegExp> = {
  count: /^(nonconformit|defect|count|nc\b|faults?|flaws?|errors?|blemish|nonconform)/,
  units: /^(units?|inspected|inspection units?|sample size|size|n\b|area|length|boards|pieces|quantity|qty)/,
  label: /^(label|lot|batch|period|shift|id\b|name|sample\b|roll|run|week)/,
  date: /^(date|day|time|timestamp|when|produced)/,
};

/**
 * A first guess at the mapping from header names, for the user to confirm in the preview; it is
 * never used without confirmation (the CLI always names its columns).
 */
export function suggestMapping(header: string[]): Partial<ColumnMapping> {
  const suggestion: Partial<ColumnMapping> = {};
  const taken = new Set<number>();
  for (const role of ['count', 'units', 'date', 'label'] as const) {
    const index = header.findIndex((name, i) => !taken.has(i) && hints[role].test(normal(name)));
    if (index >= 0) {
      suggestion[role] = header[index];
      taken.add(index);
    }
  }
  return suggestion;
}
