import { analyzePhaseOne } from '../../shared-core/study/phase-one.js';
import { iterationHistory } from '../../shared-core/study/iteration-history.js';
import type { AnalysisOptions, Exclusion, Observation } from '../../shared-core/study/analysis-types.js';
import type { PacketContent } from '../../src-main/services/packet/packet-content.js';

/**
 * Invented data (not from any plant): solder-bridge counts on panels of boards at a fictional
 * assembly line, with the number of boards inspected varying by shift. Used only to exercise the
 * packet writers; the statistics are checked against the core and against LibreOffice.
 */
export function inventedObservations(periods: number, seed = 7): Observation[] {
  let state = seed;
  const next = () => {
    state = (state * 1103515245 + 12345) % 2147483648;
    return state / 2147483648;
  };
  return Array.from({ length: periods }, (_, i) => {
    const units = [40, 50, 60][Math.floor(next() * 3)]!;
    const mean = units * 0.12;
    // Poisson draw by inversion, enough for invented data.
    let count = 0;
    let p = Math.exp(-mean);
    let cumulative = p;
    const u = next();
    while (u > cumulative) {
      count++;
      p *= mean / count;
      cumulative += p;
    }
    if (i === 5) count += 14; // an invented assignable cause (a mis-set reflow profile)
    return { label: `S${String(i + 1).padStart(3, '0')}`, row: i + 2, count, units };
  });
}

export const sigmaOptions: AnalysisOptions = {
  limits: 'sigma',
  multiplier: 3,
  alpha: 0.0027,
  rules: ['beyond'],
};

export function inventedContent(
  periods = 30,
  options: AnalysisOptions = sigmaOptions,
  observations = inventedObservations(periods),
): PacketContent {
  const exclusions: Exclusion[] = [
    {
      index: 5,
      cause: {
        category: 'Equipment',
        description: 'Reflow profile mis-set after maintenance',
        reference: 'CA-0042',
      },
    },
  ];
  const analysis = analyzePhaseOne(observations, exclusions, options);
  if (!analysis.ok) throw new Error(JSON.stringify(analysis.findings));
  const history = iterationHistory(observations, [[], exclusions], options);
  if (!history.ok) throw new Error(JSON.stringify(history.findings));
  return {
    studyId: 'st-invented-0001',
    title: 'Invented panel PX-200 · wave solder · solder bridges',
    identity: {
      part: 'PX-200 controller panel (invented)',
      processStep: 'Wave solder, line 2',
      characteristic: 'solder bridges',
      inspectionUnit: 'one board',
      owner: 'Invented Electronics Works',
      demo: true,
    },
    source: { file: 'line2-bridges.csv', sha256: 'a'.repeat(64) },
    revision: {
      number: 1,
      status: 'draft',
      effectiveDate: '2026-12-01',
      reviewDate: '2027-06-01',
      reactionPlan:
        '=HYPERLINK("http://example.invalid") Stop the line, quarantine the last two panels, call the process engineer.',
    },
    options,
    result: analysis.value,
    iterations: history.value,
    exclusions: [
      {
        label: observations[5]!.label,
        cause: exclusions[0]!.cause,
        who: 'Rui Tanaka',
        when: '2026-11-20T10:15:00+01:00',
      },
    ],
    signOffs: [],
    audit: [
      {
        seq: 1,
        time: '2026-11-20T09:00:00+01:00',
        who: 'Rui Tanaka',
        what: 'created the study',
        hash: 'b'.repeat(64),
      },
    ],
    generatedAt: '2026-12-01T12:00:00+01:00',
  };
}
