// @vitest-environment jsdom
import binomialPmf from '@stdlib/stats-base-dists-binomial-pmf';
import { beforeAll, describe, expect, it } from 'vitest';
import type { StudyView } from '../../shared-core/api.js';
import { defaultOptions, type Observation } from '../../shared-core/study/analysis-types.js';
import { demoObservations, demoStudy } from '../../shared-core/study/demo-scenario.js';
import type { Study } from '../../shared-core/study/study-schema.js';
import type { Result } from '../../shared-core/result.js';
import { createPersonalIdentity } from '../../src-main/services/signing/personal-certificate.js';
import { addSignOff } from '../../src-main/services/signing/sign-off.js';
import type { SigningIdentity } from '../../src-main/services/signing/signing-identity.js';
import { changes } from '../../src-renderer/state/changes.svelte.js';
import { study } from '../../src-renderer/state/study.svelte.js';

const value = <T>(result: Result<T>): T => {
  if (!result.ok) throw new Error(result.findings.map((f) => f.message).join('; '));
  return result.value;
};
const at = (minute: number) => `2026-11-21T09:${String(minute).padStart(2, '0')}:00.000+01:00`;

/**
 * Invented new production (not a published example): 16 shifts of 45 panels at fewer blemishes
 * than the demo history, with shift N-05 planted far above the approved limit.
 */
const newCounts = [3, 2, 4, 1, 30, 2, 3, 1, 2, 4, 2, 3, 1, 2, 3, 2];
const newShifts: Observation[] = newCounts.map((count, i) => ({
  label: `N-${String(i + 1).padStart(2, '0')}`,
  row: i + 2,
  count,
  units: 45,
}));

const imported = (observations: Observation[]) => ({
  title: 'new-shifts',
  unit: 'one door panel',
  file: 'new-shifts.csv',
  sha256: 'd'.repeat(64),
  observations,
  importSettings: {},
  importReport: {},
});

/** The two-sided exact conditional p-value summed term by term with @stdlib's binomial pmf. */
function referenceP(x: number, total: number, p0: number): number {
  const observed = binomialPmf(x, total, p0);
  let sum = 0;
  for (let i = 0; i <= total; i++) {
    const term = binomialPmf(i, total, p0);
    if (term <= observed * (1 + 1e-7)) sum += term;
  }
  return Math.min(1, sum);
}

let approved: Study;
let preparer: SigningIdentity;
let approver: SigningIdentity;

beforeAll(async () => {
  [preparer, approver] = await Promise.all([
    createPersonalIdentity({ name: 'Rui Tanaka' }),
    createPersonalIdentity({ name: 'Dana Okafor' }),
  ]);
  const demo = demoStudy({ id: 'st-renderer-change', who: 'Rui Tanaka', now: at(0) });
  const prepared = value(
    addSignOff(demo, preparer, {
      printedName: 'Rui Tanaka',
      role: 'Engineer',
      meaning: 'prepared',
      now: at(1),
    }),
  );
  approved = value(
    addSignOff(prepared.study, approver, {
      printedName: 'Dana Okafor',
      role: 'Manager',
      meaning: 'approved',
      now: at(2),
    }),
  ).study;
}, 60_000);

function open(document: Study): void {
  study.loadView({
    file: null,
    title: 'Demo',
    unitName: 'one door panel',
    document,
    observations: document.observations,
    exclusions: [],
    options: defaultOptions,
    readOnly: false,
    findings: [],
  } as StudyView);
}

