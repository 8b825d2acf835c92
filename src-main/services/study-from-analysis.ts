import { createHash, randomUUID } from 'node:crypto';
import { readFile } from 'node:fs/promises';
import { userInfo } from 'node:os';
import { basename, extname } from 'node:path';
import { fail, ok, type Result } from '../../shared-core/result.js';
import { localTime } from '../../shared-core/study/local-time.js';
import { newStudy } from '../../shared-core/study/new-study.js';
import { exclude, recordIteration } from '../../shared-core/study/study-state.js';
import { saveStudyFile, type SavedStudy } from './study-file.js';
import type { AnalysisOptions, Exclusion, Iteration } from '../../shared-core/study/analysis-types.js';
import type { ImportOutcome } from '../../shared-core/import/import-report.js';
import type { JsonObject } from '../../shared-core/study/field-schemas.js';
import type { StudyIdentity } from '../../shared-core/study/identity-schema.js';
import type { Study } from '../../shared-core/study/study-schema.js';

/** The host's side of a new study: a fresh id, the local clock with its offset, the user's name. */
export const hostClock = (): string => localTime(Date.now(), -new Date().getTimezoneOffset());
export const hostUser = (): string => {
  try {
    return userInfo().username || 'unknown user';
  } catch {
    return 'unknown user';
  }
};

export interface StudyFromAnalysisInput {
  /** The imported file, as the user named it. */
  file: string;
  outcome: ImportOutcome;
  method: AnalysisOptions;
  exclusions: readonly Exclusion[];
  /** The engine's iteration history, recorded as snapshots. */
  iterations?: readonly Iteration[];
  identity?: Partial<StudyIdentity>;
  who?: string;
  now?: string;
  id?: string;
}

/**
 * A study from what `analyze` did: the import, each exclusion as a decision with its cause, and
 * the iterations as snapshots. What the study cannot know (process step, characteristic) is left
 * empty for the user to fill before sign-off.
 */
export async function studyFromAnalysis(input: StudyFromAnalysisInput): Promise<Result<Study>> {
  const who = input.who ?? hostUser();
  const now = input.now ?? hostClock();
  const { report, observations } = input.outcome;
  let sha256 = report.sha256;
  if (sha256 === null) {
    try {
      sha256 = createHash('sha256')
        .update(await readFile(input.file))
        .digest('hex');
    } catch (error) {
      return fail({
        file: input.file,
        message: `cannot be read to fingerprint it (${(error as NodeJS.ErrnoException).code ?? 'error'})`,
      });
    }
  }
  const { settings, ...rest } = report;
  let study = newStudy({
    id: input.id ?? randomUUID(),
    identity: {
      part: basename(input.file, extname(input.file)),
      processStep: '',
      characteristic: '',
      inspectionUnit: settings.inspectionUnit ?? 'inspection unit',
      owner: who,
      ...input.identity,
    },
    source: {
      file: basename(input.file),
      sha256,
      importSettings: asJson(settings),
      importReport: asJson(rest),
    },
    observations,
    method: input.method,
    who,
    now,
  });
  for (const exclusion of input.exclusions) {
    const next = exclude(study, { who, index: exclusion.index, cause: exclusion.cause }, now);
    if (!next.ok) return fail(...next.findings.map((finding) => ({ file: input.file, ...finding })));
    study = next.value;
  }
  for (const iteration of input.iterations ?? []) study = recordIteration(study, { who, iteration }, now);
  return ok(study);
}

/** `analyze --save STUDY`: builds the study and writes it; an existing file is never replaced. */
export async function saveAnalysisStudy(
  path: string,
  input: StudyFromAnalysisInput,
): Promise<Result<SavedStudy>> {
  const study = await studyFromAnalysis(input);
  if (!study.ok) return study;
  return saveStudyFile(path, study.value, { expectedDiskHash: null });
}

/** A JSON copy: drops undefined members, as the file will. */
const asJson = (value: object): JsonObject => JSON.parse(JSON.stringify(value)) as JsonObject;
