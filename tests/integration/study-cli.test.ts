import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { openStudyFile } from '../../src-main/services/study-file.js';
import { deriveState } from '../../shared-core/study/study-state.js';
import { demoCauses, demoNotes, demoObservations } from '../../shared-core/study/demo-scenario.js';
import { sha256Hex } from '../../shared-core/study/sha256.js';

const root = resolve(dirname(fileURLToPath(import.meta.url)), '..', '..');
const cli = (...args: string[]) =>
  spawnSync(process.execPath, [join(root, 'bin', 'limit-ledger.js'), ...args], { encoding: 'utf8' });

describe('study commands (built CLI)', () => {
  it('limit-ledger demo --out writes the invented demo study, labelled invented, and will not overwrite', async () => {
    const folder = mkdtempSync(join(tmpdir(), 'll-demo-'));
    const out = join(folder, 'demo.ledger');
    const first = cli('demo', '--out', out);
    expect(first.stderr).toBe('');
    expect(first.status).toBe(0);
    expect(first.stdout).toMatch(/Invented demo data/);
    const opened = await openStudyFile(out);
    if (!opened.ok) throw new Error(opened.findings[0].message);
    const { study, problems } = opened.value;
    expect(problems).toEqual([]);
    expect(study.identity.demo).toBe(true);
    expect(study.identity.site).toMatch(/invented/);
    expect(study.observations).toEqual(demoObservations);
    expect(deriveState(study).notes.map((note) => note.text)).toEqual(demoNotes.map((note) => note.text));
    expect(demoNotes.every((note) => /invented/.test(note.text))).toBe(true);

    const again = cli('demo', '--out', out);
    expect(again.status).toBe(2);
    expect(again.stderr).toMatch(/already exists.*--force/s);
    expect(cli('demo', '--out', out, '--force').status).toBe(0);
    expect(readFileSync(`${out}.bak`, 'utf8')).toMatch(/"demo": true/);
    expect(cli('demo').status).toBe(2);
    rmSync(folder, { recursive: true, force: true });
  });

  it('limit-ledger analyze --save records the import, each exclusion with its cause, and the iterations', async () => {
    const folder = mkdtempSync(join(tmpdir(), 'll-save-'));
    const data = join(folder, 'panels.csv');
    const csv =
      ['shift,panels,blemishes', ...demoObservations.map((o) => `${o.label},${o.units},${o.count}`)].join(
        '\n',
      ) + '\n';
    writeFileSync(data, csv);
    const study = join(folder, 'panels.ledger');
    const { category, description } = demoCauses[0].cause;
    const exclusions = join(folder, 'exclusions.csv');
    writeFileSync(exclusions, `label,category,description,reference\nS23,Material,grit in frit,CA-0419\n`);
    const run = cli(
      'analyze',
      data,
      '--count',
      'blemishes',
      '--units',
      'panels',
      '--label',
      'shift',
      '--exclude',
      `S11=${category}: ${description}`,
      '--exclusions',
      exclusions,
      '--json',
      '--save',
      study,
    );
    expect(run.stderr).toBe('');
    expect(run.status).toBe(0);
    const json = JSON.parse(run.stdout);
    const opened = await openStudyFile(study);
    if (!opened.ok) throw new Error(opened.findings[0].message);
    const saved = opened.value.study;
    expect(opened.value.problems).toEqual([]);
    expect(saved.source.file).toBe('panels.csv');
    expect(saved.source.sha256).toBe(sha256Hex(csv));
    expect(saved.observations.map((o) => o.count)).toEqual(demoObservations.map((o) => o.count));
    expect(deriveState(saved).exclusions).toEqual([
      { index: 10, cause: { category, description } },
      { index: 22, cause: { category: 'Material', description: 'grit in frit', reference: 'CA-0419' } },
    ]);
    const iterations = saved.events.filter((event) => event.type === 'iteration');
    expect(iterations.length).toBeGreaterThanOrEqual(1);
    const last = iterations.at(-1)!;
    expect(last.type === 'iteration' && last.payload.center).toBeCloseTo(json.center, 12);
    expect(last.type === 'iteration' && last.payload.excluded).toEqual(['S11', 'S23']);

    const refused = cli('analyze', data, '--count', 'blemishes', '--units', 'panels', '--save', study);
    expect(refused.status).toBe(2);
    expect(refused.stderr).toMatch(/already exists/);
    rmSync(folder, { recursive: true, force: true });
  });
});
