import { ruleCatalog, ruleIds } from '../rules/rule-catalog.js';
import type { RuleId } from '../study/analysis-types.js';

/**
 * Plain-language sentences for the signal rules of DESIGN.md's rule table, so that a reviewer who
 * selects a period reads why it signals without knowing the rule ids. The words live in the rule
 * catalog, beside each rule's definition.
 */
export function ruleInWords(id: string): string {
  return ruleCatalog[id as RuleId]?.words ?? `Rule "${id}" fired.`;
}

/** A short name for each rule, for lists and menus. */
export function ruleName(id: string): string {
  return ruleCatalog[id as RuleId]?.name ?? id;
}

/** Every rule the engine knows, in the order of DESIGN.md's table. */
export const allRuleIds: string[] = ruleIds;