describe('the Changes screen state', () => {
  it('shows the approved revision and nothing new before periods are added', () => {
    open(approved);
    expect(changes.approved?.number).toBe(1);
    expect(changes.baseline?.ok).toBe(true);
    expect(changes.firstNew).toBe(demoObservations.length);
    expect(changes.checked).toEqual([]);
    expect(changes.draft).toBeNull();
  });

  it('appends new periods and judges them against the frozen limits, without recomputing', () => {
    open(approved);
    expect(changes.append(imported(newShifts))).toEqual([]);
    expect(study.observations).toHaveLength(demoObservations.length + newShifts.length);
    // The approved rate ū = Σx/Σk of the demo's 30 shifts; sigma limits on counts at k = 45 are
    // ū·k ± 3√(ū·k) (Montgomery, Introduction to Statistical Quality Control, ch. 7).
    const rate =
      demoObservations.reduce((s, o) => s + o.count, 0) / demoObservations.reduce((s, o) => s + o.units, 0);
    const mean = rate * 45;
    const ucl = (mean + 3 * Math.sqrt(mean)) / 45;
    expect(changes.checked).toHaveLength(16);
    for (const p of changes.checked) {
      expect(p.ucl).toBeCloseTo(ucl, 12);
      expect(p.center).toBeCloseTo(rate, 12);
      expect(p.status).toBe(p.count / 45 > ucl ? 'signal' : 'in');
    }
    expect(changes.signals.map((p) => p.label)).toEqual(['N-05']);
    expect(changes.signals[0].globalIndex).toBe(demoObservations.length + 4);
  });

  it('refuses periods that are already in the study, naming the file and the period', () => {
    open(approved);
    const problems = changes.append(imported([{ ...demoObservations[0] }]));
    expect(problems[0].message).toContain('new-shifts.csv');
    expect(problems[0].message).toContain('S01');
    expect(study.observations).toHaveLength(demoObservations.length);
  });

  it('suggests where the history splits, and accepting it sets the first period of the new study', () => {
    open(approved);
    changes.append(imported(newShifts));
    expect(changes.firstIndex).toBe(demoObservations.length);
    const suggestion = changes.suggestion;
    expect(suggestion).not.toBeNull();
    expect(suggestion!.seed).toBeGreaterThanOrEqual(0);
    expect(suggestion!.replications).toBeGreaterThan(0);
    changes.startFrom(demoObservations.length + 4);
    expect(changes.firstIndex).toBe(demoObservations.length + 4);
    changes.acceptSuggestion();
    expect(changes.firstIndex).toBe(suggestion!.firstIndex);
  });

  it('needs a name and a reason, then drafts the change and gives the evidence for it', () => {
    open(approved);
    changes.append(imported(newShifts));
    changes.chosenFirst = null;
    changes.who = '';
    changes.reason = ' ';
    expect(changes.propose()).toBe(false);
    expect(changes.problem).toContain('your name');
    expect(changes.problem).toContain('the reason for the change');
    changes.who = 'Rui Tanaka';
    changes.category = 'process-change';
    changes.reason = 'New burner controls on furnace line 2 (invented)';
    expect(changes.propose()).toBe(true);
    expect(changes.draft?.supersedes).toBe(changes.approved?.id);
    expect(changes.draft?.reasonCategory).toBe('process-change');

    const evidence = changes.evidence;
    if (!evidence?.ok) throw new Error('no evidence');
    // The ratio over the included periods: the demo history (nothing excluded) against all new ones
    // (the planted N-05 still signals in the new study and is not excluded here).
    const x0 = demoObservations.reduce((s, o) => s + o.count, 0);
    const t0 = demoObservations.reduce((s, o) => s + o.units, 0);
    const x1 = newCounts.reduce((s, c) => s + c, 0);
    const t1 = 45 * newCounts.length;
    expect(evidence.value.comparison.ratio).toBeCloseTo(x1 / t1 / (x0 / t0), 12);
    expect(evidence.value.comparison.pValue).toBeCloseTo(referenceP(x1, x0 + x1, t1 / (t0 + t1)), 10);
    expect(changes.beforeAfter?.approvedCount).toBe(demoObservations.length);
    expect(changes.curve?.ok).toBe(true);
    // Undoing the split leaves the draft without its own study: the evidence is refused, not mixed.
    expect(study.undo()).toBe(true);
    expect(changes.evidence?.ok).toBe(false);
    expect(changes.evidence?.ok ? '' : changes.evidence?.findings[0].message).toContain(
      'no longer split at N-01',
    );
    expect(study.redo()).toBe(true);
    expect(changes.evidence?.ok).toBe(true);
    // Proposing again while the draft is open is refused by the core, with its words.
    changes.reason = 'again';
    expect(changes.propose()).toBe(false);
    expect(changes.problem).toContain('draft revision is already open');
  });

  it('flags wider proposed limits for extra scrutiny', () => {
    open(approved);
    // Invented worse production: about 0.3 blemishes per panel, twice the demo's rate.
    const worse = newShifts.map((o, i) => ({ ...o, count: [14, 12, 15, 13, 16, 12, 14, 13][i % 8] }));
    changes.append(imported(worse));
    changes.who = 'Rui Tanaka';
    changes.reason = 'A second enamel supplier (invented)';
    expect(changes.propose()).toBe(true);
    if (!changes.evidence?.ok) throw new Error('no evidence');
    // A higher rate gives a higher UCL at every k: ū·k + 3√(ū·k) grows with ū.
    expect(changes.evidence.value.limits.every((l) => l.proposed.ucl > l.approved.ucl)).toBe(true);
    expect(changes.evidence.value.wider).toBe(true);
    expect(changes.evidence.value.warnings.map((w) => w.code)).toContain('wider-limits');
  });

  it('knows who prepared the draft, for the separate-people rule', async () => {
    open(approved);
    changes.append(imported(newShifts));
    changes.who = 'Rui Tanaka';
    changes.reason = 'New burner controls on furnace line 2 (invented)';
    changes.propose();
    const signed = value(
      addSignOff(study.document!, preparer, {
        printedName: 'Rui Tanaka',
        role: 'Engineer',
        meaning: 'prepared',
        now: at(30),
      }),
    );
    study.replaceDocument(signed.study);
    expect(changes.rule.separatePeople).toBe(true);
    expect(changes.preparer?.printedName).toBe('Rui Tanaka');
    expect(changes.draft?.signOffs).toHaveLength(1);
    // The screen says so before the preparer tries to approve; another name, or another meaning, is not stopped.
    expect(changes.separateRolesRefusal(' rui tanaka ', 'approved')).toContain(
      'Rui Tanaka prepared this draft',
    );
    expect(changes.separateRolesRefusal('Dana Okafor', 'approved')).toBeNull();
    expect(changes.separateRolesRefusal('Rui Tanaka', 'reviewed')).toBeNull();
  });
});
