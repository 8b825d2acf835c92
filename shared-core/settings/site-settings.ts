/**
 * What a site standardises for its studies: the cause categories offered for an exclusion, which
 * sign-off meanings a revision needs and whether they need separate people (told apart by key
 * fingerprint), the default method, the packet's paper size, and the signer certificates it trusts.
 * A study records the settings it was made under, so a later change at the site does not rewrite
 * what an earlier approval meant.
 */
import { z } from 'zod';
import { LimitsMethodSchema, RuleIdSchema } from './method.js';

export const SignOffMeaning = z.enum(['prepared', 'reviewed', 'approved']);
export type SignOffMeaning = z.infer<typeof SignOffMeaning>;

export const TrustedCertificate = z.object({
  /** The name the site knows the signer by. */
  name: z.string().min(1).max(200),
  pem: z
    .string()
    .max(20_000)
    .refine((pem) => pem.includes('-----BEGIN CERTIFICATE-----'), 'a PEM certificate'),
  /** SHA-256 of the DER certificate, hex. */
  fingerprint: z.string().regex(/^[0-9a-f]{64}$/i, 'a SHA-256 fingerprint in hex'),
});

export const SiteSettingsSchema = z.object({
  schema: z.literal(1),
  causeCategories: z.array(z.string().trim().min(1).max(200)).min(1).max(200),
  signOff: z.object({
    required: z.array(SignOffMeaning).min(1).max(3),
    separatePeople: z.boolean(),
  }),
  defaults: z.object({
    limits: LimitsMethodSchema,
    multiplier: z.number().positive().max(10),
    alpha: z.number().gt(0).lt(1),
    rules: z.array(RuleIdSchema).min(1),
  }),
  paperSize: z.enum(['A4', 'Letter']),
  trustedCertificates: z.array(TrustedCertificate).max(500),
});
export type SiteSettings = z.infer<typeof SiteSettingsSchema>;

/**
 * The settings a site starts with: sigma limits at L = 3 with the single "beyond a limit" rule
 * (common practice for a Phase I baseline), prepared and approved by two different people.
 */
export const defaultSiteSettings: SiteSettings = {
  schema: 1,
  causeCategories: ['Material', 'Machine', 'Method', 'Measurement', 'Operator', 'Environment', 'Data entry'],
  signOff: { required: ['prepared', 'approved'], separatePeople: true },
  defaults: { limits: 'sigma', multiplier: 3, alpha: 0.0027, rules: ['beyond'] },
  paperSize: 'A4',
  trustedCertificates: [],
};
