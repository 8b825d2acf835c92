import { averageUnitsForDisplay } from '../charts/average-units.js';
import { signalsHigh, signalsLow, type CountLimits } from '../charts/count-limits.js';
import { perPointAlpha, phaseOneFap, pointFalseAlarm } from '../charts/false-alarm.js';
import { laneySigmaZ } from '../charts/laney-sigma-z.js';
import { probabilityLimits } from '../charts/probability-limits.js';
import { sigmaLimits } from '../charts/sigma-limits.js';
import { standardizedValue } from '../charts/standardized-value.js';
import { findSignals, noRules } from '../rules/find-signals.js';
import { normalQuantile } from '../stats/normal.js';
import { poissonMeanInterval } from '../stats/poisson-mean-interval.js';
import { fail, ok, type Result } from '../result.js';
import type {
  AnalysisOptions,
  AnalysisResult,
  AssignableCause,
  ChartKind,
  Exclusion,
  Observation,
  PeriodResult,
  RuleId,
} from './analysis-types.js';
import { dispersionCheck } from './dispersion-check.js';
import { phaseOneWarnings, uclAt } from './phase-one-warnings.js';

/**
 * One Phase I iteration: the rate over the included periods, each period's limits at its own kᵢ,
 * the signal rules over the included periods in order, the dispersion check and the warnings.
 *
 *   ū = Σxᵢ / Σkᵢ over included periods (not the mean of the uᵢ), or a known rate
 *
 * Excluded periods keep their place on the chart and their limits, but are out of the estimate and
 * get no rules. Conventions: DESIGN.md, "Statistics". Source of the charts: Montgomery,
 * Introduction to Statistical Quality Control, ch. 7; Laney (2002), Quality Engineering 14(4).
 *
 * @param observations periods in period order (date order where dated, else file order)
 * @param exclusions the excluded periods with their assignable causes (index into observations)
 */
