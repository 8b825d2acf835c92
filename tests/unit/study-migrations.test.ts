import { describe, expect, it } from 'vitest';
import { canonicalJson } from '../../shared-core/study/canonical-json.js';
import { sha256Hex } from '../../shared-core/study/sha256.js';
import { parseStudy } from '../../shared-core/study/study-text.js';
import { deriveState, exclude } from '../../shared-core/study/study-state.js';
import { verifyStudy } from '../../shared-core/study/verify-study.js';
import type { Study } from '../../shared-core/study/study-schema.js';
import { at, sampleStudy } from '../integration/fixtures/study-sample.js';

/** The early draft format (version 0): `unitName`, events hashed one by one, no links, no header. */
function versionZero(study: Study) {
  const rename = ({ inspectionUnit, ...rest }: Study['identity']) => ({ ...rest, unitName: inspectionUnit });
  const events = study.events.map(({ prev: _prev, hash: _hash, clock: _clock, ...event }) => {
    const payload =
      event.type === 'created'
        ? { ...event.payload, identity: rename(event.payload.identity) }
        : event.payload;
    const content = { ...event, payload };
    return { ...content, hash: sha256Hex(canonicalJson(content)) };
  });
  const { header: _header, ...rest } = study;
  return { ...rest, schemaVersion: 0, identity: rename(study.identity), events };
}

function decided(): Study {
  const result = exclude(
    sampleStudy(),
    { who: 'A. Tester', index: 2, cause: { category: 'Tooling', description: 'worn die' } },
    at(5),
  );
  if (!result.ok) throw new Error('setup');
  return result.value;
}

describe('migrations', () => {
  it('brings a version 0 study forward: unitName becomes inspectionUnit, the chain is linked, the old hashes kept', () => {
    const old = versionZero(decided());
    const parsed = parseStudy(JSON.stringify(old));
    if (!parsed.ok) throw new Error(parsed.findings[0].message);
    const { study, migratedFrom } = parsed.value;
    expect(migratedFrom).toBe(0);
    expect(study.schemaVersion).toBe(1);
    expect(study.identity.inspectionUnit).toBe('one bracket');
    expect(study.identity).not.toHaveProperty('unitName');
    expect(verifyStudy(study)).toEqual([]);
    const last = study.events.at(-1)!;
    expect(last).toMatchObject({
      type: 'migrated',
      seq: 4,
      time: old.events[2].time,
      payload: { fromVersion: 0, toVersion: 1 },
    });
    expect(last.type === 'migrated' && last.payload.formerHashes).toEqual(
      old.events.map((event) => event.hash),
    );
    expect(deriveState(study).exclusions).toEqual([
      { index: 2, cause: { category: 'Tooling', description: 'worn die' } },
    ]);
  });

  it('refuses to bring forward a version 0 study whose events were changed, naming the event', () => {
    const old = versionZero(decided());
    old.events[2].who = 'Someone Else';
    const parsed = parseStudy(JSON.stringify(old), 'old.ledger');
    expect(parsed.ok).toBe(false);
    expect(!parsed.ok && parsed.findings[0]).toMatchObject({
      file: 'old.ledger',
      message: expect.stringMatching(/^event 3 \(excluded\)/),
    });
  });

  it('names the field when a version 0 study lacks one', () => {
    const old = versionZero(decided()) as Record<string, unknown>;
    delete (old.identity as Record<string, unknown>).unitName;
    const parsed = parseStudy(JSON.stringify(old));
    expect(!parsed.ok && parsed.findings[0].message).toMatch(/field "identity\.unitName"/);
  });
});
