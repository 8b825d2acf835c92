import { beforeAll, describe, expect, it } from 'vitest';
import { approvedBaseline } from '../../shared-core/changes/approved-baseline.js';
import {
  draftChangeEvidence,
  firstNewPeriod,
  proposeChange,
} from '../../shared-core/changes/propose-change.js';
import { demoStudy } from '../../shared-core/study/demo-scenario.js';
import { revisionAnalysis } from '../../shared-core/study/revision-scope.js';
import { addPeriods, deriveState, exclude, undo } from '../../shared-core/study/study-state.js';
import type { Study } from '../../shared-core/study/study-schema.js';
import { verifyStudy } from '../../shared-core/study/verify-study.js';
import type { Result } from '../../shared-core/result.js';
import { createPersonalIdentity } from '../../src-main/services/signing/personal-certificate.js';
import { addSignOff, signOffStates } from '../../src-main/services/signing/sign-off.js';
import type { SigningIdentity } from '../../src-main/services/signing/signing-identity.js';

const value = <T>(result: Result<T>): T => {
  if (!result.ok) throw new Error(result.findings.map((finding) => finding.message).join('; '));
  return result.value;
};
const now = (minute: number) => `2026-11-21T08:${String(minute).padStart(2, '0')}:00.000+01:00`;

let rui: SigningIdentity;
let dana: SigningIdentity;
let approved: Study;

const sign = (study: Study, identity: SigningIdentity, meaning: 'prepared' | 'approved', minute: number) =>
  value(
    addSignOff(study, identity, {
      printedName: identity === rui ? 'Rui Tanaka' : 'Dana Okafor',
      role: meaning === 'prepared' ? 'Quality engineer' : 'Manager',
      meaning,
      now: now(minute),
    }),
  ).study;

/** Invented new production: 12 shifts of 40 panels with fewer blemishes than the demo history. */
const newShifts = Array.from({ length: 12 }, (_, i) => ({
  label: `N-${String(i + 1).padStart(2, '0')}`,
  row: i + 2,
  count: [1, 0, 2, 1, 1, 0, 1, 2, 0, 1, 1, 0][i],
  units: 40,
}));

beforeAll(async () => {
  [rui, dana] = await Promise.all([
    createPersonalIdentity({ name: 'Rui Tanaka' }),
    createPersonalIdentity({ name: 'Dana Okafor' }),
  ]);
  const demo = demoStudy({ id: 'st-change', who: 'Rui Tanaka', now: now(0) });
  approved = sign(sign(demo, rui, 'prepared', 1), dana, 'approved', 2);
});

const withNewData = () =>
  value(
    addPeriods(
      approved,
      { who: 'Rui Tanaka', file: 'new-shifts.csv', sourceSha256: 'c'.repeat(64), observations: newShifts },
      now(10),
    ),
  );

