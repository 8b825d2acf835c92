import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  appendEvent,
  chainHead,
  eventHash,
  sealHeader,
  sealStudy,
} from '../../shared-core/study/audit-chain.js';
import { exclude, addNote, correct } from '../../shared-core/study/study-state.js';
import { verifyStudy } from '../../shared-core/study/verify-study.js';
import type { Study } from '../../shared-core/study/study-schema.js';
import type { Revision } from '../../shared-core/study/revision-schema.js';
import type { Result } from '../../shared-core/result.js';
import { at, fullStudy, sampleStudy } from '../integration/fixtures/study-sample.js';

const value = <T>(result: Result<T>): T => {
  if (!result.ok) throw new Error(result.findings.map((finding) => finding.message).join('; '));
  return result.value;
};
const who = 'A. Tester';

/** A study of 10 events: created, imported, then decisions. */
function tenEvents(): Study {
  let study = sampleStudy();
  study = value(
    exclude(study, { who, index: 1, cause: { category: 'Method', description: 'gun nozzle worn' } }, at(1)),
  );
  study = value(addNote(study, { who, index: 4, text: 'new powder lot from here' }, at(2)));
  study = value(
    correct(study, { who, index: 6, field: 'units', value: 30, reason: 'tally sheet says 30' }, at(3)),
  );
  for (let i = 0; i < 5; i++) study = value(addNote(study, { who, index: i, text: `check ${i}` }, at(4 + i)));
  return study;
}

const clone = (study: Study): Study => structuredClone(study);
const errors = (study: Study) =>
  verifyStudy(study)
    .filter((problem) => problem.level === 'error')
    .map((problem) => `${problem.code}@${problem.seq}`);

function revisionAt(study: Study, seq: number): Revision {
  return {
    id: 'rev-1',
    number: 1,
    status: 'approved',
    method: study.method,
    center: 0.21,
    limits: [{ units: 20, lcl: null, ucl: 0.52 }],
    included: ['L001'],
    excluded: [],
    chainHead: study.events[seq - 1].hash,
    signOffs: [],
  };
}

