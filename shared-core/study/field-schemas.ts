import { z } from 'zod';
import { sha256Pattern } from './sha256.js';

/** Field shapes shared by the study document's schemas. */

/** An ISO 8601 date-time with its offset from UTC: the reading of the local clock. */
export const localTimeSchema = z.iso.datetime({
  offset: true,
  message: 'expected an ISO date-time with offset',
});

/** An ISO 8601 calendar date (yyyy-mm-dd). */
export const isoDateSchema = z.iso.date();

export const sha256HexSchema = z.string().regex(sha256Pattern, 'expected 64 lowercase hex digits (SHA-256)');

/** Any JSON value: what import settings and reports may hold until their own schemas land. */
export const jsonValueSchema = z.json();
export const jsonObjectSchema = z.record(z.string(), jsonValueSchema);
export type JsonObject = z.infer<typeof jsonObjectSchema>;

/** `events[3].payload.cause` from zod's ['events', 3, 'payload', 'cause']. */
export function fieldPath(path: readonly PropertyKey[]): string {
  return (
    path
      .map((part, i) => (typeof part === 'number' ? `[${part}]` : `${i > 0 ? '.' : ''}${String(part)}`))
      .join('') || '(the document)'
  );
}
