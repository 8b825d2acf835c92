import { canonicalBytes } from './canonical-json.js';
import { observationsHash } from './new-study.js';
import { deriveState } from './study-state.js';
import type { Revision, SignOff } from './revision-schema.js';
import type { Study } from './study-schema.js';

/**
 * THE definition of what a sign-off signs (DESIGN.md, "The record"): the study id, the observations
 * (as imported, and as corrected), the source hashes, the import settings, the method, the
 * exclusions with their causes, the corrections, the results (center and limits), the revision's
 * fields and the chain head it is anchored at. Exclusions and corrections are taken from the chain
 * as it stood at that head, so later decisions never alter what was signed; changing anything
 * before the head changes these bytes and so voids the signatures.
 *
 * A revision's `status` and `signOffs` are left out: approving a revision must not void it.
 */
export function signedContent(study: Study, revision: Revision) {
  const state = deriveState(study, revision.chainHead);
  const { signOffs: _signOffs, status: _status, ...revisionFields } = revision;
  // Periods appended after the head are not part of what was signed (an approved revision keeps its periods).
  const imported = study.observations.slice(0, state.observations.length);
  return {
    format: 'limit-ledger/signed-content',
    version: 1,
    studyId: study.id,
    identity: study.identity,
    observations: imported,
    correctedObservations: state.observations,
    source: {
      file: study.source.file,
      sha256: study.source.sha256,
      observationsSha256: observationsHash(imported),
    },
    importSettings: study.source.importSettings,
    method: revision.method,
    exclusions: state.exclusions.map(({ index, cause }) => ({
      index,
      label: study.observations[index]?.label,
      cause,
    })),
    corrections: state.corrections.map(({ index, label, field, original, value, reason }) => ({
      index,
      label,
      field,
      original,
      value,
      reason,
    })),
    results: { center: revision.center, limits: revision.limits },
    revision: revisionFields,
    chainHead: revision.chainHead,
  };
}

/** The canonical bytes of signedContent (RFC 8785, UTF-8). */
export function signedContentBytes(study: Study, revision: Revision): Uint8Array {
  return canonicalBytes(signedContent(study, revision));
}

/**
 * What one sign-off's signature covers: the signed content, the sign-off's own fields (all but the
 * signature) and the sign-offs before it, signatures included, so a countersignature also vouches
 * for the earlier ones. `earlier` defaults to the revision's sign-offs recorded before this one.
 */
export function signOffBytes(
  study: Study,
  revision: Revision,
  signOff: Omit<SignOff, 'signature'>,
  earlier: SignOff[] = signOffsBefore(revision, signOff),
): Uint8Array {
  const { signature: _signature, ...fields } = signOff as SignOff;
  return canonicalBytes({
    content: signedContent(study, revision),
    signOff: fields,
    earlierSignOffs: earlier,
  });
}

/** The sign-offs recorded before this one; all of them when it is not recorded yet. */
function signOffsBefore(revision: Revision, signOff: Omit<SignOff, 'signature'>): SignOff[] {
  const position = revision.signOffs.findIndex(
    (other) =>
      other.fingerprint === signOff.fingerprint &&
      other.time === signOff.time &&
      other.meaning === signOff.meaning,
  );
  return position < 0 ? revision.signOffs : revision.signOffs.slice(0, position);
}
