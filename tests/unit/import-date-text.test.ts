import { describe, expect, it } from 'vitest';
import { chooseDateOrder, dateParts, resolveDate } from '../../shared-core/import/date-text.js';

// Calendar facts (Gregorian leap years, month lengths) and the day-first / month-first conventions
// are common practice; ISO 8601 gives the yyyy-mm-dd form.
describe('dates', () => {
  const resolve = (text: string, order?: 'dmy' | 'mdy') => resolveDate(dateParts(text), order);

  it('reads ISO dates and date-times without asking for an order', () => {
    expect(resolve('2026-04-03')).toEqual({ date: '2026-04-03' });
    expect(resolve('2026-4-3 14:30')).toEqual({ date: '2026-04-03T14:30:00' });
    expect(resolve('2026-04-03T00:00')).toEqual({ date: '2026-04-03' });
  });

  it('reads numeric dates in the stated order', () => {
    expect(resolve('03/04/2026', 'dmy')).toEqual({ date: '2026-04-03' });
    expect(resolve('03/04/2026', 'mdy')).toEqual({ date: '2026-03-04' });
    expect(resolve('3.4.2026', 'dmy')).toEqual({ date: '2026-04-03' });
  });

  it('refuses impossible calendar dates', () => {
    expect(resolve('2026-02-29')).toHaveProperty('message');
    expect(resolve('2024-02-29')).toEqual({ date: '2024-02-29' }); // 2024 is a leap year
    expect(resolve('1900-02-29')).toHaveProperty('message'); // 1900 is not (divisible by 100, not 400)
    expect(resolve('31/04/2026', 'dmy')).toHaveProperty('message');
    expect(resolve('13/25/2026', 'dmy')).toHaveProperty('message');
    expect(resolve('2026-04-03 25:00')).toHaveProperty('message');
  });

  it('refuses two-digit years rather than guess the century', () => {
    expect(resolve('03/04/26', 'dmy')).toMatchObject({ message: expect.stringContaining('two-digit year') });
  });

  it('reads workbook dates by their UTC wall-clock value', () => {
    expect(resolveDate(dateParts(new Date(Date.UTC(2026, 3, 3))), undefined)).toEqual({ date: '2026-04-03' });
    expect(resolveDate(dateParts(new Date(Date.UTC(2026, 3, 3, 6))), undefined)).toEqual({
      date: '2026-04-03T06:00:00',
    });
  });

  const cells = (...texts: string[]) =>
    texts.map((text, i) => ({ row: i + 2, column: 'date', text, parts: dateParts(text) }));

  it('detects the order from a day above 12 and names the row that decided it', () => {
    const choice = chooseDateOrder(cells('03/04/2026', '25/04/2026'), undefined);
    expect(choice).toMatchObject({ kind: 'chosen', order: 'dmy', source: 'detected' });
    expect(choice.kind === 'chosen' && choice.reason).toContain('row 3');
    expect(chooseDateOrder(cells('03/04/2026', '04/25/2026'), undefined)).toMatchObject({ order: 'mdy' });
  });

  it('asks about 03/04/2026 when nothing else decides it, never guessing', () => {
    const choice = chooseDateOrder(cells('03/04/2026', '05/06/2026'), undefined);
    expect(choice).toMatchObject({ kind: 'ambiguous', example: { row: 2 } });
    expect(choice.kind === 'ambiguous' && choice.message).toContain('3 April or March 4');
  });

  it('refuses a column written both ways', () => {
    expect(chooseDateOrder(cells('25/04/2026', '04/25/2026'), undefined).kind).toBe('mixed');
  });
});
