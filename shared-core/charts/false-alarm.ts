import { poissonCdf, poissonUpperTail } from '../stats/poisson.js';
import { firstHighSignal, lastLowSignal, type CountLimits } from './count-limits.js';

/**
 * Per-point α that gives a Phase I false-alarm probability F over m independent periods.
 *
 *   α = 1 − (1 − F)^(1/m)
 *
 * Source: Chakraborti, Human & Graham (2009), "Phase I statistical process control charts: an
 * overview and some results", Quality Engineering 21(1); the Šidák correction.
 */
export function perPointAlpha(fap: number, m: number): number {
  return -Math.expm1(Math.log1p(-fap) / m);
}

/**
 * The exact probability that a period signals under its own count limits when its count is Poisson
 * with the limits' mean: aᵢ = P(X > UCL) + P(X < LCL).
 */
export function pointFalseAlarm(limits: CountLimits): number {
  const high = poissonUpperTail(firstHighSignal(limits), limits.mean);
  const last = lastLowSignal(limits);
  return high + (last === null ? 0 : poissonCdf(last, limits.mean));
}

/**
 * The Phase I false-alarm probability of a set of limits: the chance that at least one in-control
 * period signals.
 *
 *   FAP = 1 − Π(1 − aᵢ)
 *
 * Source: Chakraborti, Human & Graham (2009), Quality Engineering 21(1).
 */
export function phaseOneFap(pointAlarms: readonly number[]): number {
  let logNoAlarm = 0;
  for (let i = 0; i < pointAlarms.length; i++) logNoAlarm += Math.log1p(-pointAlarms[i]);
  return -Math.expm1(logNoAlarm);
}
