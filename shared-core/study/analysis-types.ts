/**
 * The shapes that flow through a Phase I analysis: what goes in (observations, exclusions, method)
 * and what comes out (one result per period, the center, checks and warnings).
 *
 * Field names follow the `analyze --json` contract of DESIGN.md; more fields may be added, the
 * contract's fields keep their meaning.
 */

/** One period of the history: a count of nonconformities found in `units` inspection units. */
export interface Observation {
  /** The period's label as the user knows it (lot, date, shift); `#ROW` when there is none. */
  label: string;
  /** The spreadsheet row the period came from (the header is row 1). */
  row: number;
  /** For periods aggregated from event lists: the first and last source rows. */
  rows?: [number, number];
  /** Nonconformities counted: a non-negative integer. */
  count: number;
  /** Inspection units examined: positive and finite. */
  units: number;
  /** ISO date (yyyy-mm-dd) or date-time when the period is dated; used for ordering. */
  date?: string;
  /** Per-category counts when the source has categories (they sum to `count`). */
  categories?: Record<string, number>;
}

/** Why a period is left out of the estimate: an assignable cause, recorded. */
export interface AssignableCause {
  category: string;
  description: string;
  /** The corrective-action reference, when there is one. */
  reference?: string;
}

export interface Exclusion {
  /** Index into the observations array. */
  index: number;
  cause: AssignableCause;
}

export type ChartKind = 'c' | 'u';
export type LimitsMethod = 'sigma' | 'probability' | 'laney';

/** The signal rules of DESIGN.md's table, in its order. */
export const ruleIdList = [
  'beyond',
  'zone-a',
  'zone-b',
  'run:8',
  'run:9',
  'trend',
  'alternate',
  'hug',
  'avoid',
] as const;
export type RuleId = (typeof ruleIdList)[number];

export interface AnalysisOptions {
  /** Requested chart; omitted means c when every k is equal, else u. `c` with varying k is an error. */
  chart?: ChartKind;
  limits: LimitsMethod;
  /** The multiplier L of sigma and Laney limits. */
  multiplier: number;
  /** Per-point false-alarm probability of probability limits (two-sided). */
  alpha: number;
  /** Phase I false-alarm probability; when given, per-point α = 1 − (1 − F)^(1/m). */
  fap?: number;
  /** A known (standard) rate per inspection unit instead of the estimate. */
  knownRate?: number;
  rules: RuleId[];
}

export const defaultOptions: AnalysisOptions = {
  limits: 'sigma',
  multiplier: 3,
  alpha: 0.0027,
  rules: ['beyond'],
};

export type PeriodStatus = 'in' | 'signal' | 'excluded';

export interface PeriodResult {
  index: number;
  label: string;
  row: number;
  rows?: [number, number];
  count: number;
  units: number;
  /** count / units. */
  rate: number;
  /** On the plotted scale: rate for a u chart, count for a c chart. */
  center: number;
  lcl: number | null;
  ucl: number;
  /** (uᵢ − ū)/√(ū/kᵢ), divided by σz for Laney limits. */
  z: number;
  status: PeriodStatus;
  /** Ids of the selected rules that fire at this period (empty for excluded periods). */
  rules: readonly string[];
  /** The cause, for excluded periods. */
  cause?: AssignableCause;
}

export interface Warning {
  code: string;
  message: string;
}

export interface Dispersion {
  statistic: number;
  df: number;
  /** P(χ² ≥ D): small means over-dispersed. */
  pOver: number;
  /** P(χ² ≤ D): small means under-dispersed. */
  pUnder: number;
  /** How many included periods have an expected count kᵢū below 5. */
  smallExpected: number;
  advice: string;
}

export interface Interval {
  lower: number;
  upper: number;
}

export interface Iteration {
  /** Labels of the periods excluded in this iteration. */
  excluded: string[];
  center: number;
  /** Limits at k̄ on the plotted scale. */
  lcl: number | null;
  ucl: number;
  /** Labels of the periods that signal. */
  signals: string[];
}

export interface AnalysisResult {
  chart: ChartKind;
  limits: LimitsMethod;
  /** On the plotted scale: ū for a u chart, ū·k for a c chart. */
  center: number;
  /** The rate per inspection unit ū (estimated or known). */
  rate: number;
  rateSource: 'estimated' | 'known';
  /** Exact (Garwood) 95 % interval for the rate, from Σx over Σk of the included periods. */
  rateInterval: Interval;
  /** What the rate's interval means for the UCL: the UCL at k̄ when the rate is at either end. */
  rateEffect: { units: number; uclAtLower: number; uclAtUpper: number };
  sigmaZ: number | null;
  multiplier: number;
  /** Per-point α used by probability limits (null for other methods). */
  alpha: number | null;
  /** Phase I false-alarm probability 1 − Π(1 − aᵢ) of the chosen limits at the rate. */
  fap: number;
  /** Number of included periods. */
  m: number;
  totals: { count: number; units: number };
  periods: PeriodResult[];
  dispersion: Dispersion;
  /** Average-k display limits, only when every k is within ±25 % of k̄. */
  averageK: { units: number; lcl: number | null; ucl: number } | null;
  stable: boolean;
  warnings: Warning[];
}
