import { describe, expect, it } from 'vitest';
import normalCdf from '@stdlib/stats-base-dists-normal-cdf';
import {
  averageRunLengthOfChain,
  runLengthChain,
  type PointSymbol,
} from '../../shared-core/changes/run-length-chain.js';
import type { RuleId } from '../../shared-core/study/analysis-types.js';

// The normal-theory chart as a per-point model: z ~ N(shift, 1) cut at 0, ±1, ±2, ±3 (the limits).
function normalModel(shift = 0) {
  const cuts = [Number.NEGATIVE_INFINITY, -3, -2, -1, 0, 1, 2, 3, Number.POSITIVE_INFINITY];
  const symbols: PointSymbol[] = [];
  const probabilities: number[] = [];
  for (let i = 0; i < cuts.length - 1; i++) {
    const z = i === 0 ? -4 : i === cuts.length - 2 ? 4 : (cuts[i] + cuts[i + 1]) / 2;
    const sign = z > 0 ? 1 : -1;
    symbols.push({
      beyond: Math.abs(z) > 3,
      zoneA: Math.abs(z) > 2 ? sign : 0,
      zoneB: Math.abs(z) > 1 ? sign : 0,
      side: sign,
      inner: Math.abs(z) < 1,
    });
    probabilities.push(normalCdf(cuts[i + 1], shift, 1) - normalCdf(cuts[i], shift, 1));
  }
  return { symbols, probabilities };
}

function normalArl(rules: RuleId[], shift = 0) {
  const { symbols, probabilities } = normalModel(shift);
  const chain = runLengthChain(rules, symbols, { fullWindows: true });
  if (!chain.ok) throw new Error(chain.findings[0].message);
  return averageRunLengthOfChain(chain.value, probabilities);
}

describe('the run-length chain, run with normal probabilities (special case of the per-point model)', () => {
  it('gives 1/p = 370.4 for the three-sigma one-point rule (common practice)', () => {
    const p = 2 * normalCdf(-3, 0, 1);
    expect(normalArl(['beyond'])).toBeCloseTo(1 / p, 9);
    expect(normalArl(['beyond'])).toBeCloseTo(370.4, 1);
  });

  it('gives the in-control ARL 91.75 of the four Western Electric rules (Champ & Woodall 1987, Technometrics 29(4), table; from memory)', () => {
    expect(normalArl(['beyond', 'zone-a', 'zone-b', 'run:8'])).toBeCloseTo(91.75, 2);
  });

  it('gives 225.44 for the one-point rule with 2 of 3 beyond 2 sigma (Champ & Woodall 1987; from memory)', () => {
    expect(normalArl(['beyond', 'zone-a'])).toBeCloseTo(225.44, 2);
  });

  it('gives 152.73 for the one-point rule with a run of 8 (Champ & Woodall 1987; from memory)', () => {
    expect(normalArl(['beyond', 'run:8'])).toBeCloseTo(152.73, 2);
  });

  it('gives 1/p for a one-point rule at any shift, and a shorter ARL as the shift grows', () => {
    const p = normalCdf(-3, 1, 1) + 1 - normalCdf(3, 1, 1);
    expect(normalArl(['beyond'], 1)).toBeCloseTo(1 / p, 9);
    const shifted = [0, 0.5, 1, 2].map((s) => normalArl(['beyond', 'zone-a', 'zone-b', 'run:8'], s));
    for (let i = 1; i < shifted.length; i++) expect(shifted[i]).toBeLessThan(shifted[i - 1]);
  });
});
