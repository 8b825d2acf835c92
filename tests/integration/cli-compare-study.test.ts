import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import poissonCdf from '@stdlib/stats-base-dists-poisson-cdf';
import { appendEvent, sealStudy } from '../../shared-core/study/audit-chain.js';
import { newStudy } from '../../shared-core/study/new-study.js';
import { deriveState, exclude } from '../../shared-core/study/study-state.js';
import { formatStudy } from '../../shared-core/study/study-text.js';
import { analyzePhaseOne } from '../../shared-core/study/phase-one.js';
import { defaultOptions, type Observation } from '../../shared-core/study/analysis-types.js';
import type { Study } from '../../shared-core/study/study-schema.js';
import { runCli, tempFiles } from './helpers/cli.js';

// Invented scenario: a made-up plant counts surface scratches on lots of 40 panels.
const counts = [6, 9, 7, 5, 8, 10, 6, 7, 30, 8, 6, 9, 7, 8, 5, 7, 9, 6, 8, 7];
const observations: Observation[] = counts.map((count, i) => ({
  label: `LOT${i + 1}`,
  row: i + 2,
  count,
  units: 40,
}));
const at = (minute: number) => `2026-05-04T08:${String(minute).padStart(2, '0')}:00.000+01:00`;
const must = <T>(result: { ok: true; value: T } | { ok: false; findings: { message: string }[] }): T => {
  if (!result.ok) throw new Error(result.findings[0].message);
  return result.value;
};

/** A study whose revision 1 is approved with LOT9 excluded; LOT3 is excluded only after approval. */
function approvedStudy(): Study {
  let study = newStudy({
    id: '0c7d2a9e-1b1e-4f55-9a51-7d0d5a1e2b03',
    identity: {
      part: 'Invented panel P-12',
      processStep: 'Lacquer',
      characteristic: 'scratches',
      inspectionUnit: 'one panel',
      owner: 'E. Example',
    },
    source: {
      file: 'invented-lots.csv',
      sha256: 'b'.repeat(64),
      importSettings: { delimiter: ',', count: 'scratches', units: 'panels' },
      importReport: { rows: counts.length, rejected: [] },
    },
    observations,
    method: { ...defaultOptions, rules: ['beyond', 'run:8'] },
    who: 'E. Example',
    now: at(0),
  });
  study = must(
    exclude(
      study,
      { who: 'E. Example', index: 8, cause: { category: 'Material', description: 'damaged crate' } },
      at(1),
    ),
  );
  const state = deriveState(study);
  const analysis = must(analyzePhaseOne(state.observations, state.exclusions, state.method));
  study = appendEvent(
    study,
    { type: 'revision-drafted', who: 'E. Example', payload: { revisionId: 'r1' } },
    at(2),
  );
  study = sealStudy({
    ...study,
    revisions: [
      {
        id: 'r1',
        number: 1,
        status: 'approved',
        reasonForChange: 'initial baseline',
        method: state.method,
        center: analysis.center,
        limits: [{ units: 40, lcl: analysis.periods[0].lcl, ucl: analysis.periods[0].ucl }],
        included: analysis.periods.filter((p) => p.status !== 'excluded').map((p) => p.label),
        excluded: ['LOT9'],
        chainHead: study.events.at(-1)!.hash,
        signOffs: [],
      },
    ],
  });
  study = appendEvent(
    study,
    { type: 'revision-approved', who: 'F. Example', payload: { revisionId: 'r1' } },
    at(3),
  );
  return must(
    exclude(
      study,
      { who: 'E. Example', index: 2, cause: { category: 'Method', description: 'trial' } },
      at(4),
    ),
  );
}

const unapproved = { ...approvedStudy(), revisions: [] };
const dir = tempFiles({
  'panels.ledger': formatStudy(approvedStudy()),
  'draft.ledger': formatStudy(sealStudy(unapproved)),
  'new.csv': 'lot,scratches,panels\nN1,9,40\nN2,25,40\nN3,8,40\nN4,11,40\n',
});
writeFileSync(join(dir, 'notes.txt'), 'not a study');
const path = (name: string) => join(dir, name);
const flags = ['--count', 'scratches', '--units', 'panels', '--label', 'lot'];
// The approved baseline: every lot but LOT9 (LOT3 was excluded only after approval).
const baseCount = counts.reduce((a, b) => a + b, 0) - 30;
const baseUnits = 19 * 40;
const rate = baseCount / baseUnits;

