import { describe, expect, it } from 'vitest';
import poissonQuantile from '@stdlib/stats-base-dists-poisson-quantile';
import { approvedBaseline } from '../../shared-core/changes/approved-baseline.js';
import { checkNewPeriods } from '../../shared-core/changes/new-periods-check.js';
import { appendEvent, sealStudy } from '../../shared-core/study/audit-chain.js';
import { newStudy } from '../../shared-core/study/new-study.js';
import { deriveState, exclude } from '../../shared-core/study/study-state.js';
import { analyzePhaseOne } from '../../shared-core/study/phase-one.js';
import {
  defaultOptions,
  type AnalysisOptions,
  type Observation,
} from '../../shared-core/study/analysis-types.js';
import type { Study } from '../../shared-core/study/study-schema.js';

// Invented baseline: nonconformities on rolls of varying length (units of 10 m²).
const baseline: Observation[] = [12, 9, 14, 11, 10, 13, 8, 12, 11, 10].map((count, i) => ({
  label: `R${i + 1}`,
  row: i + 2,
  count,
  units: [5, 4, 6, 5, 4, 6, 4, 5, 5, 4][i],
}));
const analyze = (options: Partial<AnalysisOptions> = {}) => {
  const result = analyzePhaseOne(baseline, [], { ...defaultOptions, ...options });
  if (!result.ok) throw new Error(result.findings[0].message);
  return result.value;
};

describe('new periods against frozen limits', () => {
  it('gives each period the u-chart limits ū ± 3√(ū/k) at its own k (Montgomery, ch. 7)', () => {
    const approved = analyze();
    const rate = 110 / 48;
    const fresh: Observation[] = [
      { label: 'N1', row: 2, count: 10, units: 4 },
      { label: 'N2', row: 3, count: 30, units: 6 },
      { label: 'N3', row: 4, count: 1, units: 8 },
    ];
    const periods = checkNewPeriods(approved, fresh, ['beyond']);
    periods.forEach((p, i) => {
      const k = fresh[i].units;
      expect(p.ucl).toBeCloseTo(rate + 3 * Math.sqrt(rate / k), 12);
      const lower = rate - 3 * Math.sqrt(rate / k);
      if (lower > 0) expect(p.lcl).toBeCloseTo(lower, 12);
      else expect(p.lcl).toBeNull();
      expect(p.z).toBeCloseTo((fresh[i].count / k - rate) / Math.sqrt(rate / k), 12);
    });
    expect(periods.map((p) => p.status)).toEqual(['in', 'signal', 'signal']);
  });

  it('takes probability limits at each k from the exact Poisson quantile (@stdlib)', () => {
    const approved = analyze({ limits: 'probability' });
    const rate = 110 / 48;
    const fresh: Observation[] = [4, 7, 12].map((units, i) => ({
      label: `N${i}`,
      row: i + 2,
      count: 9,
      units,
    }));
    const periods = checkNewPeriods(approved, fresh, ['beyond']);
    periods.forEach((p, i) => {
      const mean = rate * fresh[i].units;
      expect(p.ucl * fresh[i].units).toBeCloseTo(poissonQuantile(1 - 0.00135, mean), 9);
    });
  });

  it('runs the rules over the new periods afresh: a run of 8 above the center fires at the 8th (DESIGN.md)', () => {
    const approved = analyze();
    const fresh: Observation[] = Array.from({ length: 9 }, (_, i) => ({
      label: `N${i + 1}`,
      row: i + 2,
      count: 14,
      units: 5,
    }));
    const periods = checkNewPeriods(approved, fresh, ['beyond', 'run:8']);
    expect(periods.map((p) => p.rules.includes('run:8'))).toEqual([
      false,
      false,
      false,
      false,
      false,
      false,
      false,
      true,
      true,
    ]);
  });
});

describe('the approved baseline of a study', () => {
  const at = (minute: number) => `2026-06-01T10:${String(minute).padStart(2, '0')}:00.000+00:00`;
  function study(approve: boolean, centerShift = 0): Study {
    let s = newStudy({
      id: '5e2f3a10-7c44-4a1e-8f0b-3b9d1c2e4f56',
      identity: {
        part: 'Invented roll R-1',
        processStep: 'Coating',
        characteristic: 'pinholes',
        inspectionUnit: '10 m²',
        owner: 'G. Example',
      },
      source: { file: 'invented.csv', sha256: 'c'.repeat(64), importSettings: {}, importReport: {} },
      observations: baseline,
      method: { ...defaultOptions },
      who: 'G. Example',
      now: at(0),
    });
    const state = deriveState(s);
    const result = analyzePhaseOne(state.observations, state.exclusions, state.method);
    if (!result.ok) throw new Error('no analysis');
    s = appendEvent(s, { type: 'revision-drafted', who: 'G. Example', payload: { revisionId: 'r1' } }, at(1));
    s = sealStudy({
      ...s,
      revisions: [
        {
          id: 'r1',
          number: 1,
          status: approve ? 'approved' : 'draft',
          method: state.method,
          center: result.value.center + centerShift,
          limits: [],
          included: baseline.map((o) => o.label),
          excluded: [],
          chainHead: s.events.at(-1)!.hash,
          signOffs: [],
        },
      ],
    });
    const later = exclude(
      s,
      { who: 'G. Example', index: 0, cause: { category: 'Trial', description: 'after approval' } },
      at(2),
    );
    if (!later.ok) throw new Error('no exclusion');
    return later.value;
  }

  it('recomputes the revision from the study as it stood at its chain head, ignoring later decisions', () => {
    const result = approvedBaseline(study(true));
    expect(result.ok).toBe(true);
    if (result.ok) {
      expect(result.value.exclusions).toEqual([]);
      expect(result.value.analysis.totals).toEqual({ count: 110, units: 48 });
    }
  });

  it('refuses a study with no approved revision, and one whose signed center does not recompute', () => {
    const none = approvedBaseline(study(false));
    expect(none.ok).toBe(false);
    if (!none.ok) expect(none.findings[0].message).toMatch(/no approved revision/);
    const altered = approvedBaseline(study(true, 0.5));
    expect(altered.ok).toBe(false);
    if (!altered.ok) expect(altered.findings[0].message).toMatch(/recompute/);
  });
});
