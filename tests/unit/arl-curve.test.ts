import poissonCdf from '@stdlib/stats-base-dists-poisson-cdf';
import { describe, expect, it } from 'vitest';
import { sigmaLimits } from '../../shared-core/charts/sigma-limits.js';
import {
  arlCurve,
  arlCurveSvg,
  curveLayout,
  curveRatios,
  decadeLabel,
} from '../../shared-core/view/arl-curve.js';

/**
 * ARL of the one-point rule = 1/p with p = P(X > UCL) + P(X < LCL), X ~ Poisson(mean)
 * (Montgomery, Introduction to Statistical Quality Control, ch. 5), p from @stdlib's Poisson cdf.
 */
function referenceArl(mean: number, upper: number, lower: number | null): number {
  const above = 1 - poissonCdf(Math.floor(upper), mean);
  const below = lower === null ? 0 : poissonCdf(Math.ceil(lower) - 1, mean);
  return 1 / (above + below);
}

describe('the run-length curve of a limit change', () => {
  // Invented rates: approved 0.2 per unit, proposed 0.12, both at k = 50 with 3-sigma limits.
  const units = 50;
  const approvedAt = { rate: 0.2, units, limits: sigmaLimits(0.2, units), sigmaZ: null };
  const proposedAt = { rate: 0.12, units, limits: sigmaLimits(0.12, units), sigmaZ: null };
  const curve = arlCurve({ at: approvedAt, rules: ['beyond'] }, { at: proposedAt, rules: ['beyond'] });
  if (!curve.ok) throw new Error(curve.findings[0].message);

  it('gives each limit set its exact ARL at every rate, on the approved rate as the unit', () => {
    const { ratios, approved, proposed } = curve.value;
    expect(ratios).toContain(1);
    expect(ratios.some((r) => Math.abs(r - 0.6) < 1e-9)).toBe(true);
    ratios.forEach((r, i) => {
      const mean = r * 0.2 * units;
      // The limits at k on the count scale are ū·k ± 3√(ū·k); a negative lower one is none.
      const limits = (c: number) =>
        [c + 3 * Math.sqrt(c), c - 3 * Math.sqrt(c) > 0 ? c - 3 * Math.sqrt(c) : null] as const;
      const a = referenceArl(mean, ...limits(0.2 * units));
      const b = referenceArl(mean, ...limits(0.12 * units));
      expect(approved[i]! / a).toBeCloseTo(1, 6);
      expect(proposed[i]! / b).toBeCloseTo(1, 6);
    });
  });

  it('shows the tighter proposed limits signalling sooner at the approved rate', () => {
    const at1 = curve.value.ratios.indexOf(1);
    expect(curve.value.proposed[at1]!).toBeLessThan(curve.value.approved[at1]!);
  });

  it('spaces the ratios on a log scale and includes 1 and the proposed ratio', () => {
    const r = curveRatios(0.5, 2, 5);
    expect(r).toEqual([0.5, 0.707106781187, 1, 1.41421356237, 2]);
  });

  it('puts equal ratios of ARL at equal heights (log y axis) and higher ARL higher', () => {
    const layout = curveLayout(curve.value);
    expect(layout.y(1) - layout.y(10)).toBeCloseTo(layout.y(10) - layout.y(100), 9);
    expect(layout.y(370)).toBeLessThan(layout.y(44));
    expect(layout.decades[0]).toBe(1);
    expect(layout.decades.at(-1)!).toBeGreaterThanOrEqual(
      Math.max(...curve.value.approved.map((v) => v ?? 0)),
    );
  });

  it('labels the decades briefly and leaves run lengths beyond a million periods off the plot', () => {
    expect([1, 10, 1000, 100000, 1000000].map(decadeLabel)).toEqual(['1', '10', '1k', '100k', '1M']);
    const long = { ratios: [1, 2, 3], approved: [5e7, 100, 10], proposed: [20, null, 5], proposedRatio: 2 };
    const layout = curveLayout(long);
    expect(layout.high).toBe(1e6);
    const svg = arlCurveSvg(long, { title: '', xTitle: '' });
    // The approved line keeps only its two points on the plot; the proposed one breaks at the null.
    const approvedLine = /data-curve="approved" points="([^"]+)"/.exec(svg)![1].split(' ');
    expect(approvedLine).toHaveLength(2);
    expect(svg).not.toContain('data-curve="proposed"');
  });

  it('draws both curves with a guide at each in-control rate', () => {
    const svg = arlCurveSvg(curve.value, {
      title: 'Run lengths',
      xTitle: 'rate as a multiple of the approved rate',
    });
    expect(svg).toContain('data-curve="approved"');
    expect(svg).toContain('data-curve="proposed"');
    expect(svg).toContain('approved rate');
    expect(svg).toContain('new rate');
    expect(svg).not.toMatch(/NaN|Infinity/);
  });
});
