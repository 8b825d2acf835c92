import { sha256Hex } from './sha256.js';
import { newStudy } from './new-study.js';
import { addNote } from './study-state.js';
import { defaultOptions, type AssignableCause, type Observation } from './analysis-types.js';
import type { StudyIdentity } from './identity-schema.js';
import type { Study } from './study-schema.js';

/**
 * The demo: an INVENTED scenario, so that a new user has something to review straight away. The
 * plant, the part, the people and every count are made up (drawn once from a Poisson model at 0.15
 * blemishes per panel, then two shifts raised by hand); nothing here is real data.
 *
 * Wrenfield Enamel Works fires vitreous enamel onto oven-door panels. One inspection unit is one
 * door panel; each period is one shift. Two assignable causes are planted: a burner flame-out in
 * shift S11 and a contaminated frit lot that shows in shift S23, with notes that say so.
 */

export const demoLabel = 'Invented demo data: Wrenfield Enamel Works is not a real plant';

export const demoIdentity: StudyIdentity = {
  part: 'WF-310 oven door, outer panel (invented)',
  processStep: 'Enamel firing, furnace line 2',
  characteristic: 'surface blemishes (pinholes, specks, chips)',
  inspectionUnit: 'one door panel',
  owner: 'R. Okafor (invented)',
  site: 'Wrenfield Enamel Works (invented)',
  demo: true,
};

const panels = [
  48, 42, 50, 58, 39, 40, 55, 41, 49, 56, 39, 54, 44, 39, 40, 51, 51, 40, 45, 40, 55, 51, 39, 56, 41, 45, 58,
  58, 56, 39,
];
const blemishes = [
  6, 6, 3, 13, 5, 6, 12, 4, 4, 10, 21, 4, 9, 6, 2, 2, 3, 6, 6, 3, 9, 13, 17, 11, 7, 11, 10, 6, 9, 7,
];

/** One shift a day from Monday 2 February 2026 (an invented calendar). */
const shiftDate = (index: number): string =>
  new Date(Date.UTC(2026, 1, 2 + index)).toISOString().slice(0, 10);

export const demoObservations: Observation[] = panels.map((units, index) => ({
  label: `S${String(index + 1).padStart(2, '0')}`,
  row: index + 2,
  count: blemishes[index],
  units,
  date: shiftDate(index),
}));

/** The notes the shift leaders attached (invented). */
export const demoNotes: { index: number; text: string }[] = [
  {
    index: 10,
    text: 'Burner 3 flamed out at 02:40 and was relit at 03:15; furnace zone 2 ran cold (invented)',
  },
  { index: 18, text: 'New frit supplier lot FR-2207 in use from this shift (invented)' },
  { index: 22, text: 'Grit found in frit lot FR-2207, bag 4; bag quarantined at end of shift (invented)' },
];

/** The assignable causes the demo plants, for a user (or a test) to record as exclusions. */
export const demoCauses: { index: number; cause: AssignableCause }[] = [
  {
    index: 10,
    cause: {
      category: 'Equipment',
      description: 'burner 3 flame-out, zone 2 under temperature',
      reference: 'CA-0412 (invented)',
    },
  },
  {
    index: 22,
    cause: {
      category: 'Material',
      description: 'grit in frit lot FR-2207, bag 4',
      reference: 'CA-0419 (invented)',
    },
  },
];

/** The demo history as the CSV a user could import (it carries the invented label too). */
export function demoCsv(): string {
  const lines = demoObservations.map((o) => `${o.label},${o.date},${o.units},${o.count}`);
  return [`# ${demoLabel}`, 'shift,date,panels,blemishes', ...lines].join('\n') + '\n';
}

/** The demo as a study: created, imported, and the three notes (no exclusion yet: that is the user's job). */
export function demoStudy(input: { id: string; who: string; now: string }): Study {
  let study = newStudy({
    id: input.id,
    identity: demoIdentity,
    source: {
      file: 'wrenfield-door-panels-invented.csv',
      sha256: sha256Hex(demoCsv()),
      importSettings: { count: 'blemishes', units: 'panels', label: 'shift', date: 'date', invented: true },
      importReport: {
        rowsRead: panels.length,
        accepted: panels.length,
        rejected: [],
        changedCells: [],
        note: demoLabel,
      },
    },
    observations: demoObservations,
    method: { ...defaultOptions, chart: 'u' },
    who: input.who,
    now: input.now,
  });
  for (const note of demoNotes) {
    const next = addNote(study, { who: input.who, ...note }, input.now);
    if (next.ok) study = next.value;
  }
  return study;
}