describe('a study as the baseline: its latest approved revision', () => {
  it('compare takes the included periods of the approved revision as BASE', async () => {
    const run = await runCli(['compare', path('panels.ledger'), path('new.csv'), ...flags, '--json']);
    expect(run.stderr).toBe('');
    expect(run.status).toBe(0);
    const out = JSON.parse(run.stdout);
    expect(out.base).toMatchObject({ revision: 1, count: baseCount, units: baseUnits, periods: 19 });
    expect(out.new).toMatchObject({ count: 53, units: 160 });
    expect(out.ratio).toBeCloseTo(53 / 160 / rate, 12);
  });

  it('arl gives 1/p of the approved limits for its one-point rule, p from @stdlib', async () => {
    const run = await runCli(['arl', path('panels.ledger'), '--rules', 'beyond', '--shifts', '2', '--json']);
    expect(run.status).toBe(0);
    const out = JSON.parse(run.stdout);
    expect(out.revision).toBe(1);
    expect(out.units).toBe(40);
    const mean = rate * 40;
    const ucl = Math.floor(mean + 3 * Math.sqrt(mean));
    const lastLow = Math.ceil(mean - 3 * Math.sqrt(mean)) - 1;
    const p = (m: number) => 1 - poissonCdf(ucl, m) + (lastLow >= 0 ? poissonCdf(lastLow, m) : 0);
    expect(out.curve[0].arl).toBeCloseTo(1 / p(mean), 6);
    expect(out.curve[1].arl).toBeCloseTo(1 / p(2 * mean), 9);
  });

  it('arl uses the revision’s own rules and refuses data-file flags with a study', async () => {
    const run = await runCli(['arl', path('panels.ledger'), '--json']);
    const out = JSON.parse(run.stdout);
    expect(out.rules).toEqual(['beyond', 'run:8']);
    expect(out.method).toBe('Markov chain');
    const flagged = await runCli(['arl', path('panels.ledger'), '--limits', 'probability']);
    expect(flagged.status).toBe(2);
    expect(flagged.stderr).toMatch(/--limits: a study's approved revision fixes its method/);
  });

  it('check judges new periods against the approved limits without recomputing', async () => {
    const run = await runCli(['check', path('panels.ledger'), path('new.csv'), ...flags, '--json']);
    expect(run.stderr).toBe('');
    expect(run.status).toBe(0);
    const out = JSON.parse(run.stdout);
    expect(out.revision.number).toBe(1);
    expect(out.center).toBeCloseTo(rate * 40, 12);
    const ucl = rate * 40 + 3 * Math.sqrt(rate * 40);
    for (const p of out.periods) {
      expect(p.ucl).toBeCloseTo(ucl, 12);
      expect(Object.keys(p)).toEqual(
        expect.arrayContaining([
          'label',
          'row',
          'count',
          'units',
          'rate',
          'lcl',
          'ucl',
          'z',
          'status',
          'rules',
        ]),
      );
    }
    expect(out.signals).toEqual(['N2']);
    expect(out.periods[1]).toMatchObject({ label: 'N2', row: 3, status: 'signal', rules: ['beyond'] });
  });

  it('refuses a study without an approved revision, and a data file where a study is needed', async () => {
    const draft = await runCli(['compare', path('draft.ledger'), path('new.csv'), ...flags]);
    expect(draft.status).toBe(2);
    expect(draft.stderr).toMatch(/draft\.ledger: the study has no approved revision/);
    const notStudy = await runCli(['check', path('new.csv'), path('new.csv'), ...flags]);
    expect(notStudy.status).toBe(2);
    expect(notStudy.stderr).toMatch(/name a study \(\.ledger\)/);
  });
});
