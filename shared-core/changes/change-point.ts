import { fail, ok, type Result } from '../result.js';
import { binomialPmf } from '../stats/binomial.js';
import { generatorName, seededRandom, type Random } from '../stats/random.js';

/** One included period, in period order. */
export interface CountPeriod {
  count: number;
  units: number;
}

export interface ChangePointOptions {
  /** Monte Carlo replications (default 9999). */
  replications?: number;
  /** Seed of the generator (default 20240601), stored with the result so that it reproduces. */
  seed?: number;
}

export interface Segment {
  /** Index of the first and last period of the segment (into the periods given). */
  first: number;
  last: number;
  count: number;
  units: number;
  rate: number;
}

export interface ChangePoint {
  /** The largest likelihood-ratio statistic over every split. */
  statistic: number;
  /** Index of the last period before the proposed step. */
  splitAfter: number;
  before: Segment;
  after: Segment;
  /** Rate after the split over the rate before it; null when nothing was counted before. */
  ratio: number | null;
  /** Monte Carlo p-value (1 + b)/(1 + R), conditional on the total count. */
  pValue: number;
  /** b: replications whose largest statistic reached the observed one. */
  exceedances: number;
  replications: number;
  seed: number;
  generator: string;
  /** The statistic at each split: G[τ] splits after period τ (τ = 0 … m − 2). */
  profile: number[];
}

export const defaultChangePointSeed = 20240601;
export const defaultReplications = 9999;

/**
 * The likelihood-ratio statistic for one step in a Poisson rate after period τ:
 *
 *   G(τ) = 2·[X₁·ln(X₁/K₁) + X₂·ln(X₂/K₂) − X·ln(X/K)]   (0·ln 0 = 0)
 *
 * with X₁, K₁ the counts and units of periods 1…τ + 1 and X₂, K₂ of the rest.
 * Source: the generalized likelihood ratio for a single change in a Poisson rate, e.g.
 * K. J. Worsley, "Confidence regions and tests for a change-point in a sequence of exponential family
 * random variables", Biometrika 73 (1986).
 */
export function changeProfile(counts: ArrayLike<number>, units: ArrayLike<number>): number[] {
  const m = counts.length;
  let totalCount = 0;
  let totalUnits = 0;
  for (let i = 0; i < m; i++) {
    totalCount += counts[i];
    totalUnits += units[i];
  }
  const whole = xLogRate(totalCount, totalUnits);
  const profile: number[] = [];
  let x = 0;
  let k = 0;
  for (let t = 0; t < m - 1; t++) {
    x += counts[t];
    k += units[t];
    profile.push(Math.max(0, 2 * (xLogRate(x, k) + xLogRate(totalCount - x, totalUnits - k) - whole)));
  }
  return profile;
}

function xLogRate(count: number, units: number): number {
  return count === 0 ? 0 : count * Math.log(count / units);
}

/**
 * A check for one step in the rate over the included periods: the split with the largest
 * likelihood-ratio statistic, and how often a history with no step would give one as large.
 *
 * The p-value is by Monte Carlo conditional on the total: under a constant rate, the total X is
 * spread over the periods as Multinomial(X; kᵢ/K), whatever the rate. Each replication draws that
 * allocation (see `allocation`) and takes its largest G; the
 * p-value is (1 + b)/(1 + R), b the replications at least as large (within 1e-9, so ties of
 * discrete data count). The generator, seed and R are returned so that the result reproduces.
 * Sources: Worsley (1986) for G; A. C. A. Hope, "A simplified Monte Carlo significance test
 * procedure", JRSS B 30 (1968), and Davison & Hinkley, Bootstrap Methods (1997), §4.2, for
 * (1 + b)/(1 + R); A. J. Walker (1977), ACM TOMS 3(3), for the alias method.
 */
export function changePoint(
  periods: readonly CountPeriod[],
  options: ChangePointOptions = {},
): Result<ChangePoint> {
  const replications = options.replications ?? defaultReplications;
  const seed = options.seed ?? defaultChangePointSeed;
  if (periods.length < 3)
    return fail({ message: 'a check for a step in the rate needs at least three included periods' });
  if (!Number.isInteger(replications) || replications < 1)
    return fail({
      value: String(replications),
      message: 'the replications must be a whole number, 1 or more',
    });
  if (!Number.isSafeInteger(seed) || seed < 0)
    return fail({ value: String(seed), message: 'the seed must be a non-negative whole number' });
  const bad = periods.findIndex(
    (p) => !Number.isInteger(p.count) || p.count < 0 || !(p.units > 0) || !Number.isFinite(p.units),
  );
  if (bad >= 0)
    return fail({
      message: `period ${bad + 1} needs a whole count of 0 or more and positive inspection units`,
    });

  const counts = periods.map((p) => p.count);
  const units = periods.map((p) => p.units);
  const profile = changeProfile(counts, units);
  let splitAfter = 0;
  for (let t = 1; t < profile.length; t++) if (profile[t] > profile[splitAfter]) splitAfter = t;
  const statistic = profile[splitAfter];
  const total = counts.reduce((a, b) => a + b, 0);

  let exceedances = 0;
  if (total === 0) exceedances = replications;
  else {
    const random = seededRandom(seed);
    const allocate = allocation(units, total);
    const simulated = new Float64Array(periods.length);
    const threshold = statistic - 1e-9 * Math.max(1, statistic);
    for (let r = 0; r < replications; r++) {
      allocate(random, simulated);
      if (largest(changeProfile(simulated, units)) >= threshold) exceedances++;
    }
  }

  const segment = (first: number, last: number): Segment => {
    let count = 0;
    let k = 0;
    for (let i = first; i <= last; i++) {
      count += counts[i];
      k += units[i];
    }
    return { first, last, count, units: k, rate: count / k };
  };
  const before = segment(0, splitAfter);
  const after = segment(splitAfter + 1, periods.length - 1);
  return ok({
    statistic,
    splitAfter,
    before,
    after,
    ratio: before.count === 0 ? null : after.rate / before.rate,
    pValue: (1 + exceedances) / (1 + replications),
    exceedances,
    replications,
    seed,
    generator: generatorName,
    profile,
  });
}

