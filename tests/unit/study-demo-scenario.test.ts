import { describe, expect, it } from 'vitest';
import { analyzePhaseOne } from '../../shared-core/study/phase-one.js';
import { demoCauses, demoCsv, demoLabel, demoStudy } from '../../shared-core/study/demo-scenario.js';
import { deriveState } from '../../shared-core/study/study-state.js';
import { verifyStudy } from '../../shared-core/study/verify-study.js';
import { sha256Hex } from '../../shared-core/study/sha256.js';

describe('the invented demo scenario', () => {
  const study = demoStudy({ id: 'demo-test', who: 'A. Tester', now: '2026-03-14T09:00:00.000+01:00' });

  it('is labelled invented wherever it shows', () => {
    expect(study.identity.demo).toBe(true);
    for (const text of [
      study.identity.part,
      study.identity.owner,
      study.identity.site ?? '',
      demoLabel,
      demoCsv(),
    ]) {
      expect(text).toMatch(/invented/i);
    }
    expect(study.source.sha256).toBe(sha256Hex(demoCsv()));
    expect(verifyStudy(study)).toEqual([]);
  });

  it('plants its two assignable causes where the notes say, and they are the only signals', () => {
    const state = deriveState(study);
    const before = analyzePhaseOne(state.observations, [], state.method);
    if (!before.ok) throw new Error(before.findings[0].message);
    const signals = before.value.periods
      .filter((period) => period.status === 'signal')
      .map((period) => period.index);
    expect(signals).toEqual(demoCauses.map((planted) => planted.index));
    const noted = new Set(state.notes.map((note) => note.index));
    expect(demoCauses.every((planted) => noted.has(planted.index))).toBe(true);

    const after = analyzePhaseOne(state.observations, demoCauses, state.method);
    if (!after.ok) throw new Error(after.findings[0].message);
    expect(after.value.periods.filter((period) => period.status === 'signal')).toEqual([]);
  });
});