describe('proposing a change of approved limits', () => {
  it('refuses a new sign-off after approval until a change is proposed with its reason', () => {
    const study = withNewData();
    const attempt = addSignOff(study, rui, {
      printedName: 'Rui Tanaka',
      role: 'Quality engineer',
      meaning: 'prepared',
      now: now(11),
    });
    expect(attempt.ok).toBe(false);
    const proposal = {
      who: 'Rui Tanaka',
      category: 'process-change' as const,
      firstIndex: firstNewPeriod(study),
    };
    expect(proposeChange(study, { ...proposal, reason: '  ' }, now(11)).ok).toBe(false);
    expect(proposeChange(approved, { ...proposal, reason: 'x', firstIndex: 999 }, now(11)).ok).toBe(false);
  });

  it('splits at the first new period, drafts a revision that supersedes the approved one, and signs it', () => {
    const study = withNewData();
    const first = firstNewPeriod(study);
    expect(first).toBe(approved.observations.length);
    const proposed = value(
      proposeChange(
        study,
        {
          who: 'Rui Tanaka',
          category: 'process-change',
          reason: 'new sealer nozzle on line 2',
          firstIndex: first,
        },
        now(12),
      ),
    );
    expect(verifyStudy(proposed)).toEqual([]);
    expect(deriveState(proposed).splits.map((s) => s.index)).toEqual([first]);
    const draft = proposed.revisions.at(-1)!;
    expect(draft).toMatchObject({
      number: 2,
      status: 'draft',
      reasonCategory: 'process-change',
      reasonForChange: 'new sealer nozzle on line 2',
      segmentStart: first,
      supersedes: 'rev-1',
      included: newShifts.map((s) => s.label),
    });
    // The draft's center is the new periods' own rate: Σx / Σk over them (hand sum: 10 / 480).
    expect(draft.center).toBeCloseTo(10 / 480, 12);
    expect(
      proposeChange(
        proposed,
        { who: 'x', category: 'process-change', reason: 'y', firstIndex: first },
        now(13),
      ).ok,
    ).toBe(false);

    const evidence = value(draftChangeEvidence(proposed));
    const base = evidence.approved.analysis.totals;
    // Rate ratio new/approved as the ratio of Σx/Σk (definition; the exact interval is tested in
    // changes-rate-ratio-test against @stdlib).
    expect(evidence.comparison.ratio).toBeCloseTo(10 / 480 / (base.count / base.units), 12);
    expect(evidence.approved.revision.id).toBe('rev-1');

    const signed = sign(sign(proposed, rui, 'prepared', 14), dana, 'approved', 15);
    const revision2 = signed.revisions.find((r) => r.id === 'rev-2')!;
    expect(revision2.status).toBe('approved');
    expect(revision2.supersedes).toBe('rev-1');
    expect(signOffStates(signed, revision2).map((s) => s.state)).toEqual(['valid', 'valid']);
    expect(verifyStudy(signed)).toEqual([]);
    // The old revision still recomputes to the center it signed, over its own periods.
    const old = value(approvedBaseline(signed, 'rev-1'));
    expect(old.analysis.center).toBe(approved.revisions[0].center);
    expect(old.observations).toHaveLength(approved.observations.length);
    expect(value(approvedBaseline(signed)).revision.id).toBe('rev-2');
    expect(value(revisionAnalysis(signed, revision2)).periods.map((p) => p.label)).toEqual(
      newShifts.map((s) => s.label),
    );
  });

  it('refuses the evidence and the sign-off of a change whose split was undone, rather than mix periods', () => {
    const study = withNewData();
    const proposed = value(
      proposeChange(
        study,
        {
          who: 'Rui Tanaka',
          category: 'process-change',
          reason: 'new nozzle',
          firstIndex: firstNewPeriod(study),
        },
        now(12),
      ),
    );
    const undone = value(undo(proposed, 'Rui Tanaka', now(13)));
    expect(deriveState(undone).splits).toEqual([]);
    const evidence = draftChangeEvidence(undone);
    expect(evidence.ok).toBe(false);
    if (!evidence.ok) expect(evidence.findings[0].message).toMatch(/no longer starts a segment/);
    const signed = addSignOff(undone, rui, {
      printedName: 'Rui Tanaka',
      role: 'Quality engineer',
      meaning: 'prepared',
      now: now(14),
    });
    expect(signed.ok).toBe(false);
  });

  it('keeps the reason when decisions after a sign-off void the draft and it is drafted again', () => {
    const study = withNewData();
    const first = firstNewPeriod(study);
    const proposed = value(
      proposeChange(
        study,
        { who: 'Rui Tanaka', category: 'special-cause', reason: 'mixed resin lot', firstIndex: first },
        now(12),
      ),
    );
    const prepared = sign(proposed, rui, 'prepared', 13);
    const changed = value(
      exclude(
        prepared,
        { who: 'Rui Tanaka', index: first + 2, cause: { category: 'Material', description: 'resin lot' } },
        now(14),
      ),
    );
    const again = sign(changed, rui, 'prepared', 15);
    const latest = again.revisions.at(-1)!;
    expect(again.revisions.find((r) => r.id === 'rev-2')!.status).toBe('void');
    expect(latest).toMatchObject({
      number: 3,
      reasonCategory: 'special-cause',
      supersedes: 'rev-1',
      segmentStart: first,
    });
    expect(latest.excluded).toEqual([newShifts[2].label]);
  });
});
