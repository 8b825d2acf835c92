/**
 * Schemas of the analysis method (chart, limits, multiplier, α, rules), shared by the channel table
 * and the site settings. They mirror the types of shared-core/study/analysis-types.ts; the
 * `satisfies` clauses keep the two in step.
 */
import { z } from 'zod';
import {
  ruleIdList,
  type AnalysisOptions,
  type ChartKind,
  type LimitsMethod,
} from '../study/analysis-types.js';

export const ruleIds = ruleIdList;

export const RuleIdSchema = z.enum(ruleIds);
export const LimitsMethodSchema = z.enum([
  'sigma',
  'probability',
  'laney',
] as const satisfies readonly LimitsMethod[]);
export const ChartKindSchema = z.enum(['c', 'u'] as const satisfies readonly ChartKind[]);

export const AnalysisOptionsSchema = z.object({
  chart: ChartKindSchema.optional(),
  limits: LimitsMethodSchema,
  multiplier: z.number().positive().max(10),
  alpha: z.number().gt(0).lt(1),
  fap: z.number().gt(0).lt(1).optional(),
  knownRate: z.number().positive().finite().optional(),
  rules: z.array(RuleIdSchema).max(ruleIds.length),
});

// Compile-time proof that a parsed value is an AnalysisOptions.
const _sameShape: (value: z.output<typeof AnalysisOptionsSchema>) => AnalysisOptions = (value) => value;
