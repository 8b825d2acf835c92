import type { RateRatioTest } from '../changes/rate-ratio-test.js';
import type { ChangePoint } from '../changes/change-point.js';

/**
 * The evidence for a limit change in the words a manager reads. Ratios keep two decimals (enough to
 * tell 0.62 from 0.65, not so many that they suggest false precision); a p-value keeps two
 * significant digits and is floored at 0.0001, below which the digits say nothing useful.
 */

function fixed(value: number, locale?: string, digits = 2): string {
  return new Intl.NumberFormat(locale, {
    minimumFractionDigits: digits,
    maximumFractionDigits: digits,
  }).format(value);
}

/** A rate ratio: two decimals below 100, whole numbers above; "not finite" for null. */
export function ratioText(ratio: number | null, locale?: string): string {
  if (ratio === null || !Number.isFinite(ratio)) return 'not finite';
  return ratio >= 100
    ? new Intl.NumberFormat(locale, { maximumFractionDigits: 0 }).format(ratio)
    : fixed(ratio, locale);
}

/** "p = 0.0003", "p = 0.042", "p < 0.0001". */
export function pValueText(p: number, locale?: string): string {
  if (p < 0.0001) return `p < ${fixed(0.0001, locale, 4)}`;
  return `p = ${new Intl.NumberFormat(locale, { maximumSignificantDigits: 2 }).format(p)}`;
}

/** The interval of the ratio: "0.48 to 0.80", or "0.48 upward" when it has no upper bound. */
export function intervalText(test: Pick<RateRatioTest, 'ciLow' | 'ciHigh'>, locale?: string): string {
  return test.ciHigh === null
    ? `${ratioText(test.ciLow, locale)} upward, no upper bound`
    : `${ratioText(test.ciLow, locale)} to ${ratioText(test.ciHigh, locale)}`;
}

/**
 * One sentence: "the new rate is 0.62 times the approved one (95 % interval 0.48 to 0.80;
 * p = 0.0003)".
 */
export function ratioInWords(test: RateRatioTest, locale?: string): string {
  const level = `${Math.round(test.confidence * 100)} %`;
  if (test.ratio === null)
    return `the approved periods counted no nonconformity, so the ratio of the new rate to the approved one is not finite (${level} interval ${intervalText(test, locale)}; ${pValueText(test.pValue, locale)})`;
  return `the new rate is ${ratioText(test.ratio, locale)} times the approved one (${level} interval ${intervalText(test, locale)}; ${pValueText(test.pValue, locale)})`;
}

/** What the test says, plainly, at the 5 % level (common practice). */
export function ratioVerdict(test: RateRatioTest): string {
  if (test.conditional.total === 0)
    return 'No nonconformity was counted in either study: no comparison is possible.';
  const direction = test.ratio === null || test.ratio > 1 ? 'higher' : 'lower';
  if (test.pValue < 0.05)
    return `The new rate is ${direction} than the approved one by more than chance would usually give (p below 0.05).`;
  return 'The difference between the rates is within what chance alone would often give (p of 0.05 or more): the data do not show that the rate changed.';
}

/** The change-point result as a proposal: where the history most likely splits, and how sure. */
export function changePointInWords(
  point: Pick<ChangePoint, 'pValue' | 'ratio' | 'replications' | 'seed' | 'generator'> & {
    exceedances?: number;
    lastBefore: string;
    firstAfter: string;
  },
  locale?: string,
): { proposal: string; reproduce: string } {
  const step =
    point.ratio === null
      ? 'from no nonconformities to some'
      : `the rate ${point.ratio < 1 ? 'falling' : 'rising'} to ${ratioText(point.ratio, locale)} times its earlier level`;
  return {
    proposal: `The history most likely splits between ${point.lastBefore} and ${point.firstAfter}, ${step} (${pValueText(point.pValue, locale)} for a step anywhere${
      point.exceedances === 0 ? ', the smallest these replications can show' : ''
    }).`,
    reproduce: `Monte Carlo p-value conditional on the total count: ${new Intl.NumberFormat(locale).format(point.replications)} replications, generator ${point.generator}, seed ${point.seed}.`,
  };
}