export function analyzePhaseOne(
  observations: readonly Observation[],
  exclusions: readonly Exclusion[],
  options: AnalysisOptions,
): Result<AnalysisResult> {
  if (observations.length === 0) return fail({ message: 'there are no periods to analyze' });
  const causes = new Map<number, AssignableCause>();
  for (const exclusion of exclusions) {
    if (!Number.isInteger(exclusion.index) || exclusion.index < 0 || exclusion.index >= observations.length)
      return fail({ message: `exclusion of period ${exclusion.index + 1} names no period of this study` });
    causes.set(exclusion.index, exclusion.cause);
  }
  const n = observations.length;
  // Exclusions name distinct periods (a Map key each), so the rest are the included ones.
  const m = n - causes.size;
  if (m === 0) return fail({ message: 'every period is excluded: at least one must stay in the estimate' });
  // A flag per period, so that each pass asks an array, not the map.
  const excluded = new Uint8Array(n);
  for (const index of causes.keys()) excluded[index] = 1;

  const chart = chooseChart(observations, options.chart);
  if (!chart.ok) return chart;

  // One pass per quantity, in period order, with typed arrays for the per-period numbers: a long
  // history feels every extra pass and every short-lived object. Each pass is a function of its
  // own, so that the engine compiles each hot loop alone.
  const { count: totalCount, units: totalUnits } = includedTotals(observations, excluded);
  const rateKnown = options.knownRate !== undefined;
  const rate = options.knownRate ?? totalCount / totalUnits;
  if (!(rate > 0) || !Number.isFinite(rate))
    return fail({
      message: rateKnown
        ? `the known rate must be a positive number (got ${rate})`
        : 'no nonconformity was counted in the included periods (ū = 0): c and u limits cannot be set',
    });

  const z = standardizedValues(observations, rate);
  let sigmaZ: number | null = null;
  if (options.limits === 'laney') {
    sigmaZ = laneySigmaZ(
      z,
      observations.map((_, i) => excluded[i] === 0),
    );
    if (sigmaZ === null)
      return fail({ message: 'Laney u′ limits need at least two adjacent included periods' });
    if (sigmaZ === 0)
      return fail({ message: 'Laney u′ limits need some variation between adjacent periods (σz = 0)' });
    for (let i = 0; i < n; i++) z[i] /= sigmaZ;
  }

  const alpha = options.fap !== undefined ? perPointAlpha(options.fap, m) : options.alpha;
  // For sigma and Laney limits a Phase I false-alarm target sets the multiplier: L = z(1 − α/2).
  const multiplier =
    options.fap !== undefined && options.limits !== 'probability'
      ? normalQuantile(1 - alpha / 2)
      : options.multiplier;
  const limitsAt = (units: number): CountLimits =>
    options.limits === 'probability'
      ? probabilityLimits(rate, units, alpha)
      : sigmaLimits(rate, units, multiplier, sigmaZ ?? 1);
  // c chart: plotted on the count scale; u chart: on the rate scale (count limits ÷ kᵢ).
  const scale = (units: number) => (chart.value === 'c' ? 1 : 1 / units);
  // Periods with the same k share their limits, as counts and as plotted, and their false-alarm
  // probability: each k is worked out once.
  const byUnits = new Map<number, UnitsLimits>();
  const atUnits = (units: number): UnitsLimits => {
    let entry = byUnits.get(units);
    if (entry === undefined) {
      const limits = limitsAt(units);
      const s = scale(units);
      entry = {
        limits,
        alarm: pointFalseAlarm(limits),
        center: limits.mean * s,
        lcl: limits.lower === null ? null : limits.lower * s,
        ucl: limits.upper * s,
      };
      byUnits.set(units, entry);
    }
    return entry;
  };

  const plottedAt = unitsLimitsOf(observations, atUnits);
  const included = includedSeries(observations, excluded, m, z, plottedAt);
  const { includedCounts, includedUnits, alarms } = included;
  const fired = findSignals(included, options.rules);

  const { periods, signalling } = periodResults(observations, causes, excluded, plottedAt, z, fired);

  const dispersion = dispersionCheck(includedCounts, includedUnits, rate, rateKnown);
  const fap = phaseOneFap(alarms);
  const garwood = poissonMeanInterval(totalCount, 0.95);
  const rateInterval = { lower: garwood.lower / totalUnits, upper: garwood.upper / totalUnits };

  const displayUnits = averageUnitsForDisplay(includedUnits);
  const averageK =
    displayUnits === null
      ? null
      : (() => {
          const limits = limitsAt(displayUnits);
          const s = scale(displayUnits);
          return {
            units: displayUnits,
            lcl: limits.lower === null ? null : limits.lower * s,
            ucl: limits.upper * s,
          };
        })();

  const meanUnits = totalUnits / m;
  const centerUnits = chart.value === 'c' ? observations[0].units : 1;
  const result: AnalysisResult = {
    chart: chart.value,
    limits: options.limits,
    center: rate * centerUnits,
    rate,
    rateSource: rateKnown ? 'known' : 'estimated',
    rateInterval,
    rateEffect: {
      units: meanUnits,
      uclAtLower: uclAt(
        rateInterval.lower,
        meanUnits,
        { ...options, alpha, multiplier },
        sigmaZ,
        chart.value,
      ),
      uclAtUpper: uclAt(
        rateInterval.upper,
        meanUnits,
        { ...options, alpha, multiplier },
        sigmaZ,
        chart.value,
      ),
    },
    sigmaZ,
    multiplier,
    alpha: options.limits === 'probability' ? alpha : null,
    fap,
    m,
    totals: { count: totalCount, units: totalUnits },
    periods,
    dispersion,
    averageK,
    stable: signalling === 0,
    warnings: [],
  };
  result.warnings = phaseOneWarnings(result, { ...options, alpha, multiplier });
  return ok(result);
}

/** Σx and Σk of the included periods, in period order. */
function includedTotals(observations: readonly Observation[], excluded: Uint8Array) {
  let count = 0;
  let units = 0;
  for (let i = 0; i < observations.length; i++) {
    if (excluded[i] === 0) {
      count += observations[i].count;
      units += observations[i].units;
    }
  }
  return { count, units };
}

