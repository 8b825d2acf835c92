import { describe, expect, it } from 'vitest';
import { eventInWords } from '../../shared-core/view/event-in-words.js';
import type { AuditEvent } from '../../shared-core/study/audit-event.js';

const envelope = {
  seq: 3,
  time: '2026-05-03T08:00:00+02:00',
  who: 'engineer',
  prev: '0'.repeat(64),
  hash: '1'.repeat(64),
};

describe('eventInWords for segments', () => {
  it('names a split with its first period and reason', () => {
    const event = {
      ...envelope,
      type: 'split-added',
      why: 'new die installed',
      payload: { index: 8, label: 'W9' },
    };
    expect(eventInWords(event as unknown as AuditEvent)).toEqual({
      action: 'New segment',
      detail: 'from W9, with limits of its own: new die installed',
    });
  });

  it('names a removed split, with its reason when one was given', () => {
    const event = { ...envelope, type: 'split-removed', payload: { index: 8, label: 'W9' } };
    expect(eventInWords(event as unknown as AuditEvent).detail).toBe('W9 no longer starts a segment');
    expect(eventInWords({ ...event, why: 'the change was reverted' } as unknown as AuditEvent).detail).toBe(
      'W9 no longer starts a segment: the change was reverted',
    );
  });

  it('names appended periods by count, file and first period', () => {
    const event = {
      ...envelope,
      type: 'periods-added',
      payload: {
        file: 'june.csv',
        sourceSha256: 'a'.repeat(64),
        firstIndex: 20,
        observationCount: 4,
        observationsSha256: 'b'.repeat(64),
      },
    };
    expect(eventInWords(event as unknown as AuditEvent)).toEqual({
      action: 'Periods added',
      detail: '4 periods from june.csv, from period 21 on',
    });
  });

  it('words the undo of a split by what it took back', () => {
    const split = { ...envelope, type: 'split-added', why: 'new die', payload: { index: 8, label: 'W9' } };
    const undo = { ...envelope, seq: 4, type: 'undo', payload: { target: 3 } };
    expect(eventInWords(undo as unknown as AuditEvent, [split as unknown as AuditEvent]).detail).toBe(
      'takes back entry 3 (new segment)',
    );
  });
});
