/**
 * The analysis method as the channel table and the site settings accept it: the study's method
 * schema (study/method-schema.ts) with the caps an interactive request must keep (a multiplier
 * of at most 10, a finite known rate, each rule at most once).
 */
import { z } from 'zod';
import { ruleIdList, type AnalysisOptions } from '../study/analysis-types.js';
import { chartKindSchema, limitsMethodSchema, methodSchema, ruleIdSchema } from '../study/method-schema.js';

export const ruleIds = ruleIdList;

export const RuleIdSchema = ruleIdSchema;
export const LimitsMethodSchema = limitsMethodSchema;
export const ChartKindSchema = chartKindSchema;

export const AnalysisOptionsSchema = methodSchema.extend({
  multiplier: z.number().positive().max(10),
  knownRate: z.number().positive().finite().optional(),
  rules: z.array(RuleIdSchema).max(ruleIds.length),
});

// Compile-time proof that a parsed value is an AnalysisOptions.
const _sameShape: (value: z.output<typeof AnalysisOptionsSchema>) => AnalysisOptions = (value) => value;
