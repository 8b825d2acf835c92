import { z } from 'zod';
import { appendEvent, sealStudy } from './audit-chain.js';
import { canonicalJson } from './canonical-json.js';
import { sha256Hex } from './sha256.js';
import { fieldPath } from './field-schemas.js';
import { currentSchemaVersion, type Study } from './study-schema.js';
import { fail, ok, type Result } from '../result.js';
import type { AuditEvent } from './audit-event.js';

/**
 * Brings a study written by an older version forward, one version at a time. Each step checks the
 * old document by its own rules first: a migration never hides a break (an old chain that does not
 * verify is refused, with the event named, and the file is left as it was).
 *
 * Version 0 (the early draft format): the identity's inspection unit was called `unitName`; events
 * had no `prev` link and no clock label, each hashed on its own; there was no header.
 * Version 1: the linked chain of audit-chain.ts and the sealed header.
 */
export function migrateStudy(raw: unknown, fromVersion: number): Result<unknown> {
  let document = raw;
  for (let version = fromVersion; version < currentSchemaVersion; version++) {
    const step = steps[version];
    if (!step)
      return fail({
        message: `field "schemaVersion": version ${version} is not one this program can bring forward`,
      });
    const next = step(document);
    if (!next.ok) return next;
    document = next.value;
  }
  return ok(document);
}

const versionZeroEvent = z.looseObject({
  seq: z.number().int().positive(),
  type: z.string(),
  who: z.string(),
  time: z.string(),
  why: z.string().optional(),
  payload: z.record(z.string(), z.unknown()),
  hash: z.string(),
});

const versionZero = z.looseObject({
  schemaVersion: z.literal(0),
  id: z.string().min(1),
  identity: z.looseObject({ unitName: z.string() }),
  events: z.array(versionZeroEvent).min(1),
  revisions: z.array(z.unknown()).optional(),
});

const steps: Record<number, (document: unknown) => Result<unknown>> = {
  0: fromVersionZero,
};

function fromVersionZero(document: unknown): Result<unknown> {
  const parsed = versionZero.safeParse(document);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    return fail({ message: `field "${fieldPath(issue.path)}": ${issue.message} (version 0 study)` });
  }
  const old = parsed.data;
  for (const event of old.events) {
    const { hash, ...content } = event;
    if (sha256Hex(canonicalJson(content)) !== hash) {
      return fail({
        message: `event ${event.seq} (${event.type}) of this version 0 study was changed after it was recorded; it cannot be brought forward without hiding that`,
      });
    }
  }

  const { unitName, ...identity } = old.identity;
  const renamed = { ...identity, inspectionUnit: unitName };
  let study = sealStudy({
    ...(old as unknown as Omit<Study, 'header' | 'events'>),
    schemaVersion: 1,
    identity: renamed as Study['identity'],
    revisions: (old.revisions ?? []) as Study['revisions'],
    events: [],
  });
  for (const event of old.events) {
    const { seq: _seq, hash: _hash, time, ...draft } = event;
    const payload =
      event.type === 'created'
        ? { ...draft.payload, identity: renameUnit(draft.payload.identity) }
        : draft.payload;
    study = appendEvent(study, { ...draft, payload } as never, time);
  }
  const last = old.events.at(-1) as AuditEvent | undefined;
  return ok(
    appendEvent(
      study,
      {
        type: 'migrated',
        who: 'Limit Ledger',
        why: 'brought forward from schema version 0: the chain is relinked; the former hashes are kept here',
        payload: { fromVersion: 0, toVersion: 1, formerHashes: old.events.map((event) => event.hash) },
      },
      last?.time ?? '1970-01-01T00:00:00.000+00:00',
    ),
  );
}

function renameUnit(identity: unknown): unknown {
  if (typeof identity !== 'object' || identity === null || !('unitName' in identity)) return identity;
  const { unitName, ...rest } = identity as Record<string, unknown>;
  return { ...rest, inspectionUnit: unitName };
}
