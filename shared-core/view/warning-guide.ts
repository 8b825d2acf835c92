import type { AnalysisOptions } from '../study/analysis-types.js';

/** What the Checks screen offers for one warning of the core: a plain title and, where one helps, a one-click remedy. */
export interface WarningGuide {
  title: string;
  remedy?: { label: string; options: Partial<AnalysisOptions> };
}

const guides: Record<string, WarningGuide> = {
  'few-periods': { title: 'Short baseline' },
  'many-excluded': { title: 'Many periods excluded' },
  'no-lower-limit': { title: 'No lower control limit' },
  'rare-events': { title: 'Rare events' },
  'over-dispersion': {
    title: 'More variation than the Poisson model',
    remedy: { label: 'Use Laney u′ limits', options: { limits: 'laney' } },
  },
  'under-dispersion': { title: 'Less variation than the Poisson model' },
  'chi-square-approximation': { title: 'Dispersion check is approximate' },
  'laney-narrower': { title: 'Laney limits narrower than Poisson' },
  'phase-one-fap': {
    title: 'High Phase I false-alarm probability',
    remedy: {
      label: 'Use probability limits with a 5 % Phase I false-alarm probability',
      options: { limits: 'probability', fap: 0.05 },
    },
  },
  'imprecise-rate': { title: 'Rate only loosely pinned' },
  'known-rate': { title: 'Known rate in use' },
};

export function warningGuide(code: string): WarningGuide {
  return guides[code] ?? { title: code.replace(/-/g, ' ') };
}
