/**
 * Numbers written as text, as people and spreadsheets write them: an optional sign (also the
 * Unicode minus), digits with an optional thousands separator used consistently (comma, point,
 * space, no-break space or apostrophe, never the decimal mark itself), an optional fraction after
 * the decimal mark, an optional exponent.
 *
 *   point: "1,234.5"  "1 234.5"  "1'234.5"  "1.5e3"
 *   comma: "1.234,5"  "1 234,5"  "1,5"
 *
 * Common practice (locale conventions); no source needed.
 */
export type DecimalMark = 'comma' | 'point';

const spaces = ' \u00a0\u202f';

function numberPattern(decimal: DecimalMark): RegExp {
  const mark = decimal === 'point' ? '\\.' : ',';
  const separators = decimal === 'point' ? `,${spaces}'` : `.${spaces}'`;
  const grouped = `\\d{1,3}(?<sep>[${separators}])\\d{3}(?:\\k<sep>\\d{3})*`;
  return new RegExp(
    `^(?<sign>[+\\-\\u2212]?)(?<int>${grouped}|\\d*)(?:${mark}(?<frac>\\d*))?(?<exp>[eE][+\\-]?\\d+)?$`,
  );
}

const patterns: Record<DecimalMark, RegExp> = {
  point: numberPattern('point'),
  comma: numberPattern('comma'),
};

/** The number a text cell holds under the given decimal mark, or null when it holds no number. */
const plainInteger = /^\d{1,15}$/;

export function parseNumberText(text: string, decimal: DecimalMark): number | null {
  // Most cells are plain whole numbers: read those without the general pattern.
  if (plainInteger.test(text)) return Number(text);
  const match = patterns[decimal].exec(text.trim());
  if (!match?.groups) return null;
  const { sign, int, sep, frac, exp } = match.groups;
  if (int === '' && (frac === undefined || frac === '')) return null;
  const digits = sep === undefined ? int : int.split(sep).join('');
  const negative = sign === '-' || sign === '\u2212';
  const value = Number(`${negative ? '-' : ''}${digits === '' ? '0' : digits}.${frac ?? ''}0${exp ?? ''}`);
  return Number.isNaN(value) ? null : value;
}

/** Whether a text could hold a number under this decimal mark. */
export function readsAsNumber(text: string, decimal: DecimalMark): boolean {
  return parseNumberText(text, decimal) !== null;
}
