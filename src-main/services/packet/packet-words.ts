import type { AnalysisResult } from '../../../shared-core/study/analysis-types.js';

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
