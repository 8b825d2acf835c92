import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { runCli, tempFiles } from './helpers/cli.js';

// Montgomery, Introduction to Statistical Quality Control, printed circuit board example (counts
// from memory): c̄ = 19.85, samples 6 and 20 beyond the 3-sigma limits; revised c̄ = 19.67.
const boardCounts = [
  21, 24, 16, 12, 15, 5, 28, 20, 31, 25, 20, 24, 16, 19, 10, 17, 13, 22, 18, 39, 30, 24, 16, 19, 17, 15,
];
const boardsCsv = ['sample,defects', ...boardCounts.map((c, i) => `S${i + 1},${c}`)].join('\n') + '\n';

const dir = tempFiles({
  'boards.csv': boardsCsv,
  'bad.csv': 'lot,count,units\nA,3,10\nB,2.5,10\nC,-1,10\nD,4,0\nE,,10\nF,x,10\nG,5,10\n',
  'cloth.csv': 'roll,defects,units\n1,14,10\n2,12,8\n3,20,13\n',
  'repeat.csv': 'shift,count\nday,4\nnight,6\nday,5\n',
  'exclusions.csv':
    'label,category,description,reference\nS6,inspection,new inspector missed defects,CA-17\n',
});
const boards = join(dir, 'boards.csv');

async function analyzeJson(args: string[]) {
  const run = await runCli(['analyze', ...args, '--json']);
  expect(run.stderr).toBe('');
  expect(run.status).toBe(0);
  return JSON.parse(run.stdout);
}

describe('limit-ledger analyze --json (the contract of DESIGN.md)', () => {
  it('prints one object with the contract fields, types and the two signals', async () => {
    const out = await analyzeJson([boards, '--count', 'defects', '--label', 'sample']);
    expect(out.chart).toBe('c');
    expect(out.limits).toBe('sigma');
    expect(out.center).toBeCloseTo(516 / 26, 12);
    expect(out.sigmaZ).toBeNull();
    expect(out.periods).toHaveLength(26);
    for (const p of out.periods) {
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
      expect(typeof p.z).toBe('number');
    }
    expect(out.periods[5]).toMatchObject({
      label: 'S6',
      row: 7,
      count: 5,
      status: 'signal',
      rules: ['beyond'],
    });
    expect(out.periods[19]).toMatchObject({ label: 'S20', row: 21, count: 39, status: 'signal' });
    expect(out.stable).toBe(false);
    expect(Object.keys(out.dispersion)).toEqual(
      expect.arrayContaining(['statistic', 'df', 'pOver', 'pUnder']),
    );
    expect(out.dispersion.df).toBe(25);
    expect(Array.isArray(out.warnings)).toBe(true);
    expect(out.rejected).toEqual([]);
    expect(out.import.sha256).toMatch(/^[0-9a-f]{64}$/);
  });

  it('excludes by label and by #ROW, with the cause, and recomputes (revised c̄ = 19.67)', async () => {
    const out = await analyzeJson([
      boards,
      '--count',
      'defects',
      '--label',
      'sample',
      '--exclude',
      'S6=inspection: new inspector',
      '--exclude',
      '#21=temperature control in wave soldering',
    ]);
    expect(out.center).toBeCloseTo(472 / 24, 12);
    expect(out.periods[5]).toMatchObject({
      status: 'excluded',
      rules: [],
      cause: { category: 'inspection', description: 'new inspector' },
    });
    expect(out.periods[19].cause).toEqual({
      category: 'unspecified',
      description: 'temperature control in wave soldering',
    });
    expect(out.stable).toBe(true);
    expect(out.iterations).toHaveLength(2);
    expect(out.iterations[0].signals).toEqual(['S6', 'S20']);
    expect(out.iterations[1].excluded).toEqual(['S6', 'S20']);
  });

  it('reads exclusions from a table', async () => {
    const out = await analyzeJson([
      boards,
      '--count',
      'defects',
      '--label',
      'sample',
      '--exclusions',
      join(dir, 'exclusions.csv'),
    ]);
    expect(out.periods[5].cause).toEqual({
      category: 'inspection',
      description: 'new inspector missed defects',
      reference: 'CA-17',
    });
  });

  it('computes probability and Laney limits on request', async () => {
    const probability = await analyzeJson([boards, '--count', 'defects', '--limits', 'probability']);
    expect(probability.limits).toBe('probability');
    expect(Number.isInteger(probability.periods[0].ucl)).toBe(true);
    const laney = await analyzeJson([boards, '--count', 'defects', '--limits', 'laney', '--chart', 'u']);
    expect(laney.chart).toBe('u');
    expect(laney.sigmaZ).toBeGreaterThan(0);
  });
});

