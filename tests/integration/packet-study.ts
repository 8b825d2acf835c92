import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { demoCauses, demoStudy } from '../../shared-core/study/demo-scenario.js';
import { exclude } from '../../shared-core/study/study-state.js';
import type { Study } from '../../shared-core/study/study-schema.js';
import { formatStudy } from '../../shared-core/study/study-text.js';
import { addSignOff } from '../../src-main/services/signing/sign-off.js';
import type { SigningIdentity } from '../../src-main/services/signing/signing-identity.js';

/**
 * The invented demo study (an enamel plant that does not exist), with its two planted assignable
 * causes excluded and signed off as prepared and approved by two different keys.
 */
export function signedDemoStudy(preparer: SigningIdentity, approver: SigningIdentity): Study {
  let study = demoStudy({ id: 'st-packet-test', who: 'Rui Tanaka', now: '2026-11-20T09:00:00.000+01:00' });
  for (const [i, { index, cause }] of demoCauses.entries()) {
    const next = exclude(study, { who: 'Rui Tanaka', index, cause }, `2026-11-20T10:0${i}:00.000+01:00`);
    if (!next.ok) throw new Error(JSON.stringify(next.findings));
    study = next.value;
  }
  const prepared = addSignOff(study, preparer, {
    printedName: 'Rui Tanaka',
    role: 'Quality engineer',
    meaning: 'prepared',
    now: '2026-11-21T08:30:00.000+01:00',
    effectiveDate: '2026-12-07',
    reviewDate: '2027-06-07',
    reactionPlan: 'Hold the oven cart, re-inspect the last 20 panels, call the shift lead.',
  });
  if (!prepared.ok) throw new Error(JSON.stringify(prepared.findings));
  const approved = addSignOff(prepared.value.study, approver, {
    printedName: 'Dana Okafor',
    role: 'Quality manager',
    meaning: 'approved',
    now: '2026-11-21T14:05:00.000+01:00',
  });
  if (!approved.ok) throw new Error(JSON.stringify(approved.findings));
  return approved.value.study;
}

export function writeStudy(folder: string, name: string, study: Study): string {
  const path = join(folder, name);
  writeFileSync(path, formatStudy(study));
  return path;
}

export const readText = (path: string) => readFileSync(path, 'utf8');
