import { describe, expect, it } from 'vitest';
import chisquareCdf from '@stdlib/stats-base-dists-chisquare-cdf';
import { seededRandom, splitMix64 } from '../../shared-core/stats/random.js';

describe('the seeded generator (xoshiro128** seeded by SplitMix64)', () => {
  it('matches the authors’ reference C code (xoshiro128starstar.c, splitmix64.c, Blackman & Vigna) run outside the project', () => {
    // Outputs printed by the public-domain reference C functions compiled with gcc, state seeded
    // with the low and high halves of the first two SplitMix64 outputs.
    expect(splitMix64(0n, 2)).toEqual([16294208416658607535n, 7960286522194355700n]);
    const cases: [number, number[]][] = [
      [0, [3737715805, 2584255861, 2876756834, 3286328325, 1553311962, 1625202774]],
      [1, [1695105466, 1423115009, 634581793, 1068227753, 716759206, 4186505319]],
      [20261201, [1212717254, 187102991, 2799991943, 563791004, 2310151566, 1695033977]],
    ];
    for (const [seed, outputs] of cases) {
      const random = seededRandom(seed);
      expect(outputs.map(() => random.nextUint32())).toEqual(outputs);
    }
  });

  it('the first SplitMix64 output for seed 0 is 0xe220a8397b1dcdaf (widely published; from memory)', () => {
    expect(splitMix64(0n, 1)[0]).toBe(0xe220a8397b1dcdafn);
  });

  it('gives uniforms in [0, 1) that pass a chi-square test of 100 equal cells (200,000 draws)', () => {
    const random = seededRandom(7);
    const cells = new Array<number>(100).fill(0);
    const n = 200_000;
    let outside = 0;
    for (let i = 0; i < n; i++) {
      const u = random.nextUniform();
      if (!(u >= 0 && u < 1)) outside++;
      cells[Math.floor(u * 100)]++;
    }
    expect(outside).toBe(0);
    const expected = n / 100;
    const statistic = cells.reduce((s, c) => s + (c - expected) ** 2 / expected, 0);
    const p = 1 - chisquareCdf(statistic, 99);
    expect(p).toBeGreaterThan(0.001);
    expect(p).toBeLessThan(0.999);
  });

  it('reproduces from the same seed and refuses a seed that is not a whole number', () => {
    const a = seededRandom(42);
    const b = seededRandom(42);
    for (let i = 0; i < 10; i++) expect(a.nextUniform()).toBe(b.nextUniform());
    expect(() => seededRandom(-1)).toThrow(/seed/);
    expect(() => seededRandom(1.5)).toThrow(/seed/);
  });
});
