import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { deriveState } from '../../shared-core/study/study-state.js';
import { formatStudy, parseStudy } from '../../shared-core/study/study-text.js';
import type { Study } from '../../shared-core/study/study-schema.js';
import { verifyStudy } from '../../shared-core/study/verify-study.js';
import { runCli, tempFiles } from './helpers/cli.js';
import { approvedDemoStudy } from './fixtures/approved-demo.js';

const now = (minute: number) => `2026-11-21T08:${String(minute).padStart(2, '0')}:00.000+01:00`;
let approved: Study;

beforeAll(async () => {
  approved = await approvedDemoStudy('st-propose-cli', now);
});

// Invented new shifts of 40 panels after the approved history.
const newCsv = 'shift,blemishes,panels\nN-01,1,40\nN-02,0,40\nN-03,2,40\nN-04,1,40\nN-05,0,40\nN-06,1,40\n';

describe('limit-ledger propose', () => {
  it('appends the new periods, splits there and drafts a change revision with its reason, saved in place', async () => {
    const dir = tempFiles({ 'door.ledger': formatStudy(approved), 'new.csv': newCsv });
    const file = join(dir, 'door.ledger');
    const run = await runCli([
      'propose',
      file,
      '--add',
      join(dir, 'new.csv'),
      '--count',
      'blemishes',
      '--units',
      'panels',
      '--label',
      'shift',
      '--reason-category',
      'process-change',
      '--reason',
      'new sealer nozzle',
      '--who',
      'Rui Tanaka',
    ]);
    expect(run.stderr).toBe('');
    expect(run.status).toBe(0);
    expect(run.stdout).toMatch(/6 new period\(s\) added/);
    expect(run.stdout).toMatch(/revision 2 drafted/);
    const parsed = parseStudy(readFileSync(file, 'utf8'), file);
    if (!parsed.ok) throw new Error(parsed.findings[0].message);
    const study = parsed.value.study;
    expect(verifyStudy(study).filter((p) => p.level === 'error')).toEqual([]);
    const first = approved.observations.length;
    expect(deriveState(study).splits.map((s) => s.index)).toEqual([first]);
    expect(study.revisions.at(-1)).toMatchObject({
      status: 'draft',
      supersedes: 'rev-1',
      reasonCategory: 'process-change',
      reasonForChange: 'new sealer nozzle',
      segmentStart: first,
      included: ['N-01', 'N-02', 'N-03', 'N-04', 'N-05', 'N-06'],
    });
  });

  it('names what is missing: a reason, a category, new periods', async () => {
    const dir = tempFiles({ 'door.ledger': formatStudy(approved) });
    const file = join(dir, 'door.ledger');
    const base = ['propose', file, '--who', 'Rui Tanaka'];
    const noReason = await runCli([...base, '--reason-category', 'process-change']);
    expect(noReason.status).toBe(2);
    expect(noReason.stderr).toMatch(/--reason/);
    const badCategory = await runCli([...base, '--reason-category', 'whim', '--reason', 'x']);
    expect(badCategory.stderr).toMatch(/process-change, trial-limits-ended/);
    const nothingNew = await runCli([...base, '--reason-category', 'process-change', '--reason', 'x']);
    expect(nothingNew.status).toBe(2);
    expect(nothingNew.stderr).toMatch(/no periods after the approved revision/);
  });
});
