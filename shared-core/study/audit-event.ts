import { z } from 'zod';
import { identitySchema } from './identity-schema.js';
import { methodSchema } from './method-schema.js';
import { localTimeSchema, sha256HexSchema } from './field-schemas.js';

/**
 * One decision in a study's audit chain: who did what, when, and why. Events are append-only; each
 * carries the hash of the one before it (`prev`) and its own (`hash`), see audit-chain.ts.
 */

const seqSchema = z.number().int().positive();
const indexSchema = z.number().int().nonnegative();

export const causeSchema = z.strictObject({
  category: z.string().trim().min(1, 'an assignable cause needs a category'),
  description: z.string().trim().min(1, 'an assignable cause needs a description'),
  reference: z.string().trim().min(1).optional(),
});

const envelope = {
  seq: seqSchema,
  who: z.string().min(1),
  /** The local clock's reading when the event was recorded. */
  time: localTimeSchema,
  /** Labels `time` as the local clock's: nothing vouches for it beyond the recording computer. */
  clock: z.literal('local'),
  why: z.string().optional(),
  prev: sha256HexSchema,
  hash: sha256HexSchema,
};

const revisionPayload = z.looseObject({ revisionId: z.string().min(1) });

export const auditEventSchema = z.discriminatedUnion('type', [
  /** The first event: binds the study id (and so the whole chain) to this study. */
  z.strictObject({
    ...envelope,
    type: z.literal('created'),
    payload: z.strictObject({ studyId: z.string().min(1), identity: identitySchema, method: methodSchema }),
  }),
  /** The history came in: binds the source file's hash and the observations as stored. */
  z.strictObject({
    ...envelope,
    type: z.literal('imported'),
    payload: z.strictObject({
      file: z.string(),
      sourceSha256: sha256HexSchema,
      observationCount: z.number().int().nonnegative(),
      /** SHA-256 of the canonical JSON of the study's `observations`. */
      observationsSha256: sha256HexSchema,
      /** SHA-256 of the canonical JSON of { importSettings, importReport }. */
      importSha256: sha256HexSchema,
    }),
  }),
  z.strictObject({
    ...envelope,
    type: z.literal('excluded'),
    payload: z.strictObject({ index: indexSchema, label: z.string(), cause: causeSchema }),
  }),
  z.strictObject({
    ...envelope,
    type: z.literal('reinstated'),
    payload: z.strictObject({ index: indexSchema, label: z.string() }),
  }),
  /** A mistyped value put right: the original stays in the observations, the reason is required. */
  z.strictObject({
    ...envelope,
    type: z.literal('corrected'),
    why: z.string().trim().min(1, 'a correction needs a reason'),
    payload: z.strictObject({
      index: indexSchema,
      label: z.string(),
      field: z.enum(['count', 'units', 'date']),
      original: z.union([z.number(), z.string(), z.null()]),
      value: z.union([z.number(), z.string()]),
    }),
  }),
  /** The history starts a new segment with its own limits at period `index` (a known process change). */
  z.strictObject({
    ...envelope,
    type: z.literal('split-added'),
    why: z.string().trim().min(1, 'a new segment needs the reason the process changed'),
    payload: z.strictObject({ index: indexSchema.min(1), label: z.string() }),
  }),
  z.strictObject({
    ...envelope,
    type: z.literal('split-removed'),
    payload: z.strictObject({ index: indexSchema.min(1), label: z.string() }),
  }),
  /** New periods appended after the history: binds their source and the appended observations. */
  z.strictObject({
    ...envelope,
    type: z.literal('periods-added'),
    payload: z.strictObject({
      file: z.string(),
      sourceSha256: sha256HexSchema,
      firstIndex: indexSchema,
      observationCount: z.number().int().positive(),
      /** SHA-256 of the canonical JSON of the appended observations only. */
      observationsSha256: sha256HexSchema,
    }),
  }),
  z.strictObject({
    ...envelope,
    type: z.literal('method-changed'),
    payload: z.strictObject({ from: methodSchema, to: methodSchema }),
  }),
  z.strictObject({
    ...envelope,
    type: z.literal('note-added'),
    payload: z.strictObject({ index: indexSchema, label: z.string(), text: z.string().trim().min(1) }),
  }),
  /** Compensates the decision `target` (its seq); the decision itself stays on record. */
  z.strictObject({ ...envelope, type: z.literal('undo'), payload: z.strictObject({ target: seqSchema }) }),
  /** Compensates the undo event `target` (its seq), putting the decision back in force. */
  z.strictObject({ ...envelope, type: z.literal('redo'), payload: z.strictObject({ target: seqSchema }) }),
  /** A snapshot of one recomputation: what was excluded and what the limits were. */
  z.strictObject({
    ...envelope,
    type: z.literal('iteration'),
    payload: z.strictObject({
      number: z.number().int().positive(),
      excluded: z.array(z.string()),
      center: z.number(),
      /** Limits at k̄ on the plotted scale; null: no lower limit. */
      lcl: z.number().nullable(),
      ucl: z.number(),
      signals: z.array(z.string()),
    }),
  }),
  /** The document was brought forward from an older schema; the former hashes are kept. */
  z.strictObject({
    ...envelope,
    type: z.literal('migrated'),
    payload: z.strictObject({
      fromVersion: z.number().int().nonnegative(),
      toVersion: z.number().int().positive(),
      formerHashes: z.array(sha256HexSchema),
    }),
  }),
  z.strictObject({ ...envelope, type: z.literal('revision-drafted'), payload: revisionPayload }),
  z.strictObject({ ...envelope, type: z.literal('revision-changed'), payload: revisionPayload }),
  z.strictObject({ ...envelope, type: z.literal('revision-approved'), payload: revisionPayload }),
  z.strictObject({ ...envelope, type: z.literal('revision-voided'), payload: revisionPayload }),
  z.strictObject({ ...envelope, type: z.literal('signed'), payload: revisionPayload }),
]);

export type AuditEvent = z.infer<typeof auditEventSchema>;
export type AuditEventType = AuditEvent['type'];
export type EventOf<T extends AuditEventType> = Extract<AuditEvent, { type: T }>;

type DistributiveOmit<T, K extends PropertyKey> = T extends unknown ? Omit<T, K> : never;

/** What a caller supplies; the chain fills in seq, time, clock, prev and hash. */
export type EventDraft = DistributiveOmit<AuditEvent, 'seq' | 'time' | 'clock' | 'prev' | 'hash'>;

/** Decisions that undo and redo act on. */
export const undoableTypes = [
  'excluded',
  'reinstated',
  'corrected',
  'method-changed',
  'note-added',
  'split-added',
  'split-removed',
] as const;
export type UndoableEvent = EventOf<(typeof undoableTypes)[number]>;

export function isUndoable(event: AuditEvent): event is UndoableEvent {
  return (undoableTypes as readonly string[]).includes(event.type);
}
