import { formatNumber } from './number-format.js';

/**
 * Words for what one plotted value counts. A u chart plots nonconformities per inspection unit; a c
 * chart plots the count of one inspection of k units, so its center reads "per inspection of 5
 * panels", never the vaguer "per period" (on a c chart every period inspects the same k).
 */

/** The user's unit without a leading "one", "a" or "an" ("one board" → "board"). */
function bareUnit(unit: string): string {
  const trimmed = unit.trim() || 'inspection unit';
  return trimmed.replace(/^(one|a|an)\s+/i, '') || trimmed;
}

/**
 * k of the unit in words ("5 panels", "1 panel", "2 × 50 m² of cloth"). The last word takes an
 * English plural (boxes, assemblies, panels); a unit that already carries a quantity or an "of"
 * phrase is multiplied instead, since it cannot be pluralised by its last word.
 */
export function unitsInWords(k: number, unit: string, locale?: string): string {
  const bare = bareUnit(unit);
  const amount = formatNumber(k, locale);
  if (k === 1) return `${amount} ${bare}`;
  if (/^\d/.test(bare) || /\sof\s/i.test(bare)) return `${amount} × ${bare}`;
  const plural = bare.replace(/(\S+)$/, (word) => {
    if (/(s|x|z|ch|sh)$/i.test(word)) return `${word}es`;
    if (/[^aeiou]y$/i.test(word)) return `${word.slice(0, -1)}ies`;
    return `${word}s`;
  });
  return `${amount} ${plural}`;
}

/**
 * What the center line and the plotted values are per: "per panel" on a u chart, "per inspection of
 * 5 panels" on a c chart (k from the periods, all equal on a c chart).
 */
export function perWhat(chart: 'u' | 'c', unit: string, k: number, locale?: string): string {
  return chart === 'u' ? `per ${bareUnit(unit)}` : `per inspection of ${unitsInWords(k, unit, locale)}`;
}

/** The chart's y-axis title for the rate or count scale. */
export function scaleTitle(chart: 'u' | 'c', unit: string, k: number, locale?: string): string {
  return `Nonconformities ${perWhat(chart, unit, k, locale)}`;
}
