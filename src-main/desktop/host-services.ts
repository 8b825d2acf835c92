import { createHash, randomUUID } from 'node:crypto';
import { readFile } from 'node:fs/promises';
import { basename } from 'node:path';
import type { StudyView } from '../../shared-core/api.js';
import { fail, ok, type Finding } from '../../shared-core/result.js';
import { demoStudy } from '../../shared-core/study/demo-scenario.js';
import { sealStudy } from '../../shared-core/study/audit-chain.js';
import { analyzePhaseOne } from '../../shared-core/study/phase-one.js';
import { hasErrors, type StudyProblem } from '../../shared-core/study/study-problem.js';
import type { Study } from '../../shared-core/study/study-schema.js';
import { deriveState } from '../../shared-core/study/study-state.js';
import { parseStudy } from '../../shared-core/study/study-text.js';
import { verifyStudy } from '../../shared-core/study/verify-study.js';
import { readSiteSettings, writeSiteSettings } from '../services/site-settings.js';
import { saveStudyFile } from '../services/study-file.js';
import { hostClock, hostUser } from '../services/study-from-analysis.js';
import type { HostServices } from './host-handlers.js';
import { inspectDataInThread } from '../services/import/inspect-data-thread.js';

/** The study as the screens see it, lifted out of the document by the core's fold of its chain. */
export function studyView(
  study: Study,
  problems: readonly StudyProblem[],
  migratedFrom: number | null = null,
) {
  const state = deriveState(study);
  const { identity } = study;
  const findings: Finding[] = [...problems, ...state.problems].map((problem) => ({
    message: problem.seq === null ? problem.message : `event ${problem.seq}: ${problem.message}`,
  }));
  if (migratedFrom !== null) {
    findings.unshift({
      message: `brought forward from schema version ${migratedFrom}; saving writes the current version`,
    });
  }
  return {
    title:
      [identity.part, identity.characteristic].filter((part) => part !== '').join(' — ') || 'Untitled study',
    unitName: identity.inspectionUnit,
    document: study,
    observations: state.observations,
    exclusions: state.exclusions,
    options: state.method,
    readOnly: hasErrors(problems),
    findings,
  } satisfies Omit<StudyView, 'file'>;
}

const sha256 = (bytes: Uint8Array): string => createHash('sha256').update(bytes).digest('hex');

/** Findings from services name files by path; the renderer is told only the file's name. */
const withoutFolders = (findings: readonly Finding[]): Finding[] =>
  findings.map((finding) => (finding.file ? { ...finding, file: basename(finding.file) } : finding));

/**
 * The real services behind the channels (src-main/services and the core). Both hosts use this one
 * wiring; tests substitute fakes through the HostServices interface.
 */
export function nodeHostServices(folders: { siteSettings: string }): HostServices {
  // What each study file held when it was opened or last saved, to notice a change made elsewhere.
  const diskHashes = new Map<string, string>();

  /**
   * A study records the site settings it was made under: the first time the host creates or saves
   * it, the settings in force are copied in (and the header resealed); later changes at the site do
   * not rewrite what an earlier study, or its approval, was held to.
   */
  const withSiteSettings = async (study: Study): Promise<Study> => {
    if (study.siteSettings !== undefined) return study;
    const settings = await readSiteSettings(folders.siteSettings);
    return settings.ok ? sealStudy({ ...study, siteSettings: settings.value }) : study;
  };

  return {
    async demoStudy() {
      const study = await withSiteSettings(
        demoStudy({ id: randomUUID(), who: hostUser(), now: hostClock() }),
      );
      return { file: null, ...studyView(study, verifyStudy(study)) };
    },

    async openStudy({ fileName, bytes, path }) {
      const parsed = parseStudy(new TextDecoder().decode(bytes).replace(/^\uFEFF/, ''), fileName);
      if (!parsed.ok) return fail(...withoutFolders(parsed.findings));
      if (path !== null) diskHashes.set(path, sha256(bytes));
      const { study, migratedFrom } = parsed.value;
      return ok(studyView(study, verifyStudy(study), migratedFrom));
    },

    async saveStudy(path, document, overwriteChanged) {
      const parsed = parseStudy(JSON.stringify(document), basename(path));
      if (!parsed.ok) {
        return {
          saved: false,
          reason: 'refused',
          message: withoutFolders(parsed.findings)
            .map((f) => f.message)
            .join('; '),
        };
      }
      const onDisk = await readFile(path).then(sha256, () => null);
      const expected = diskHashes.get(path) ?? null;
      if (!overwriteChanged && onDisk !== expected) {
        return {
          saved: false,
          reason: 'changed-on-disk',
          message:
            expected === null
              ? `${basename(path)} already exists; save over it?`
              : `${basename(path)} changed on disk since it was opened; save over it anyway?`,
        };
      }
      const study = hasErrors(verifyStudy(parsed.value.study))
        ? parsed.value.study
        : await withSiteSettings(parsed.value.study);
      const saved = await saveStudyFile(path, study, {
        expectedDiskHash: overwriteChanged ? undefined : onDisk,
      });
      if (!saved.ok) {
        return {
          saved: false,
          reason: 'refused',
          message: withoutFolders(saved.findings)
            .map((f) => f.message)
            .join('; '),
        };
      }
      diskHashes.set(path, saved.value.diskHash);
      return { saved: true, backupKept: saved.value.backup !== null, document: study };
    },

    async inspectData({ fileName, bytes }) {
      const preview = await inspectDataInThread(fileName, bytes);
      return preview.ok ? preview : fail(...withoutFolders(preview.findings));
    },

    analyze: (observations, exclusions, options) => analyzePhaseOne(observations, exclusions, options),
    readSettings: () => readSiteSettings(folders.siteSettings),
    writeSettings: (settings) => writeSiteSettings(folders.siteSettings, settings),
  };
}
