import { describe, expect, it } from 'vitest';
import { isoWeek, shiftKey, shiftStartMinutes, weekKey } from '../../shared-core/import/period-key.js';

describe('ISO 8601 weeks', () => {
  // Calendar facts (from memory, checkable on any ISO week calendar): 2026-01-01 is a Thursday, so
  // week 1 of 2026 starts on Monday 2025-12-29; 2021-01-01 is a Friday and falls in week 53 of 2020;
  // 2024-12-30 is a Monday in week 1 of 2025; 2015 has 53 weeks and ends on Thursday 2015-12-31.
  it.each([
    ['2026-01-01', 2026, 1, '2025-12-29'],
    ['2025-12-29', 2026, 1, '2025-12-29'],
    ['2021-01-01', 2020, 53, '2020-12-28'],
    ['2021-01-04', 2021, 1, '2021-01-04'],
    ['2024-12-30', 2025, 1, '2024-12-30'],
    ['2015-12-31', 2015, 53, '2015-12-28'],
    ['2026-03-08', 2026, 10, '2026-03-02'],
  ])('%s is in %i-W%i starting %s', (date, year, week, monday) => {
    expect(isoWeek(date)).toEqual({ year, week, monday });
  });

  it('agrees with the definition "the week that holds January 4 is week 1" for every day of 2000-2040', () => {
    const dayMs = 86_400_000;
    const disagreements: string[] = [];
    for (let ms = Date.UTC(2000, 0, 1); ms < Date.UTC(2041, 0, 1); ms += dayMs) {
      const date = new Date(ms).toISOString().slice(0, 10);
      const { year, week, monday } = isoWeek(date);
      // Independently: the Monday on or before January 4 of `year`, plus (week − 1) weeks, and the
      // date within the 7 days from that Monday.
      const january4 = new Date(Date.UTC(year, 0, 4));
      const firstMonday = Date.UTC(year, 0, 4 - ((january4.getUTCDay() + 6) % 7));
      const start = Date.parse(`${monday}T00:00:00Z`);
      if (start !== firstMonday + (week - 1) * 7 * dayMs || ms < start || ms - start >= 7 * dayMs)
        disagreements.push(date);
    }
    expect(disagreements).toEqual([]);
  });

  it('labels a week as yyyy-Www', () => {
    expect(weekKey('2026-03-08')).toEqual({ label: '2026-W10', start: '2026-03-02' });
  });
});

describe('shifts', () => {
  const starts = shiftStartMinutes(['06:00', '14:00', '22:00'])!;
  it.each([
    ['2026-03-02T06:00:00', '2026-03-02 S1'],
    ['2026-03-02T13:59:00', '2026-03-02 S1'],
    ['2026-03-02T14:00:00', '2026-03-02 S2'],
    ['2026-03-02T23:30:00', '2026-03-02 S3'],
    ['2026-03-03T05:59:00', '2026-03-02 S3'], // the night shift runs past midnight
    ['2026-03-01T02:00:00', '2026-02-28 S3'],
  ])('%s is in shift %s', (dateTime, label) => {
    expect(shiftKey(dateTime, starts)?.label).toBe(label);
  });

  it('needs a time of day', () => {
    expect(shiftKey('2026-03-02', starts)).toBeNull();
  });

  it('refuses shift starts that are not distinct HH:MM times', () => {
    expect(shiftStartMinutes(['06:00', '6:00'])).toBeNull();
    expect(shiftStartMinutes(['25:00'])).toBeNull();
    expect(shiftStartMinutes(['18:00', '06:00'])).toEqual([360, 1080]);
  });
});
