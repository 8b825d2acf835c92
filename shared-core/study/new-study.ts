import { appendEvent, sealStudy } from './audit-chain.js';
import { canonicalJson } from './canonical-json.js';
import { sha256Hex } from './sha256.js';
import { currentSchemaVersion, type Study, type StudySource } from './study-schema.js';
import type { AnalysisOptions, Observation } from './analysis-types.js';
import type { StudyIdentity } from './identity-schema.js';

export interface NewStudyInput {
  /** A fresh unique id from the host (the core has no randomness), e.g. crypto.randomUUID(). */
  id: string;
  identity: StudyIdentity;
  source: StudySource;
  observations: Observation[];
  method: AnalysisOptions;
  who: string;
  /** The local clock's reading (local-time.ts). */
  now: string;
}

/** SHA-256 of the canonical observations: what the `imported` event binds. */
export const observationsHash = (observations: readonly Observation[]): string =>
  sha256Hex(canonicalJson(observations));

/** SHA-256 of the canonical import settings and report. */
export const importHash = (source: Pick<StudySource, 'importSettings' | 'importReport'>): string =>
  sha256Hex(canonicalJson({ importSettings: source.importSettings, importReport: source.importReport }));

/** A study with its first two events: `created` (binds the id) and `imported` (binds the data). */
export function newStudy(input: NewStudyInput): Study {
  const { id, identity, source, observations, method, who, now } = input;
  const empty = sealStudy({
    schemaVersion: currentSchemaVersion,
    id,
    identity,
    source,
    observations,
    method,
    events: [],
    revisions: [],
  });
  const created = appendEvent(
    empty,
    { type: 'created', who, payload: { studyId: id, identity, method } },
    now,
  );
  return appendEvent(
    created,
    {
      type: 'imported',
      who,
      payload: {
        file: source.file,
        sourceSha256: source.sha256,
        observationCount: observations.length,
        observationsSha256: observationsHash(observations),
        importSha256: importHash(source),
      },
    },
    now,
  );
}
