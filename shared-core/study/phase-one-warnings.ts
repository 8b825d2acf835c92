import { kthSmallest } from '../stats/order-statistic.js';
import { sigmaLimits } from '../charts/sigma-limits.js';
import { probabilityLimits } from '../charts/probability-limits.js';
import { unitsForLowerLimit } from '../charts/units-for-lower-limit.js';
import type { AnalysisOptions, AnalysisResult, Warning } from './analysis-types.js';

/** Fewer included periods than this make a weak baseline (common practice: 20 to 25). */
export const MIN_PERIODS = 20;
/** More than this share of periods excluded deserves a second look (common practice). */
export const MAX_EXCLUDED_SHARE = 0.1;
/** A Phase I false-alarm probability above this is worth controlling with `--fap` (common practice). */
export const MAX_FAP = 0.1;

const format = (x: number, digits = 3) => Number(x.toPrecision(digits)).toString();

/**
 * The warnings of one Phase I iteration, each with a stable code and a message that says what to do.
 * The thresholds are common practice; their sources are named in DESIGN.md.
 */
export function phaseOneWarnings(result: AnalysisResult, options: AnalysisOptions): Warning[] {
  const warnings: Warning[] = [];
  // One pass over the periods for the counts and the expected counts: long histories feel each pass.
  const expected = new Float64Array(result.periods.length);
  let included = 0;
  let withoutLower = 0;
  const periods = result.periods;
  for (let i = 0; i < periods.length; i++) {
    const p = periods[i];
    if (p.status === 'excluded') continue;
    if (p.lcl === null) withoutLower++;
    expected[included++] = p.units * result.rate;
  }
  const excluded = result.periods.length - included;

  if (result.m < MIN_PERIODS)
    warnings.push({
      code: 'few-periods',
      message: `only ${result.m} periods are included; a Phase I baseline usually needs 20 to 25 periods before its limits are trusted`,
    });
  if (excluded > MAX_EXCLUDED_SHARE * result.periods.length)
    warnings.push({
      code: 'many-excluded',
      message: `${excluded} of ${result.periods.length} periods (${format((100 * excluded) / result.periods.length, 2)} %) are excluded; when more than 10 % need excluding, the process may not have been stable enough for a baseline`,
    });

  if (withoutLower > 0) {
    const need = unitsForLowerLimit(
      options.limits,
      result.rate,
      options.multiplier,
      options.alpha,
      result.sigmaZ,
    );
    const bound = `${need.strict ? 'more than' : 'at least'} ${format(need.units)} inspection units per period`;
    warnings.push({
      code: 'no-lower-limit',
      message: `${withoutLower === included ? 'no period has' : `${withoutLower} of ${included} periods have`} a lower control limit, so a drop in the rate cannot signal; a lower limit needs ${bound} at this rate`,
    });
  }

  const median = kthSmallest(expected.subarray(0, included), Math.floor(included / 2));
  if (median < 1)
    warnings.push({
      code: 'rare-events',
      message: `most periods expect fewer than one nonconformity (median ${format(median)}); combine periods into coarser ones, or chart the time between events instead`,
    });

  const d = result.dispersion;
  if (d.pOver < 0.01)
    warnings.push({
      code: 'over-dispersion',
      message: `the dispersion check finds more variation than Poisson (p = ${format(d.pOver, 2)}): ${d.advice}`,
    });
  if (d.pUnder < 0.01)
    warnings.push({
      code: 'under-dispersion',
      message: `the dispersion check finds less variation than Poisson (p = ${format(d.pUnder, 2)}): ${d.advice}`,
    });
  if (d.smallExpected > 0.2 * result.m)
    warnings.push({
      code: 'chi-square-approximation',
      message: `${d.smallExpected} of ${result.m} periods expect fewer than 5 nonconformities, so the χ² approximation of the dispersion check is poor; read its p-values as rough`,
    });

  if (result.sigmaZ !== null && result.sigmaZ < 1)
    warnings.push({
      code: 'laney-narrower',
      message: `σz = ${format(result.sigmaZ)} is below 1, so the Laney u′ limits are narrower than Poisson limits; they are kept as computed`,
    });
  if (result.fap > MAX_FAP)
    warnings.push({
      code: 'phase-one-fap',
      message: `the chance that at least one in-control period signals is ${format(100 * result.fap, 2)} % over these ${result.m} periods; probability limits with --fap 0.05 hold it to 5 %`,
    });
  if (result.rateInterval.upper > 1.5 * result.rateInterval.lower)
    warnings.push({
      code: 'imprecise-rate',
      message: `the baseline pins the rate only loosely (95 % interval ${format(result.rateInterval.lower)} to ${format(result.rateInterval.upper)} per unit): the UCL at ${format(result.rateEffect.units)} units could be anywhere from ${format(result.rateEffect.uclAtLower)} to ${format(result.rateEffect.uclAtUpper)}`,
    });
  if (result.rateSource === 'known')
    warnings.push({
      code: 'known-rate',
      message: `the limits use the known rate ${format(result.rate, 4)} per unit, not the estimate from these periods`,
    });
  return warnings;
}

/** The UCL at k units (on the plotted scale of the chart) when the rate is `rate`. */
export function uclAt(
  rate: number,
  units: number,
  options: AnalysisOptions,
  sigmaZ: number | null,
  chart: 'c' | 'u',
): number {
  const limits =
    options.limits === 'probability'
      ? probabilityLimits(rate, units, options.alpha)
      : sigmaLimits(rate, units, options.multiplier, sigmaZ ?? 1);
  return chart === 'c' ? limits.upper : limits.upper / units;
}
