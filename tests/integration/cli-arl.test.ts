import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import poissonCdf from '@stdlib/stats-base-dists-poisson-cdf';
import { runCli, tempFiles } from './helpers/cli.js';

// Invented scenario: weekly counts of solder nonconformities on 50 boards of a made-up product.
const counts = [8, 11, 9, 12, 10, 7, 13, 9, 10, 11, 8, 12];
const dir = tempFiles({
  'weeks.csv': ['week,defects', ...counts.map((c, i) => `W${i + 1},${c}`)].join('\n') + '\n',
  'bad.csv': 'week,defects\nW1,4\nW2,-3\n',
});
const weeks = join(dir, 'weeks.csv');
const flags = ['--count', 'defects', '--label', 'week'];
const center = counts.reduce((a, b) => a + b, 0) / counts.length; // 10 per week

describe('limit-ledger arl', () => {
  it('gives 1/p for the one-point rule, p from @stdlib’s Poisson cdf, in control and after each rise', async () => {
    const run = await runCli(['arl', weeks, ...flags, '--shifts', '1.25,1.5,2', '--json']);
    expect(run.stderr).toBe('');
    expect(run.status).toBe(0);
    const out = JSON.parse(run.stdout);
    expect(out).toMatchObject({ chart: 'c', limits: 'sigma', units: 1, method: 'closed form' });
    expect(out.ucl).toBeCloseTo(center + 3 * Math.sqrt(center), 12);
    expect(out.lcl).toBeCloseTo(center - 3 * Math.sqrt(center), 12); // 0.513: a count of 0 signals low
    const ucl = Math.floor(out.ucl);
    expect(out.curve.map((p: { shift: number }) => p.shift)).toEqual([1, 1.25, 1.5, 2]);
    for (const point of out.curve) {
      const p = 1 - poissonCdf(ucl, point.shift * center) + poissonCdf(0, point.shift * center);
      expect(point.arl).toBeCloseTo(1 / p, 6);
    }
    expect(out.inControlArl).toBe(out.curve[0].arl);
  });

  it('uses the Markov chain for a rule set, and the run lengths fall as the rate rises', async () => {
    const run = await runCli(['arl', weeks, ...flags, '--rules', 'beyond,zone-a,zone-b,run', '--json']);
    expect(run.status).toBe(0);
    const out = JSON.parse(run.stdout);
    expect(out.method).toBe('Markov chain');
    expect(out.rules).toEqual(['beyond', 'zone-a', 'zone-b', 'run:8']);
    const arls = out.curve.map((p: { arl: number }) => p.arl);
    for (let i = 1; i < arls.length; i++) expect(arls[i]).toBeLessThan(arls[i - 1]);
  });

  it('takes probability limits at another k with --at-units', async () => {
    const run = await runCli([
      'arl',
      weeks,
      ...flags,
      '--limits',
      'probability',
      '--at-units',
      '2',
      '--json',
    ]);
    expect(run.status).toBe(0);
    const out = JSON.parse(run.stdout);
    expect(out.units).toBe(2);
    expect(out.curve[0].rate).toBeCloseTo(center, 12);
  });

  it('refuses rules the exact chain cannot follow, bad shifts and bad rows with status 2', async () => {
    const trend = await runCli(['arl', weeks, ...flags, '--rules', 'beyond,trend']);
    expect(trend.status).toBe(2);
    expect(trend.stderr).toMatch(/trend/);
    const shifts = await runCli(['arl', weeks, ...flags, '--shifts', '1.5,x']);
    expect(shifts.status).toBe(2);
    expect(shifts.stderr).toMatch(/--shifts "1\.5,x": "x"/);
    const bad = await runCli(['arl', join(dir, 'bad.csv'), ...flags]);
    expect(bad.status).toBe(2);
    expect(bad.stderr).toMatch(/bad\.csv, row 3, column "defects"/);
  });
});
