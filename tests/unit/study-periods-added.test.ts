import { describe, expect, it } from 'vitest';
import { chainHead, sealStudy } from '../../shared-core/study/audit-chain.js';
import { addPeriods, deriveState } from '../../shared-core/study/study-state.js';
import { verifyStudy } from '../../shared-core/study/verify-study.js';
import type { Result } from '../../shared-core/result.js';
import { at, sampleObservations, sampleStudy } from '../integration/fixtures/study-sample.js';

const value = <T>(result: Result<T>): T => {
  if (!result.ok) throw new Error(result.findings.map((finding) => finding.message).join('; '));
  return result.value;
};

const later = sampleObservations(16)
  .slice(12)
  .map((o) => ({ ...o, row: o.row - 12 }));

describe('periods added after the history', () => {
  it('appends them with an audited event, and a point of the chain before it keeps its own periods', () => {
    const study = sampleStudy();
    const before = chainHead(study);
    const added = value(
      addPeriods(
        study,
        { who: 'A. Tester', file: 'april.csv', sourceSha256: 'b'.repeat(64), observations: later },
        at(1),
      ),
    );
    expect(added.observations).toHaveLength(16);
    expect(added.events.at(-1)).toMatchObject({
      type: 'periods-added',
      payload: { file: 'april.csv', firstIndex: 12, observationCount: 4 },
    });
    expect(deriveState(added).observations).toHaveLength(16);
    expect(deriveState(added, before).observations).toHaveLength(12);
    expect(verifyStudy(added)).toEqual([]);
  });

  it('refuses nothing to add and a label already in the study', () => {
    const study = sampleStudy();
    const input = { who: 'A. Tester', file: 'x.csv', sourceSha256: 'b'.repeat(64) };
    expect(addPeriods(study, { ...input, observations: [] }, at(1)).ok).toBe(false);
    const again = addPeriods(study, { ...input, observations: [sampleObservations(1)[0]] }, at(1));
    expect(again.ok).toBe(false);
    if (!again.ok) expect(again.findings[0]).toMatchObject({ column: 'label', value: 'L001' });
  });

  it('shows an appended period changed outside the program', () => {
    const added = value(
      addPeriods(
        sampleStudy(),
        { who: 'A. Tester', file: 'april.csv', sourceSha256: 'b'.repeat(64), observations: later },
        at(1),
      ),
    );
    const observations = added.observations.map((o, i) => (i === 14 ? { ...o, count: o.count + 1 } : o));
    const tampered = sealStudy({ ...added, observations });
    expect(verifyStudy(tampered).map((p) => p.code)).toContain('import-mismatch');
  });
});
