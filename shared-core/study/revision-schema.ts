import { z } from 'zod';
import { methodSchema } from './method-schema.js';
import { isoDateSchema, localTimeSchema, sha256HexSchema } from './field-schemas.js';

/**
 * A revision: one set of control limits put forward for approval, and the sign-offs it gathered.
 * The packet and limit-change work fill these; the study document only carries them.
 */

export const signOffMeaningSchema = z.enum(['prepared', 'reviewed', 'approved']);

export const signOffSchema = z.strictObject({
  printedName: z.string().min(1),
  role: z.string().min(1),
  meaning: signOffMeaningSchema,
  time: localTimeSchema,
  certificatePem: z.string().min(1),
  /** SHA-256 hex of the certificate's DER bytes. */
  fingerprint: sha256HexSchema,
  selfIssued: z.boolean(),
  /** Base64 signature over the sign-off bytes (see signed-content.ts). */
  signature: z.string().min(1),
  algorithm: z.literal('RSA-SHA256'),
});

/** Limits for one number of inspection units k, on the plotted scale. */
export const revisionLimitsSchema = z.strictObject({
  units: z.number().positive(),
  lcl: z.number().nullable(),
  ucl: z.number(),
});

export const revisionStatusSchema = z.enum(['draft', 'approved', 'void']);

/** Why limits that were approved are being changed (the four reasons a change may have). */
export const reasonCategorySchema = z.enum([
  'process-change',
  'trial-limits-ended',
  'special-cause',
  'customer-request',
]);

/** Each reason for a change in words, in the order a form offers them. */
export const reasonForChangeList: readonly { id: ReasonCategory; words: string }[] = [
  { id: 'process-change', words: 'The process changed (equipment, material, method or site)' },
  { id: 'trial-limits-ended', words: 'The trial limits ended: enough production to set standing limits' },
  { id: 'special-cause', words: 'The approved limits were distorted by a special cause' },
  { id: 'customer-request', words: 'The customer asked for the limits to be revised' },
];

export const revisionSchema = z.looseObject({
  id: z.string().min(1),
  /** 1, 2, 3… in the order revisions were drafted. */
  number: z.number().int().positive(),
  status: revisionStatusSchema,
  reasonForChange: z.string().optional(),
  reasonCategory: reasonCategorySchema.optional(),
  /** First period (index) the revision's own study covers; absent means the first of the history. */
  segmentStart: z.number().int().nonnegative().optional(),
  /** The approved revision this one would replace: a limit change. */
  supersedes: z.string().min(1).optional(),
  method: methodSchema,
  /** On the plotted scale: ū for a u chart, ū·k for a c chart. */
  center: z.number(),
  limits: z.array(revisionLimitsSchema),
  included: z.array(z.string()),
  excluded: z.array(z.string()),
  effectiveDate: isoDateSchema.optional(),
  reviewDate: isoDateSchema.optional(),
  reactionPlan: z.string().optional(),
  /** The audit chain's head when the revision was put forward: what its sign-offs anchor. */
  chainHead: sha256HexSchema,
  signOffs: z.array(signOffSchema),
});

export type SignOffMeaning = z.infer<typeof signOffMeaningSchema>;
export type SignOff = z.infer<typeof signOffSchema>;
export type RevisionLimits = z.infer<typeof revisionLimitsSchema>;
export type RevisionStatus = z.infer<typeof revisionStatusSchema>;
export type Revision = z.infer<typeof revisionSchema>;
export type ReasonCategory = z.infer<typeof reasonCategorySchema>;