function largest(values: readonly number[]): number {
  let best = 0;
  for (const v of values) if (v > best) best = v;
  return best;
}

/** Above this many nonconformities per period, conditional binomials are cheaper than one draw each. */
const BINOMIAL_ALLOCATION_ABOVE = 20;

/**
 * One draw of Multinomial(total; kᵢ/K) into `cells`: one alias draw per nonconformity for small
 * totals, else conditional binomials xᵢ ~ Binomial(n − x₁ − … − xᵢ₋₁, kᵢ/(kᵢ + … + k_m)), whose
 * cost grows with √total rather than total. Both are exact; the choice depends only on the data,
 * so a seed reproduces the same draws.
 */
export function allocation(
  units: readonly number[],
  total: number,
): (random: Random, cells: Float64Array) => void {
  if (total <= BINOMIAL_ALLOCATION_ABOVE * units.length) {
    const draw = aliasTable(units);
    return (random, cells) => {
      cells.fill(0);
      for (let n = 0; n < total; n++) cells[draw(random)]++;
    };
  }
  const remainingUnits = new Float64Array(units.length);
  for (let i = units.length - 1, sum = 0; i >= 0; i--) remainingUnits[i] = sum += units[i];
  return (random, cells) => {
    let left = total;
    for (let i = 0; i < units.length - 1; i++) {
      const x = left === 0 ? 0 : binomialDraw(random, left, Math.min(1, units[i] / remainingUnits[i]));
      cells[i] = x;
      left -= x;
    }
    cells[units.length - 1] = left;
  };
}

/**
 * A Binomial(n, p) draw by inversion, searching outward from the mode (down, up, down, …) with
 * the probability ratios P(k − 1)/P(k) = k·q/((n − k + 1)·p) and P(k + 1)/P(k) = (n − k)·p/((k + 1)·q):
 * about 1.6 standard deviations of steps, exact up to rounding.
 * Source: L. Devroye, Non-Uniform Random Variate Generation (1986), ch. X (inversion by
 * sequential search from the mode).
 */
export function binomialDraw(random: Random, n: number, p: number): number {
  if (n === 0 || p <= 0) return 0;
  if (p >= 1) return n;
  const mode = Math.min(n, Math.floor((n + 1) * p));
  const odds = p / (1 - p);
  let u = random.nextUniform();
  let low = mode;
  let high = mode;
  let lowMass = binomialPmf(mode, n, p);
  let highMass = lowMass;
  u -= lowMass;
  if (u < 0) return mode;
  for (;;) {
    if (low > 0) {
      lowMass *= low / ((n - low + 1) * odds);
      low--;
      u -= lowMass;
      if (u < 0) return low;
    }
    if (high < n) {
      highMass *= ((n - high) / (high + 1)) * odds;
      high++;
      u -= highMass;
      if (u < 0) return high;
    }
    // What is left is rounding (about 1e-15): no count carries it.
    if ((low === 0 || lowMass === 0) && (high === n || highMass === 0)) return mode;
  }
}

/**
 * Walker's alias method for drawing index i with probability wᵢ/Σw (Vose's construction): one
 * uniform picks a column and, from its fraction, the column or its alias.
 */
export function aliasTable(weights: readonly number[]): (random: Random) => number {
  const n = weights.length;
  const sum = weights.reduce((a, b) => a + b, 0);
  const probability = new Float64Array(n);
  const alias = new Int32Array(n);
  const scaled = weights.map((w) => (w * n) / sum);
  const small: number[] = [];
  const large: number[] = [];
  scaled.forEach((p, i) => (p < 1 ? small : large).push(i));
  while (small.length > 0 && large.length > 0) {
    const s = small.pop() as number;
    const l = large.pop() as number;
    probability[s] = scaled[s];
    alias[s] = l;
    scaled[l] = scaled[l] + scaled[s] - 1;
    (scaled[l] < 1 ? small : large).push(l);
  }
  for (const i of [...small, ...large]) {
    probability[i] = 1;
    alias[i] = i;
  }
  return (random) => {
    const u = random.nextUniform() * n;
    const column = Math.floor(u);
    return u - column < probability[column] ? column : alias[column];
  };
}
