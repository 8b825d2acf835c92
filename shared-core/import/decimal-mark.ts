import type { DecimalMark } from './number-text.js';
import { readsAsNumber } from './number-text.js';

/** A cell of a number column, for choosing the decimal mark. */
export interface NumberCellText {
  row: number;
  column: string;
  text: string;
}

export type DecimalChoice =
  | { kind: 'chosen'; decimal: DecimalMark; source: 'given' | 'detected' | 'default'; reason: string }
  | { kind: 'ambiguous'; example: NumberCellText; message: string }
  | { kind: 'mixed'; comma: NumberCellText; point: NumberCellText; message: string };

const hasSeparator = /[.,]/;

/**
 * Which decimal mark the number columns use. A cell such as "1,5" or "1.234,5" reads only with a
 * decimal comma; "1.5" or "1,234.5" only with a decimal point. A cell such as "1,234" reads both
 * ways (1234 or 1.234): it is decided by the other cells, by the delimiter (a semicolon-delimited
 * file writes decimal commas, a comma-delimited one cannot), or else asked, never guessed.
 */
export function chooseDecimalMark(
  cells: NumberCellText[],
  given: DecimalMark | undefined,
  delimiter: string | undefined,
): DecimalChoice {
  if (given) return { kind: 'chosen', decimal: given, source: 'given', reason: 'stated by the user' };
  let comma: NumberCellText | undefined;
  let point: NumberCellText | undefined;
  let ambiguous: NumberCellText | undefined;
  for (const cell of cells) {
    if (!hasSeparator.test(cell.text)) continue;
    const asComma = readsAsNumber(cell.text, 'comma');
    const asPoint = readsAsNumber(cell.text, 'point');
    if (asComma && !asPoint) comma ??= cell;
    else if (asPoint && !asComma) point ??= cell;
    else if (asComma && asPoint) ambiguous ??= cell;
  }
  if (comma && point) {
    return {
      kind: 'mixed',
      comma,
      point,
      message:
        `row ${comma.row} ("${comma.text}") is written with a decimal comma and row ${point.row} ` +
        `("${point.text}") with a decimal point: state the decimal mark (--decimal comma or --decimal point)`,
    };
  }
  const where = (cell: NumberCellText) => `row ${cell.row}, column "${cell.column}": "${cell.text}"`;
  if (comma)
    return {
      kind: 'chosen',
      decimal: 'comma',
      source: 'detected',
      reason: `decimal comma in ${where(comma)}`,
    };
  if (point)
    return {
      kind: 'chosen',
      decimal: 'point',
      source: 'detected',
      reason: `decimal point in ${where(point)}`,
    };
  if (ambiguous) {
    if (delimiter === ';')
      return { kind: 'chosen', decimal: 'comma', source: 'detected', reason: 'semicolon-delimited file' };
    if (delimiter === ',')
      return { kind: 'chosen', decimal: 'point', source: 'detected', reason: 'comma-delimited file' };
    const [whole, fraction] = ambiguousReadings(ambiguous.text);
    return {
      kind: 'ambiguous',
      example: ambiguous,
      message: `could be ${whole} or ${fraction}: state the decimal mark (--decimal comma or --decimal point)`,
    };
  }
  const decimal: DecimalMark = delimiter === ';' ? 'comma' : 'point';
  return { kind: 'chosen', decimal, source: 'default', reason: 'no cell needs a decimal mark' };
}

function ambiguousReadings(text: string): [string, string] {
  const digits = text.replace(/[.,]/g, '');
  const last = Math.max(text.lastIndexOf(','), text.lastIndexOf('.'));
  const fraction = `${text.slice(0, last).replace(/[.,]/g, '')}.${text.slice(last + 1)}`;
  return [digits, fraction];
}