describe('tampering with a study is detected', () => {
  it('an untouched study verifies', () => {
    expect(verifyStudy(tenEvents())).toEqual([]);
  });

  it('a changed event is named by its seq', () => {
    for (let seq = 1; seq <= 10; seq++) {
      const study = clone(tenEvents());
      study.events[seq - 1].who = 'Someone Else';
      expect(errors(study)).toContain(`hash-mismatch@${seq}`);
    }
  });

  it('a changed event whose hash was recomputed is named through the next link', () => {
    for (let seq = 2; seq <= 9; seq++) {
      const study = clone(tenEvents());
      const event = study.events[seq - 1];
      event.why = 'edited later';
      event.hash = eventHash(event);
      expect(errors(study)).toContain(`broken-link@${seq}`);
    }
  });

  it('a removed event is reported missing', () => {
    for (let seq = 3; seq <= 9; seq++) {
      const study = clone(tenEvents());
      study.events.splice(seq - 1, 1);
      expect(errors(study)).toEqual(expect.arrayContaining([`missing-event@${seq + 1}`, 'truncated@null']));
    }
  });

  it('two swapped events are reported as reordered', () => {
    for (let seq = 3; seq <= 9; seq++) {
      const study = clone(tenEvents());
      [study.events[seq - 1], study.events[seq]] = [study.events[seq], study.events[seq - 1]];
      const found = errors(study);
      expect(found).toContain(`reordered@${seq + 1}`);
      expect(found.filter((code) => code.startsWith('broken-link'))).toEqual([]);
    }
  });

  it('a truncated chain shows through the header count', () => {
    const study = clone(tenEvents());
    study.events.length = 7;
    expect(errors(study)).toEqual(['truncated@null']);
    expect(verifyStudy(study)[0].message).toMatch(/records 10 events but the file holds 7/);
  });

  it('a truncated chain with a rewritten header shows through the head a revision anchored', () => {
    const signed = sealStudy({ ...tenEvents(), revisions: [revisionAt(tenEvents(), 9)] });
    expect(verifyStudy(signed)).toEqual([]);
    const truncated = clone(signed);
    truncated.events.length = 8;
    truncated.header = sealHeader(truncated);
    expect(errors(truncated)).toEqual(['anchor-missing@null']);
  });

  it('a signed study truncated before its sign-off, header rewritten, names the signed revision', () => {
    const signed = fullStudy();
    expect(verifyStudy(signed)).toEqual([]);
    const anchor = signed.events.findIndex((event) => event.hash === signed.revisions[0].chainHead);
    const truncated = clone(signed);
    truncated.events.length = anchor;
    truncated.header = sealHeader(truncated);
    const problems = verifyStudy(truncated).filter((problem) => problem.code === 'anchor-missing');
    expect(problems.map((problem) => problem.message)).toEqual([
      expect.stringMatching(/^revision 1 with 1 sign-off\(s\) is anchored/),
    ]);
  });

  it('a chain moved to another study is not bound to its id', () => {
    const study = clone(tenEvents());
    study.id = 'another-study';
    study.header = sealHeader(study);
    expect(errors(study)).toEqual(expect.arrayContaining(['not-bound@1']));
  });

  it('a changed identity or revision shows through the sealed header', () => {
    const edits: ((study: Study) => void)[] = [
      (study) => (study.identity.part = 'another part'),
      (study) => (study.revisions = [revisionAt(study, 9)]),
      (study) => (study.siteSettings = { logo: 'x' }),
    ];
    for (const edit of edits) {
      const study = clone(tenEvents());
      edit(study);
      expect(errors(study)).toContain('content-mismatch@null');
    }
  });

  it('changed observations, source, import settings or method show against what the chain recorded', () => {
    const edits: ((study: Study) => void)[] = [
      (study) => (study.observations[3].count += 1),
      (study) => study.observations.pop(),
      (study) => (study.source.sha256 = 'b'.repeat(64)),
      (study) => (study.source.importSettings.delimiter = ';'),
      (study) => (study.method.multiplier = 2),
    ];
    for (const edit of edits) {
      const study = clone(tenEvents());
      edit(study);
      study.header = sealHeader(study);
      expect(errors(study).some((code) => /import-mismatch|method-mismatch/.test(code))).toBe(true);
    }
  });

  it('time going backwards is flagged as a warning, and the event is still recorded', () => {
    const study = appendEvent(
      tenEvents(),
      { type: 'note-added', who, payload: { index: 0, label: 'L001', text: 'late' } },
      at(0),
    );
    const problems = verifyStudy(study);
    expect(problems).toEqual([
      expect.objectContaining({ level: 'warning', code: 'time-backwards', seq: 11 }),
    ]);
    expect(chainHead(study)).toBe(study.events[10].hash);
  });

  // A changed seq is named by its new number, a rehashed event through the next link: hence seq ± 1.
  it('any change to any leaf of any event is detected at that event', () => {
    const base = tenEvents();
    const leaves: { seq: number; path: (string | number)[] }[] = [];
    const walk = (node: unknown, path: (string | number)[], seq: number) => {
      if (node !== null && typeof node === 'object') {
        for (const [key, child] of Object.entries(node))
          walk(child, [...path, Array.isArray(node) ? Number(key) : key], seq);
      } else leaves.push({ seq, path });
    };
    base.events.forEach((event) => walk(event, [], event.seq));
    fc.assert(
      fc.property(fc.integer({ min: 0, max: leaves.length - 1 }), (pick) => {
        const { seq, path } = leaves[pick];
        const study = clone(base);
        let parent = study.events[seq - 1] as unknown as Record<string | number, unknown>;
        for (const key of path.slice(0, -1)) parent = parent[key] as Record<string | number, unknown>;
        const key = path.at(-1)!;
        const old = parent[key];
        parent[key] = typeof old === 'number' ? old + 1 : typeof old === 'boolean' ? !old : `${String(old)}x`;
        const found = errors(study);
        const named = found.some((code) => [seq - 1, seq, seq + 1].some((near) => code.endsWith(`@${near}`)));
        expect(named, `${path.join('.')} of event ${seq}: ${found.join(', ')}`).toBe(true);
      }),
      { numRuns: 300 },
    );
  });
});
