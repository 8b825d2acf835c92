import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { localTime } from '../../shared-core/study/local-time.js';

describe('localTime', () => {
  it('writes the local reading with its offset (ISO 8601 / RFC 3339 form)', () => {
    const instant = Date.UTC(2026, 2, 14, 8, 26, 53, 589);
    expect(localTime(instant, 60)).toBe('2026-03-14T09:26:53.589+01:00');
    expect(localTime(instant, -330)).toBe('2026-03-14T02:56:53.589-05:30');
    expect(localTime(instant, 0)).toBe('2026-03-14T08:26:53.589+00:00');
  });

  it('names the same instant, as Date.parse reads it back, for any offset', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 0, max: 4_102_444_800_000 }),
        fc.integer({ min: -12 * 60, max: 14 * 60 }),
        (instant, offset) => {
          expect(Date.parse(localTime(instant, offset))).toBe(instant);
        },
      ),
    );
  });
});
