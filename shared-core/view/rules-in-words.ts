/**
 * Plain-language sentences for the signal rules of DESIGN.md's rule table, so that a reviewer who
 * selects a period reads why it signals without knowing the rule ids.
 */
const sentences: Record<string, string> = {
  beyond: 'The value is beyond its control limit.',
  'zone-a':
    'Two of the last three periods are more than 2 standard deviations from the center line on the same side.',
  'zone-b':
    'Four of the last five periods are more than 1 standard deviation from the center line on the same side.',
  'run:8': 'Eight periods in a row lie on the same side of the center line.',
  'run:9': 'Nine periods in a row lie on the same side of the center line.',
  trend: 'Six periods in a row rise steadily or fall steadily.',
  alternate: 'Fourteen periods in a row alternate up and down.',
  hug: 'Fifteen periods in a row lie within 1 standard deviation of the center line.',
  avoid: 'Eight periods in a row lie more than 1 standard deviation from the center line, on both sides.',
};

/** A short name for each rule, for lists and menus. */
const names: Record<string, string> = {
  beyond: 'Beyond a limit',
  'zone-a': '2 of 3 beyond 2σ',
  'zone-b': '4 of 5 beyond 1σ',
  'run:8': 'Run of 8',
  'run:9': 'Run of 9',
  trend: 'Trend of 6',
  alternate: '14 alternating',
  hug: '15 within 1σ',
  avoid: '8 beyond 1σ, both sides',
};

export function ruleInWords(id: string): string {
  return sentences[id] ?? `Rule "${id}" fired.`;
}

export function ruleName(id: string): string {
  return names[id] ?? id;
}

/** Every rule the engine knows, in the order of DESIGN.md's table. */
export const allRuleIds = Object.keys(names);
