import binomialPmf from '@stdlib/stats-base-dists-binomial-pmf';
import { describe, expect, it } from 'vitest';
import { rateRatioTest } from '../../shared-core/changes/rate-ratio-test.js';
import {
  changePointInWords,
  intervalText,
  pValueText,
  ratioInWords,
  ratioText,
  ratioVerdict,
} from '../../shared-core/view/change-words.js';

/** The two-sided exact conditional p-value summed term by term with @stdlib's binomial pmf. */
function referenceP(xNew: number, total: number, p0: number): number {
  const observed = binomialPmf(xNew, total, p0);
  let sum = 0;
  for (let i = 0; i <= total; i++) {
    const term = binomialPmf(i, total, p0);
    if (term <= observed * (1 + 1e-7)) sum += term;
  }
  return Math.min(1, sum);
}

describe('the evidence in words', () => {
  // Invented totals (not a published example): 60 in 400 units approved, 25 in 300 units new.
  const base = { count: 60, units: 400 };
  const changed = { count: 25, units: 300 };
  const test = rateRatioTest(base, changed);
  if (!test.ok) throw new Error('the test refused valid totals');

  it('states the ratio, its interval and the p-value at the precision it shows', () => {
    const words = ratioInWords(test.value, 'en-US');
    const ratio = 25 / 300 / (60 / 400);
    const p = referenceP(25, 85, 300 / 700);
    const match =
      /the new rate is ([\d.]+) times the approved one \(95 % interval ([\d.]+) to ([\d.]+); p = ([\d.]+)\)/.exec(
        words,
      );
    expect(match, words).not.toBeNull();
    expect(Number(match![1])).toBeCloseTo(ratio, 2);
    expect(Number(match![4])).toBeCloseTo(p, Math.max(2, -Math.floor(Math.log10(p)) + 1));
    expect(Number(match![2])).toBeLessThan(ratio);
    expect(Number(match![3])).toBeGreaterThan(ratio);
  });

  it('says lower and significant when p is below 0.05', () => {
    expect(test.value.pValue).toBeLessThan(0.05);
    expect(ratioVerdict(test.value)).toContain('lower');
  });

  it('floors tiny p-values and keeps two significant digits otherwise', () => {
    expect(pValueText(3.2e-9, 'en-US')).toBe('p < 0.0001');
    expect(pValueText(0.000312, 'en-US')).toBe('p = 0.00031');
    expect(pValueText(0.0421, 'en-US')).toBe('p = 0.042');
    expect(pValueText(1, 'en-US')).toBe('p = 1');
  });

  it('names an infinite ratio and an open interval instead of printing Infinity', () => {
    const none = rateRatioTest({ count: 0, units: 100 }, { count: 7, units: 100 });
    if (!none.ok) throw new Error('refused');
    expect(none.value.ratio).toBeNull();
    expect(none.value.ciHigh).toBeNull();
    expect(ratioText(null)).toBe('not finite');
    expect(intervalText(none.value, 'en-US')).toMatch(/upward, no upper bound$/);
    expect(ratioInWords(none.value, 'en-US')).toContain('not finite');
    expect(ratioInWords(none.value, 'en-US')).not.toMatch(/Infinity|NaN/);
  });

  it('does not claim a change when the rates agree', () => {
    const same = rateRatioTest({ count: 40, units: 400 }, { count: 31, units: 300 });
    if (!same.ok) throw new Error('refused');
    expect(ratioVerdict(same.value)).toContain('do not show that the rate changed');
  });

  it('tells where the history splits and how to reproduce the p-value', () => {
    const words = changePointInWords(
      {
        pValue: 0.0001,
        ratio: 0.55,
        replications: 9999,
        seed: 20240601,
        generator: 'xoshiro128** seeded by SplitMix64',
        lastBefore: 'S30',
        firstAfter: 'N01',
      },
      'en-US',
    );
    expect(words.proposal).toContain('between S30 and N01');
    expect(words.proposal).toContain('falling to 0.55 times');
    expect(words.reproduce).toContain('9,999 replications');
    expect(words.reproduce).toContain('seed 20240601');
    expect(words.proposal).not.toContain('smallest');
    // No replication reached the observed statistic: p = 1/(1 + R), the floor of the method.
    const floor = changePointInWords(
      {
        ...{ ratio: 0.55, replications: 9999, seed: 1, generator: 'g', lastBefore: 'a', firstAfter: 'b' },
        pValue: 1e-4,
        exceedances: 0,
      },
      'en-US',
    );
    expect(floor.proposal).toContain(
      'p = 0.0001 for a step anywhere, the smallest these replications can show',
    );
  });
});