/** Each period's z = (uᵢ − ū)/√(ū/kᵢ) (before Laney's σz). */
function standardizedValues(observations: readonly Observation[], rate: number): Float64Array {
  const z = new Float64Array(observations.length);
  for (let i = 0; i < observations.length; i++) {
    const o = observations[i];
    z[i] = standardizedValue(o.count / o.units, rate, o.units);
  }
  return z;
}

/** Each period's limits at its own k. */
function unitsLimitsOf(
  observations: readonly Observation[],
  atUnits: (units: number) => UnitsLimits,
): UnitsLimits[] {
  const plottedAt = new Array<UnitsLimits>(observations.length);
  for (let i = 0; i < observations.length; i++) plottedAt[i] = atUnits(observations[i].units);
  return plottedAt;
}

/**
 * The included periods in order, as the rules see them (z, beyond a limit) and as the dispersion
 * check, the FAP and k̄ take them (counts, units, point false-alarm probabilities).
 */
function includedSeries(
  observations: readonly Observation[],
  excluded: Uint8Array,
  m: number,
  z: Float64Array,
  plottedAt: readonly UnitsLimits[],
) {
  const includedZ = new Float64Array(m);
  const beyond: boolean[] = new Array<boolean>(m);
  const includedCounts: number[] = new Array<number>(m);
  const includedUnits: number[] = new Array<number>(m);
  const alarms: number[] = new Array<number>(m);
  for (let i = 0, t = 0; i < observations.length; i++) {
    if (excluded[i] !== 0) continue;
    const { count, units } = observations[i];
    const { limits, alarm } = plottedAt[i];
    includedZ[t] = z[i];
    beyond[t] = signalsHigh(count, limits) || signalsLow(count, limits);
    includedCounts[t] = count;
    includedUnits[t] = units;
    alarms[t++] = alarm;
  }
  return { z: includedZ, beyond, includedCounts, includedUnits, alarms };
}

/** Every period's result: its limits at its k, its z, its status and the rules that fired there. */
function periodResults(
  observations: readonly Observation[],
  causes: ReadonlyMap<number, AssignableCause>,
  excluded: Uint8Array,
  plottedAt: readonly UnitsLimits[],
  z: Float64Array,
  fired: readonly (readonly RuleId[])[],
) {
  const n = observations.length;
  const periods: PeriodResult[] = new Array<PeriodResult>(n);
  let signalling = 0;
  for (let i = 0, t = 0; i < n; i++) {
    const o = observations[i];
    const plotted = plottedAt[i];
    const cause = excluded[i] === 0 ? undefined : causes.get(i);
    const rules = cause ? noRules : fired[t++];
    const period: PeriodResult = {
      index: i,
      label: o.label,
      row: o.row,
      count: o.count,
      units: o.units,
      rate: o.count / o.units,
      center: plotted.center,
      lcl: plotted.lcl,
      ucl: plotted.ucl,
      z: z[i],
      status: cause ? 'excluded' : rules.length > 0 ? 'signal' : 'in',
      rules,
    };
    if (o.rows) period.rows = o.rows;
    if (cause) period.cause = cause;
    else if (rules.length > 0) signalling++;
    periods[i] = period;
  }
  return { periods, signalling };
}

/** The limits at one k: as counts, their false-alarm probability, and as plotted. */
interface UnitsLimits {
  limits: CountLimits;
  alarm: number;
  center: number;
  lcl: number | null;
  ucl: number;
}

/** A c chart when every period has the same k, else a u chart; `c` with varying k is an error. */
function chooseChart(observations: readonly Observation[], requested?: ChartKind): Result<ChartKind> {
  const first = observations[0].units;
  let equal = true;
  for (let i = 1; i < observations.length && equal; i++) equal = observations[i].units === first;
  if (requested === 'c' && !equal)
    return fail({
      message:
        'a c chart needs the same number of inspection units in every period; these periods differ, so use a u chart',
    });
  return ok(requested ?? (equal ? 'c' : 'u'));
}
