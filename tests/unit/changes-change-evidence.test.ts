import { describe, expect, it } from 'vitest';
import binomialPmf from '@stdlib/stats-base-dists-binomial-pmf';
import poissonCdf from '@stdlib/stats-base-dists-poisson-cdf';
import { changeEvidence } from '../../shared-core/changes/change-evidence.js';
import { analyzePhaseOne } from '../../shared-core/study/phase-one.js';
import { defaultOptions, type Observation } from '../../shared-core/study/analysis-types.js';

// Invented scenario: defects per batch of 5 housings before and after a made-up tooling change.
const before = [9, 11, 10, 8, 12, 10, 9, 11, 10, 10, 9, 11];
const after = [16, 14, 15, 17, 13, 15, 16, 14, 15, 15];
const periods = (counts: number[], prefix: string): Observation[] =>
  counts.map((count, i) => ({ label: `${prefix}${i + 1}`, row: i + 2, count, units: 5 }));
const analysis = (counts: number[], prefix: string) => {
  const result = analyzePhaseOne(periods(counts, prefix), [], defaultOptions);
  if (!result.ok) throw new Error('no analysis');
  return result.value;
};

describe('the evidence for a change of limits', () => {
  const approved = analysis(before, 'A');
  const proposed = analysis(after, 'B');
  const evidence = changeEvidence({
    approved,
    approvedRules: ['beyond'],
    proposed,
    proposedRules: ['beyond'],
    changePoint: { replications: 499, seed: 9 },
  });
  if (!evidence.ok) throw new Error(evidence.findings[0].message);
  const { value } = evidence;

  it('compares the rates proposed/approved with the exact test (p from the definition, @stdlib pmf)', () => {
    expect(value.comparison.ratio).toBeCloseTo(150 / 50 / (120 / 60), 12);
    const n = 270;
    const p0 = 50 / 110;
    const observed = binomialPmf(150, n, p0);
    let expected = 0;
    for (let i = 0; i <= n; i++) {
      const d = binomialPmf(i, n, p0);
      if (d <= observed * (1 + 1e-7)) expected += d;
    }
    expect(value.comparison.pValue / expected).toBeCloseTo(1, 8);
  });

  it('tabulates old and new limits at k (c̄ ± 3√c̄ at k = 5) and flags a higher UCL as wider', () => {
    expect(value.limits).toHaveLength(1);
    const [row] = value.limits;
    expect(row.units).toBe(5);
    expect(row.approved.ucl).toBeCloseTo(10 + 3 * Math.sqrt(10), 12);
    expect(row.proposed.ucl).toBeCloseTo(15 + 3 * Math.sqrt(15), 12);
    expect(value.wider).toBe(true);
    expect(value.warnings.map((w) => w.code)).toContain('wider-limits');
    const narrower = changeEvidence({
      approved: proposed,
      approvedRules: ['beyond'],
      proposed: approved,
      proposedRules: ['beyond'],
    });
    expect(narrower.ok && narrower.value.wider).toBe(false);
  });

  it('gives the run lengths of both sets of limits (1/p from @stdlib at the approved rate)', () => {
    expect(value.arl).not.toBeNull();
    const approvedUcl = Math.floor(10 + 3 * Math.sqrt(10));
    const approvedLastLow = Math.ceil(10 - 3 * Math.sqrt(10)) - 1;
    const p = 1 - poissonCdf(approvedUcl, 10) + poissonCdf(approvedLastLow, 10);
    expect(value.arl?.approved.points[0].arl).toBeCloseTo(1 / p, 6);
    expect(value.arl?.proposed.points.map((q) => q.shift)).toEqual([1, 1.25, 1.5, 2]);
  });

  it('finds the step where the approved periods end, with its seed stored', () => {
    expect(value.changePoint?.lastBefore).toBe('A12');
    expect(value.changePoint?.firstAfter).toBe('B1');
    expect(value.changePoint?.pValue).toBeLessThan(0.05);
    expect(value.changePoint).toMatchObject({ seed: 9, replications: 499 });
  });

  it('explains why no run lengths are given for rules the exact chain cannot follow', () => {
    const withTrend = changeEvidence({
      approved,
      approvedRules: ['beyond', 'trend'],
      proposed,
      proposedRules: ['beyond'],
      changePoint: { replications: 9 },
    });
    expect(withTrend.ok && withTrend.value.arl).toBeNull();
    expect(withTrend.ok && withTrend.value.arlNote).toMatch(/trend/);
  });
});
