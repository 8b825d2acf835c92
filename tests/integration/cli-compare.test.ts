import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { runCli, tempFiles } from './helpers/cli.js';

// E. B. Andersen (1977) lung cancer data, ages 55–59, Scandinavian Journal of Statistics 4: cases
// and person-years of Fredericia against the three other cities. Printed comparison (from memory):
// rate ratio 1.971488, 95 % interval 0.8584264 to 4.2772659, exact conditional p = 0.07967.
const dir = tempFiles({
  'others.csv': 'city,cases,years\nHorsens,6,1083\nKolding,8,1050\nVejle,7,878\n',
  'fredericia.csv': 'city,cases,years\nFredericia,11,800\n',
  'bad.csv': 'city,cases,years\nA,3,10\nB,2.5,10\nC,4,0\n',
  // Invented counts that vary far more than Poisson counts do.
  'spread.csv': 'lot,count,units\nL1,2,10\nL2,40,10\nL3,3,10\nL4,38,10\nL5,1,10\nL6,45,10\n',
});
const path = (name: string) => join(dir, name);
const flags = ['--count', 'cases', '--units', 'years', '--label', 'city'];

describe('limit-ledger compare', () => {
  it('prints the ratio, its exact interval and p-value with both samples (--json)', async () => {
    const run = await runCli(['compare', path('others.csv'), path('fredericia.csv'), ...flags, '--json']);
    expect(run.stderr).toBe('');
    expect(run.status).toBe(0);
    const out = JSON.parse(run.stdout);
    expect(out.ratio).toBeCloseTo(1.971488, 6);
    expect(out.ciLow).toBeCloseTo(0.8584264, 6);
    expect(out.ciHigh).toBeCloseTo(4.2772659, 6);
    expect(out.pValue).toBeCloseTo(0.07967, 5);
    expect(out.base).toMatchObject({ count: 21, units: 3011, periods: 3 });
    expect(out.new).toMatchObject({ count: 11, units: 800, periods: 1 });
    expect(out.rejected).toEqual([]);
  });

  it('prints a short report without --json', async () => {
    const run = await runCli(['compare', path('others.csv'), path('fredericia.csv'), ...flags]);
    expect(run.status).toBe(0);
    expect(run.stdout).toMatch(/Rate ratio new\/base: 1\.971, 95 % interval 0\.8584 to 4\.277/);
  });

  it('stops with status 2 naming the file, row and column of every bad cell', async () => {
    const run = await runCli(['compare', path('others.csv'), path('bad.csv'), ...flags, '--json']);
    expect(run.status).toBe(2);
    expect(run.stderr).toMatch(/bad\.csv, row 3, column "cases": "2\.5"/);
    expect(run.stderr).toMatch(/bad\.csv, row 4, column "years"/);
    expect(run.stdout).toBe('');
  });

  it('with --skip-invalid compares the rest and lists each left-out row with its file', async () => {
    const run = await runCli([
      'compare',
      path('others.csv'),
      path('bad.csv'),
      ...flags,
      '--skip-invalid',
      '--json',
    ]);
    expect(run.status).toBe(0);
    const out = JSON.parse(run.stdout);
    expect(out.new).toMatchObject({ count: 3, units: 10 });
    expect(out.rejected.map((r: { file: string; row: number }) => [r.file, r.row])).toEqual([
      ['bad.csv', 3],
      ['bad.csv', 4],
    ]);
  });

  it('says that the test is optimistic when a sample is over-dispersed', async () => {
    const run = await runCli([
      'compare',
      path('spread.csv'),
      path('spread.csv'),
      '--count',
      'count',
      '--units',
      'units',
      '--json',
    ]);
    expect(run.status).toBe(0);
    const out = JSON.parse(run.stdout);
    expect(out.ratio).toBe(1);
    expect(out.pValue).toBe(1);
    expect(out.warnings.map((w: { code: string }) => w.code)).toContain('test-optimistic');
  });

  it('refuses a wrong number of files and a bad confidence with status 2', async () => {
    const one = await runCli(['compare', path('others.csv'), ...flags]);
    expect(one.status).toBe(2);
    expect(one.stderr).toMatch(/name two data files/);
    const conf = await runCli([
      'compare',
      path('others.csv'),
      path('fredericia.csv'),
      ...flags,
      '--confidence',
      '95',
    ]);
    expect(conf.status).toBe(2);
    expect(conf.stderr).toMatch(/--confidence "95"/);
  });
});
