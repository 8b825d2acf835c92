import { z } from 'zod';
import { ruleIdList, type AnalysisOptions, type RuleId } from './analysis-types.js';

/** The zod form of AnalysisOptions (analysis-types.ts): the method a study records and a revision signs. */

export const ruleIdSchema = z.enum(ruleIdList) satisfies z.ZodType<RuleId>;

export const methodSchema = z.strictObject({
  chart: z.enum(['c', 'u']).optional(),
  limits: z.enum(['sigma', 'probability', 'laney']),
  multiplier: z.number().positive(),
  alpha: z.number().gt(0).lt(1),
  fap: z.number().gt(0).lt(1).optional(),
  knownRate: z.number().positive().optional(),
  rules: z.array(ruleIdSchema),
}) satisfies z.ZodType<AnalysisOptions>;
