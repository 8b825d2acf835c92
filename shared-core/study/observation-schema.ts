import { z } from 'zod';
import type { Observation } from './analysis-types.js';

/** The zod form of an Observation (analysis-types.ts), as the study document stores it. */
export const observationSchema = z.strictObject({
  label: z.string(),
  row: z.number().int().positive(),
  rows: z.tuple([z.number().int().positive(), z.number().int().positive()]).optional(),
  count: z.number().int().nonnegative(),
  units: z.number().positive().finite(),
  date: z.string().optional(),
  categories: z.record(z.string(), z.number().int().nonnegative()).optional(),
}) satisfies z.ZodType<Observation>;
