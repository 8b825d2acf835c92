import { z } from 'zod';
import {
  ruleIdList,
  type AnalysisOptions,
  type ChartKind,
  type LimitsMethod,
  type RuleId,
} from './analysis-types.js';

/**
 * The zod form of AnalysisOptions (analysis-types.ts), in one place: the method a study records and
 * a revision signs, and (with the caps of settings/method.ts) what the host accepts over a channel.
 */

export const ruleIdSchema = z.enum(ruleIdList) satisfies z.ZodType<RuleId>;
export const limitsMethodSchema = z.enum([
  'sigma',
  'probability',
  'laney',
] as const satisfies readonly LimitsMethod[]);
export const chartKindSchema = z.enum(['c', 'u'] as const satisfies readonly ChartKind[]);

export const methodSchema = z.strictObject({
  chart: chartKindSchema.optional(),
  limits: limitsMethodSchema,
  multiplier: z.number().positive(),
  alpha: z.number().gt(0).lt(1),
  fap: z.number().gt(0).lt(1).optional(),
  knownRate: z.number().positive().optional(),
  rules: z.array(ruleIdSchema),
}) satisfies z.ZodType<AnalysisOptions>;