describe('limit-ledger analyze: bad input', () => {
  it('stops with status 2 and lists every bad row with file, row and column', async () => {
    const run = await runCli([
      'analyze',
      join(dir, 'bad.csv'),
      '--count',
      'count',
      '--units',
      'units',
      '--label',
      'lot',
    ]);
    expect(run.status).toBe(2);
    expect(run.stdout).toBe('');
    for (const [row, column, value] of [
      [3, 'count', '2.5'],
      [4, 'count', '-1'],
      [5, 'units', '0'],
      [7, 'count', 'x'],
    ])
      expect(run.stderr).toContain(`bad.csv, row ${row}, column "${column}": "${value}"`);
    expect(run.stderr).toContain('bad.csv, row 6, column "count": the cell is blank');
  });

  it('--skip-invalid analyses the rest and lists each left-out row under rejected', async () => {
    const out = await analyzeJson([
      join(dir, 'bad.csv'),
      '--count',
      'count',
      '--units',
      'units',
      '--label',
      'lot',
      '--skip-invalid',
    ]);
    expect(out.periods.map((p: { label: string }) => p.label)).toEqual(['A', 'G']);
    expect(out.rejected.map((r: { row: number }) => r.row).sort()).toEqual([3, 4, 5, 6, 7]);
    for (const r of out.rejected) expect(Object.keys(r)).toEqual(['row', 'column', 'value', 'message']);
  });

  it('refuses a c chart when k varies, an unknown label, and an ambiguous one', async () => {
    const cloth = join(dir, 'cloth.csv');
    const c = await runCli(['analyze', cloth, '--count', 'defects', '--units', 'units', '--chart', 'c']);
    expect(c.status).toBe(2);
    expect(c.stderr).toMatch(/same number of inspection units/);

    const unknown = await runCli([
      'analyze',
      boards,
      '--count',
      'defects',
      '--label',
      'sample',
      '--exclude',
      'S99=x',
    ]);
    expect(unknown.status).toBe(2);
    expect(unknown.stderr).toMatch(/no period is labelled "S99"/);

    const repeat = join(dir, 'repeat.csv');
    const ambiguous = await runCli([
      'analyze',
      repeat,
      '--count',
      'count',
      '--label',
      'shift',
      '--exclude',
      'day=x',
    ]);
    expect(ambiguous.status).toBe(2);
    expect(ambiguous.stderr).toMatch(/names 2 periods; name one by its row: #2, #4/);
  });

  it('names a missing column and the file', async () => {
    const run = await runCli(['analyze', boards, '--count', 'faults']);
    expect(run.status).toBe(2);
    expect(run.stderr).toMatch(/boards\.csv/);
    expect(run.stderr).toMatch(/faults/);
  });
});

describe('limit-ledger', () => {
  it('--help lists the commands', async () => {
    const run = await runCli(['--help']);
    expect(run.status).toBe(0);
    expect(run.stdout).toMatch(/analyze/);
  });

  it('prints a readable table and the verdict without --json', async () => {
    const run = await runCli(['analyze', boards, '--count', 'defects', '--label', 'sample']);
    expect(run.status).toBe(0);
    expect(run.stdout).toMatch(/verdict: not stable/);
    expect(run.stdout).toMatch(/signal at S20 \(row 21\)/);
  });
});
