import { beforeAll, describe, expect, it } from 'vitest';
import { demoStudy } from '../../shared-core/study/demo-scenario.js';
import { signOffRefusal } from '../../shared-core/study/sign-off-rules.js';
import { exclude } from '../../shared-core/study/study-state.js';
import type { Study } from '../../shared-core/study/study-schema.js';
import { createPersonalIdentity } from '../../src-main/services/signing/personal-certificate.js';
import { addSignOff, signOffStates } from '../../src-main/services/signing/sign-off.js';
import type { SigningIdentity } from '../../src-main/services/signing/signing-identity.js';

let rui: SigningIdentity;
let dana: SigningIdentity;
let study: Study;
const now = (minute: number) => `2026-11-21T08:${String(minute).padStart(2, '0')}:00.000+01:00`;

beforeAll(async () => {
  [rui, dana] = await Promise.all([
    createPersonalIdentity({ name: 'Rui Tanaka' }),
    createPersonalIdentity({ name: 'Dana Okafor' }),
  ]);
  study = demoStudy({ id: 'st-sign-off', who: 'Rui Tanaka', now: now(0) });
});

const prepare = (s: Study, identity = rui) =>
  addSignOff(s, identity, {
    printedName: 'Rui Tanaka',
    role: 'Quality engineer',
    meaning: 'prepared',
    now: now(5),
    reactionPlan: 'Stop and call the lead.',
  });

describe('sign-off order and people (site rule: prepared, then approved, by different keys)', () => {
  it('drafts a revision, signs it as prepared, and it verifies', () => {
    const prepared = prepare(study);
    if (!prepared.ok) throw new Error(JSON.stringify(prepared.findings));
    const revision = prepared.value.revision;
    expect(revision.number).toBe(1);
    expect(revision.status).toBe('draft');
    expect(revision.reactionPlan).toBe('Stop and call the lead.');
    expect(signOffStates(prepared.value.study, revision).map((s) => s.state)).toEqual(['valid']);
  });

  it('refuses approval before preparation, and the same key twice', () => {
    const early = addSignOff(study, dana, {
      printedName: 'Dana Okafor',
      role: 'Manager',
      meaning: 'approved',
      now: now(6),
    });
    expect(early.ok).toBe(false);
    if (!early.ok) expect(early.findings[0]!.message).toMatch(/needs the "prepared" sign-off first/);
    const prepared = prepare(study);
    if (!prepared.ok) throw new Error('not prepared');
    const same = addSignOff(prepared.value.study, rui, {
      printedName: 'Rui Tanaka',
      role: 'Manager',
      meaning: 'approved',
      now: now(7),
    });
    expect(same.ok).toBe(false);
    if (!same.ok) expect(same.findings[0]!.message).toMatch(/different person/);
  });

  it('freezes the revision on approval, and refuses changing it afterwards', () => {
    const prepared = prepare(study);
    if (!prepared.ok) throw new Error('not prepared');
    const approved = addSignOff(prepared.value.study, dana, {
      printedName: 'Dana Okafor',
      role: 'Manager',
      meaning: 'approved',
      now: now(8),
    });
    if (!approved.ok) throw new Error(JSON.stringify(approved.findings));
    expect(approved.value.revision.status).toBe('approved');
    const again = addSignOff(approved.value.study, dana, {
      printedName: 'Dana Okafor',
      role: 'Manager',
      meaning: 'reviewed',
      now: now(9),
    });
    expect(again.ok).toBe(false);
  });

  it('shows a sign-off as void once its signed content changes', () => {
    const prepared = prepare(study);
    if (!prepared.ok) throw new Error('not prepared');
    const tampered = structuredClone(prepared.value.study);
    tampered.revisions[0]!.limits[0]!.ucl += 0.01;
    expect(signOffStates(tampered, tampered.revisions[0]!).map((s) => s.state)).toEqual(['void']);
  });

  it('voids a signed draft that no longer describes the study and drafts a new revision', () => {
    const prepared = prepare(study);
    if (!prepared.ok) throw new Error('not prepared');
    const changed = exclude(
      prepared.value.study,
      { who: 'Rui Tanaka', index: 10, cause: { category: 'Equipment', description: 'burner flame-out' } },
      now(20),
    );
    if (!changed.ok) throw new Error('not excluded');
    const next = prepare(changed.value, rui);
    if (!next.ok) throw new Error(JSON.stringify(next.findings));
    expect(next.value.revision.number).toBe(2);
    expect(next.value.study.revisions[0]!.status).toBe('void');
    expect(next.value.revision.excluded).toEqual([study.observations[10]!.label]);
  });
});

describe('signOffRefusal', () => {
  it('lets a site that needs only approval approve straight away', () => {
    expect(
      signOffRefusal({ required: ['approved'], separatePeople: true }, [], {
        meaning: 'approved',
        fingerprint: 'a',
      }),
    ).toBeNull();
    expect(
      signOffRefusal(
        { required: ['prepared', 'reviewed', 'approved'], separatePeople: true },
        [{ meaning: 'prepared', fingerprint: 'a', printedName: 'A' }],
        { meaning: 'approved', fingerprint: 'b' },
      ),
    ).toMatch(/"reviewed"/);
  });

  it('takes a second key of the same printed name as the same person when the site separates roles', () => {
    const earlier = [{ meaning: 'prepared' as const, fingerprint: 'a', printedName: 'Rui Tanaka' }];
    const rule = { required: ['prepared', 'approved'] as const, separatePeople: true };
    expect(
      signOffRefusal(rule, earlier, { meaning: 'approved', fingerprint: 'b', printedName: ' rui tanaka ' }),
    ).toMatch(/different person/);
    expect(
      signOffRefusal({ ...rule, separatePeople: false }, earlier, {
        meaning: 'approved',
        fingerprint: 'b',
        printedName: 'Rui Tanaka',
      }),
    ).toBeNull();
    expect(
      signOffRefusal(rule, earlier, { meaning: 'approved', fingerprint: 'b', printedName: 'Dana Okafor' }),
    ).toBeNull();
  });
});
