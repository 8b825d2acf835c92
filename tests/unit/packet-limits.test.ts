import { describe, expect, it } from 'vitest';
import { limitsCsv, limitsTable, neutralizeCell } from '../../src-main/services/packet/limits-table.js';
import { analyzePhaseOne } from '../../shared-core/study/phase-one.js';

describe('CSV cells a spreadsheet would run', () => {
  it('get a leading apostrophe when they start with = + - @ tab or CR (OWASP, CSV injection)', () => {
    for (const lead of ['=', '+', '-', '@', '\t', '\r'])
      expect(neutralizeCell(`${lead}SUM(A1)`)).toBe(`'${lead}SUM(A1)`);
    expect(neutralizeCell('plain words')).toBe('plain words');
  });

  it('are neutralized and quoted in the limits CSV', () => {
    const observations = [4, 6, 5, 7].map((count, i) => ({
      label: `P${i}`,
      row: i + 2,
      count,
      units: i % 2 ? 20 : 10,
    }));
    const result = analyzePhaseOne(observations, [], {
      limits: 'sigma',
      multiplier: 3,
      alpha: 0.0027,
      rules: ['beyond'],
    });
    if (!result.ok) throw new Error('analysis failed');
    const csv = limitsCsv(result.value, '=cmd|"/c calc"!A1');
    expect(csv).toContain(`"'=cmd|""/c calc""!A1"`);
    expect(csv.split('\r\n')[0]).toBe('units,lcl,ucl,center,chart,limits,inspection_unit');
  });
});

describe('the limits table', () => {
  it('lists each k once with the limits of ū ± 3√(ū/k) (Montgomery, ch. 7, u chart)', () => {
    const observations = [4, 6, 5, 7].map((count, i) => ({
      label: `P${i}`,
      row: i + 2,
      count,
      units: i % 2 ? 20 : 10,
    }));
    const result = analyzePhaseOne(observations, [], {
      limits: 'sigma',
      multiplier: 3,
      alpha: 0.0027,
      rules: ['beyond'],
    });
    if (!result.ok) throw new Error('analysis failed');
    const table = limitsTable(result.value);
    expect(table.map((r) => r.units)).toEqual([10, 20]);
    const rate = 22 / 60;
    for (const row of table) {
      const expected = rate + 3 * Math.sqrt(rate / row.units);
      expect(row.ucl).toBeCloseTo(expected, 12);
      expect(row.lcl).toBeNull(); // ū − 3√(ū/k) < 0 for these k
    }
  });
});
