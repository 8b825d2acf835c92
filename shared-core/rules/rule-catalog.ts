import { ruleIdList, type RuleId } from '../study/analysis-types.js';
import type { RuleSeries } from './rule-series.js';
import { alternateRule } from './alternate-rule.js';
import { avoidRule } from './avoid-rule.js';
import { beyondRule } from './beyond-rule.js';
import { hugRule } from './hug-rule.js';
import { runRule } from './run-rule.js';
import { trendRule } from './trend-rule.js';
import { zoneARule, zoneBRule } from './zone-rules.js';

export interface RuleDefinition {
  id: RuleId;
  /** A short name for lists and menus. */
  name: string;
  /** What the rule means, as a sentence in plain words, for a person reading why a period signals. */
  words: string;
  source: string;
  firesAt: (series: RuleSeries, t: number) => boolean;
}

const WE = 'Western Electric, Statistical Quality Control Handbook (1956)';
const NELSON = 'Nelson, Journal of Quality Technology 16(4), 1984';

/** The signal rules of DESIGN.md, with their exact definitions (strict inequalities throughout). */
export const ruleCatalog: Record<RuleId, RuleDefinition> = {
  beyond: {
    id: 'beyond',
    name: 'Beyond a limit',
    words: 'The value is beyond its control limit.',
    source: `${WE}; ${NELSON}`,
    firesAt: beyondRule,
  },
  'zone-a': {
    id: 'zone-a',
    name: '2 of 3 beyond 2σ',
    words:
      'Two of the last three periods are more than 2 standard deviations from the center line on the same side.',
    source: `${WE}; ${NELSON}`,
    firesAt: zoneARule,
  },
  'zone-b': {
    id: 'zone-b',
    name: '4 of 5 beyond 1σ',
    words:
      'Four of the last five periods are more than 1 standard deviation from the center line on the same side.',
    source: `${WE}; ${NELSON}`,
    firesAt: zoneBRule,
  },
  'run:8': {
    id: 'run:8',
    name: 'Run of 8',
    words: 'Eight periods in a row lie on the same side of the center line.',
    source: WE,
    firesAt: (series, t) => runRule(series, t, 8),
  },
  'run:9': {
    id: 'run:9',
    name: 'Run of 9',
    words: 'Nine periods in a row lie on the same side of the center line.',
    source: NELSON,
    firesAt: (series, t) => runRule(series, t, 9),
  },
  trend: {
    id: 'trend',
    name: 'Trend of 6',
    words: 'Six periods in a row rise steadily or fall steadily.',
    source: NELSON,
    firesAt: (series, t) => trendRule(series, t),
  },
  alternate: {
    id: 'alternate',
    name: '14 alternating',
    words: 'Fourteen periods in a row alternate up and down.',
    source: NELSON,
    firesAt: (series, t) => alternateRule(series, t),
  },
  hug: {
    id: 'hug',
    name: '15 within 1σ',
    words: 'Fifteen periods in a row lie within 1 standard deviation of the center line.',
    source: NELSON,
    firesAt: (series, t) => hugRule(series, t),
  },
  avoid: {
    id: 'avoid',
    name: '8 beyond 1σ, both sides',
    words: 'Eight periods in a row lie more than 1 standard deviation from the center line, on both sides.',
    source: NELSON,
    firesAt: (series, t) => avoidRule(series, t),
  },
};

export const ruleIds: RuleId[] = [...ruleIdList];

/**
 * Reads a rule list such as `beyond,zone-a,run:9`; `run` alone means `run:8` and `all` every rule
 * (with `run:8`). Returns the unknown names when there are any.
 */
export function parseRuleList(text: string): { rules: RuleId[] } | { unknown: string[] } {
  const names = text
    .split(',')
    .map((name) => name.trim())
    .filter((name) => name !== '');
  const rules: RuleId[] = [];
  const unknown: string[] = [];
  for (const name of names) {
    if (name === 'all') rules.push(...ruleIds.filter((id) => id !== 'run:9'));
    else if (name === 'run') rules.push('run:8');
    else if (name in ruleCatalog) rules.push(name as RuleId);
    else unknown.push(name);
  }
  return unknown.length > 0 ? { unknown } : { rules: [...new Set(rules)] };
}
