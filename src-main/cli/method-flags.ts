import { readFile } from 'node:fs/promises';
import { describeFinding, type Finding } from '../../shared-core/result.js';
import { parseRuleList } from '../../shared-core/rules/rule-catalog.js';
import { normalQuantile } from '../../shared-core/stats/normal.js';
import {
  defaultOptions,
  type AnalysisOptions,
  type AssignableCause,
  type Exclusion,
  type Observation,
} from '../../shared-core/study/analysis-types.js';
import { InputError } from './input-error.js';

/**
 * The method and exclusion flags that every command analysing a history shares (analyze, arl), in
 * the shape of the `options` of node's `util.parseArgs`, with one reading of their values.
 */
export const methodFlags = {
  chart: { type: 'string' },
  limits: { type: 'string' },
  sigma: { type: 'string' },
  alpha: { type: 'string' },
  fap: { type: 'string' },
  rate: { type: 'string' },
  exclude: { type: 'string', multiple: true },
  exclusions: { type: 'string' },
  rules: { type: 'string' },
} as const;

function numberFlag(
  values: Record<string, unknown>,
  name: string,
  test: (x: number) => boolean,
  what: string,
) {
  const text = values[name];
  if (text === undefined) return undefined;
  const value = Number(text);
  if (typeof text !== 'string' || text.trim() === '' || !Number.isFinite(value) || !test(value))
    throw new InputError(`--${name} "${String(text)}" ${what}`);
  return value;
}

export function analysisOptions(values: Record<string, unknown>): AnalysisOptions {
  const chart = values.chart as string | undefined;
  if (chart !== undefined && chart !== 'c' && chart !== 'u')
    throw new InputError(`--chart "${chart}" must be c or u`);
  const limits = (values.limits as string | undefined) ?? 'sigma';
  if (limits !== 'sigma' && limits !== 'probability' && limits !== 'laney')
    throw new InputError(`--limits "${limits}" must be sigma, probability or laney`);
  const sigma = numberFlag(values, 'sigma', (x) => x > 0, 'must be a positive multiplier');
  const alpha = numberFlag(values, 'alpha', (x) => x > 0 && x < 1, 'must be a probability between 0 and 1');
  const fap = numberFlag(values, 'fap', (x) => x > 0 && x < 1, 'must be a probability between 0 and 1');
  const rate = numberFlag(values, 'rate', (x) => x > 0, 'must be a positive rate per inspection unit');
  if (alpha !== undefined && fap !== undefined) throw new InputError('give --alpha or --fap, not both');
  let multiplier = sigma ?? defaultOptions.multiplier;
  if (limits !== 'probability' && (alpha !== undefined || fap !== undefined)) {
    // For sigma and Laney limits a false-alarm target sets the multiplier: L = z(1 − α/2).
    if (sigma !== undefined)
      throw new InputError('give --sigma or a false-alarm target (--alpha, --fap), not both');
    if (alpha !== undefined) multiplier = normalQuantile(1 - alpha / 2);
  }
  if (limits === 'probability' && sigma !== undefined)
    throw new InputError('--sigma sets sigma and Laney limits; probability limits take --alpha or --fap');
  let rules = defaultOptions.rules;
  if (values.rules !== undefined) {
    const parsed = parseRuleList(values.rules as string);
    if ('unknown' in parsed)
      throw new InputError(
        `--rules: unknown rule(s) ${parsed.unknown.map((r) => `"${r}"`).join(', ')}; known: beyond, zone-a, zone-b, run, run:9, trend, alternate, hug, avoid, all`,
      );
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

/** `CATEGORY: description` or a description alone (category "unspecified"). */
function causeFromText(text: string): AssignableCause {
  const colon = text.indexOf(':');
  if (colon > 0 && colon < text.length - 1) {
    return { category: text.slice(0, colon).trim(), description: text.slice(colon + 1).trim() };
  }
  return { category: 'unspecified', description: text.trim() };
}

/** Finds the period a label names: its label value, or `#ROW` for its spreadsheet row. */
export function periodIndex(label: string, observations: readonly Observation[]): number | string {
  const byRow = /^#(\d+)$/.exec(label);
  const matches = observations.flatMap((o, i) =>
    o.label === label || (byRow && o.row === Number(byRow[1])) ? [i] : [],
  );
  if (matches.length === 1) return matches[0];
  if (matches.length === 0) return `no period is labelled "${label}"`;
  const rows = matches.map((i) => `#${observations[i].row}`).join(', ');
  return `the label "${label}" names ${matches.length} periods; name one by its row: ${rows}`;
}

export function exclusionFromFlag(text: string, observations: readonly Observation[]): Exclusion {
  const equals = text.indexOf('=');
  if (equals <= 0) throw new InputError(`--exclude "${text}" must be LABEL=REASON`);
  const label = text.slice(0, equals).trim();
  const reason = text.slice(equals + 1).trim();
  if (reason === '') throw new InputError(`--exclude "${text}": an exclusion needs an assignable cause`);
  const index = periodIndex(label, observations);
  if (typeof index === 'string') throw new InputError(`--exclude: ${index}`);
  return { index, cause: causeFromText(reason) };
}

export async function exclusionsFromFile(
  file: string,
  observations: readonly Observation[],
): Promise<Exclusion[]> {
  let text: string;
  try {
    text = (await readFile(file, 'utf8')).replace(/^\uFEFF/, '');
  } catch (error) {
    throw new InputError(`${file}: cannot be read (${(error as NodeJS.ErrnoException).code ?? 'error'})`);
  }
  const { default: Papa } = await import('papaparse'); // loaded only when an exclusions file is named
  const parsed = Papa.parse<string[]>(text, { skipEmptyLines: 'greedy' });
  const [header, ...rows] = parsed.data;
  const column = (name: string) => (header ?? []).findIndex((h) => h.trim().toLowerCase() === name);
  const at = { label: column('label'), category: column('category'), description: column('description') };
  const reference = column('reference');
  const missing = Object.entries(at).filter(([, i]) => i < 0);
  if (missing.length > 0)
    throw new InputError(
      `${file}, row 1: the exclusions table needs the column(s) ${missing.map(([n]) => `"${n}"`).join(', ')} (found ${(header ?? []).map((h) => `"${h}"`).join(', ')})`,
    );
  const problems: Finding[] = [];
  const exclusions: Exclusion[] = [];
  rows.forEach((cells, i) => {
    const row = i + 2;
    const label = (cells[at.label] ?? '').trim();
    const category = (cells[at.category] ?? '').trim();
    const description = (cells[at.description] ?? '').trim();
    if (description === '') {
      problems.push({
        file,
        row,
        column: 'description',
        message: 'an exclusion needs a description of its cause',
      });
      return;
    }
    const index = periodIndex(label, observations);
    if (typeof index === 'string') {
      problems.push({ file, row, column: 'label', value: label, message: index });
      return;
    }
    const ref = reference >= 0 ? (cells[reference] ?? '').trim() : '';
    exclusions.push({
      index,
      cause: { category: category || 'unspecified', description, ...(ref ? { reference: ref } : {}) },
    });
  });
  if (problems.length > 0) throw new InputError(problems.map(describeFinding).join('\n'));
  return exclusions;
}
