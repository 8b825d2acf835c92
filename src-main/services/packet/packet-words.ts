import type { AnalysisResult } from '../../../shared-core/study/analysis-types.js';
import type { AverageRunLength } from '../../../shared-core/changes/average-run-length.js';
import type { RateRatioTest } from '../../../shared-core/changes/rate-ratio-test.js';
import type { SignOffLine } from './packet-content.js';

/** Numbers in the packet: limits to 5 significant digits, whole counts as they are. */
export function shown(value: number | null, significant = 5): string {
  if (value === null) return 'none';
  if (!Number.isFinite(value)) return String(value);
  if (Number.isInteger(value)) return String(value);
  return String(Number(value.toPrecision(significant)));
}

export function shownProbability(value: number): string {
  if (value === 0) return '0';
  return value < 1e-4 ? value.toExponential(2) : String(Number(value.toPrecision(3)));
}

/** The usual cautions; they go on the last page and, briefly, on the cover. */
export const cautions = [
  'Control limits describe how the process behaved during the baseline periods shown here. They are not specification limits and say nothing about whether the product meets its requirements.',
  'They do not replace specifications, inspection or tests, and do not release product on their own.',
  'The customer’s procedures and the site’s procedures govern the use of these limits, their review and any reaction to a signal.',
  'A change in the process, the material, the inspection method or the definition of the inspection unit calls for a new study before these limits are relied on.',
];

/** The method in words and why it was chosen. */
export function methodWords(result: AnalysisResult): string {
  const chart =
    result.chart === 'c'
      ? 'c chart (limits on the count, every period inspects the same number of units)'
      : 'u chart (limits on the rate per inspection unit, since the number of units varies or a rate chart was asked for)';
  const limits =
    result.limits === 'sigma'
      ? `${shown(result.multiplier)}-sigma Shewhart limits`
      : result.limits === 'probability'
        ? `exact Poisson probability limits at α = ${shownProbability(result.alpha ?? 0)} per point`
        : `Laney u′ limits (${shown(result.multiplier)}·σz with σz = ${shown(result.sigmaZ)}), which widen or narrow the Poisson spread by the observed period-to-period variation`;
  const rate =
    result.rateSource === 'known'
      ? `the known (standard) rate ${shown(result.rate)} per unit`
      : `the rate estimated from the included periods, ū = Σx/Σk = ${result.totals.count}/${shown(result.totals.units)} = ${shown(result.rate)} per unit`;
  return `A ${chart}, with ${limits}, centered on ${rate}.`;
}

/** The limits formula with its numbers filled in. */
export function formulaWords(result: AnalysisResult): string[] {
  const u = shown(result.rate, 6);
  const L = shown(result.multiplier);
  if (result.limits === 'probability') {
    const halfAlpha = shownProbability((result.alpha ?? 0) / 2);
    return [
      `μ = ū·k = ${u}·k expected nonconformities in a period of k units.`,
      `UCL (count) = the largest count x with P(X ≥ x) > α/2 = ${halfAlpha}, for X ~ Poisson(μ).`,
      `LCL (count) = the smallest count x with P(X ≤ x) > α/2; an LCL of 0 means there is no lower limit.`,
      result.chart === 'u' ? 'Rate limits are the count limits divided by k.' : 'Limits are on the count.',
    ];
  }
  const spread = result.limits === 'laney' ? `${L}·${shown(result.sigmaZ, 6)}` : L;
  if (result.chart === 'c') {
    const k = result.periods[0]?.units ?? 1;
    const c = shown(result.rate * k, 6);
    return [
      `c̄ = ū·k = ${u}·${shown(k)} = ${c}`,
      `UCL = c̄ + ${spread}·√c̄ = ${c} + ${spread}·√${c} = ${shown(result.periods[0]?.ucl ?? 0, 6)}`,
      `LCL = c̄ − ${spread}·√c̄ = ${shown(result.periods[0]?.lcl ?? null, 6)} (a negative value means there is no lower limit)`,
    ];
  }
  return [
    `ū = ${u}`,
    `UCL = ū + ${spread}·√(ū/k) = ${u} + ${spread}·√(${u}/k)`,
    `LCL = ū − ${spread}·√(ū/k) = ${u} − ${spread}·√(${u}/k), none where this is not above 0`,
  ];
}

/** A rate ratio or its bound to 4 significant digits; "not finite" where the core reports null. */
export function ratioShown(value: number | null): string {
  return value === null ? 'not finite' : shown(value, 4);
}

/** The rate test, its interval and what it says, in words with its numbers. */
export function comparisonWords(test: RateRatioTest): { test: string; interval: string; reading: string } {
  const { total, nullProportion } = test.conditional;
  const level = `${Math.round(test.confidence * 100)} %`;
  return {
    test: `Przyborowski & Wilenski (1940) exact conditional test: given N = x_approved + x_new = ${test.base.count} + ${test.new.count} = ${total}, x_new is Binomial(N, p₀) with p₀ = t_new/(t_approved + t_new) = ${shown(test.new.units, 10)}/(${shown(test.base.units, 10)} + ${shown(test.new.units, 10)}) = ${shown(nullProportion, 6)} when the rate is unchanged; two-sided p sums the outcomes no more probable than the observed one.`,
    interval: `Clopper–Pearson (1934) ${level} interval for the binomial proportion, mapped to the ratio by R = p·t_approved/((1 − p)·t_new).`,
    reading:
      total === 0
        ? 'No nonconformity was counted in either study: no comparison is possible.'
        : test.pValue < 0.05
          ? `The new rate (${shown(test.new.rate, 5)} per unit) differs from the approved one (${shown(test.base.rate, 5)}) by more than chance would usually give (p below 0.05, common practice).`
          : `The new rate (${shown(test.new.rate, 5)} per unit) and the approved one (${shown(test.base.rate, 5)}) differ by no more than chance would often give (p of 0.05 or more): the data do not show that the rate changed.`,
  };
}

/** How the run lengths were computed. */
export function arlWords(arl: {
  approved: AverageRunLength;
  proposed: AverageRunLength;
  units: number;
}): string {
  const rules = (a: AverageRunLength) => a.rules.join(', ') || 'none';
  return `Exact Poisson run lengths at k = ${shown(arl.units, 6)} (the proposed study’s mean), each set at its own center: approved limits with rules ${rules(arl.approved)} (${arl.approved.method}), proposed limits with rules ${rules(arl.proposed)} (${arl.proposed.method}${arl.proposed.method === 'Markov chain' ? ', Champ & Woodall 1987' : ''}). A rise is over each set’s own center line.`;
}

/** One sign-off on one line: name, role, meaning, time and whether it still holds. */
export function signOffWords(s: SignOffLine): string {
  return `${s.meaning} by ${s.printedName} (${s.role}), ${s.time}: ${s.state === 'valid' ? 'valid' : `${s.state.toUpperCase()}${s.note ? ` (${s.note})` : ''}`}`;
}
