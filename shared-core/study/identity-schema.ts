import { z } from 'zod';

/**
 * What the study is about, as the packet's cover shows it. Fields may be empty while a study is
 * being set up; the sign-off step asks for them.
 */
export const identitySchema = z.strictObject({
  /** Product or part (name and number). */
  part: z.string(),
  processStep: z.string(),
  /** The nonconformity being counted, e.g. "solder bridges". */
  characteristic: z.string(),
  /** The inspection unit as the user defines it, e.g. "one board" or "50 m² of cloth". */
  inspectionUnit: z.string(),
  owner: z.string(),
  site: z.string().optional(),
  /** True when the data are invented (demo studies): every output says so. */
  demo: z.boolean().optional(),
});

export type StudyIdentity = z.infer<typeof identitySchema>;
