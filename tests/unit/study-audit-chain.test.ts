import { describe, expect, it } from 'vitest';
import { appendEvent, genesisHash, verifyChain } from '../../shared-core/study/audit-chain.js';
import { canonicalJson } from '../../shared-core/study/canonical-json.js';
import { sha256Hex } from '../../shared-core/study/sha256.js';
import { studySchema, type Study } from '../../shared-core/study/study-schema.js';
import type { EventDraft } from '../../shared-core/study/audit-event.js';
import { at, sampleStudy } from '../integration/fixtures/study-sample.js';

const exclusion = (index: number): EventDraft => ({
  type: 'excluded',
  who: 'A. Tester',
  payload: {
    index,
    label: `L${String(index + 1).padStart(3, '0')}`,
    cause: { category: 'Material', description: 'wet powder lot' },
  },
});

function studyWithEvents(count: number): Study {
  let study = sampleStudy();
  for (let i = 0; i < count; i++) study = appendEvent(study, exclusion(i), at(i + 1));
  return study;
}

describe('the audit chain', () => {
  it('binds the first event to the study id and links every event to the one before', () => {
    const study = studyWithEvents(3);
    expect(study.events[0].prev).toBe(sha256Hex(canonicalJson({ study: study.id })));
    expect(study.events[0].prev).toBe(genesisHash(study.id));
    for (let i = 1; i < study.events.length; i++) expect(study.events[i].prev).toBe(study.events[i - 1].hash);
    expect(study.events.map((event) => event.seq)).toEqual([1, 2, 3, 4, 5]);
    expect(study.header.eventCount).toBe(5);
    expect(study.header.chainHead).toBe(study.events[4].hash);
    expect(verifyChain(study)).toEqual([]);
    expect(studySchema.safeParse(study).success).toBe(true);
  });

  it('hashes an event as SHA-256 of its canonical JSON without the hash (checked with node:crypto)', async () => {
    const { createHash } = await import('node:crypto');
    const { hash, ...rest } = studyWithEvents(1).events[2];
    expect(hash).toBe(createHash('sha256').update(canonicalJson(rest), 'utf8').digest('hex'));
  });

  it('leaves the study it was given unchanged', () => {
    const study = sampleStudy();
    const before = JSON.stringify(study);
    appendEvent(study, exclusion(0), at(1));
    expect(JSON.stringify(study)).toBe(before);
  });
});
