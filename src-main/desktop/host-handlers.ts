import { randomBytes } from 'node:crypto';
import { mkdir } from 'node:fs/promises';
import { join } from 'node:path';
import { z } from 'zod';
import {
  channels,
  isChannelName,
  type ChannelName,
  type FileHandle,
  type FilePurpose,
  type ParsedRequestOf,
  type ResponseOf,
  type SavePurpose,
  type SiteSettings,
  type StudyView,
} from '../../shared-core/api.js';
import type {
  AnalysisOptions,
  AnalysisResult,
  Exclusion,
  Observation,
} from '../../shared-core/study/analysis-types.js';
import type { Result } from '../../shared-core/result.js';
import type { JobRunner } from '../services/jobs/job-runner.js';
import type { FileRegistry } from './file-registry.js';
import { HostError } from './host-error.js';
import { recoveredOriginal, type RecoveryStore } from './recovery.js';

/** How the host lets the user pick files: native dialogs in Electron, the workspace in the browser host. */
export interface FilePicker {
  chooseFile(purpose: FilePurpose): Promise<string | null>;
  chooseSaveTarget(purpose: SavePurpose, suggestedName: string): Promise<string | null>;
  /** Studies the user can open without a dialog (the workspace; recent files on the desktop). */
  listStudies(): Promise<string[]>;
  /**
   * Where an export goes when no target was chosen: a save dialog on the desktop (null when the
   * user cancels it), a download on the web host.
   */
  exportDestination?(fileName: string): Promise<{ path: string; downloadUrl?: string } | null>;
}

/** The services the channels call (plain Node; see src-main/services). */
export interface HostServices {
  demoStudy(): Promise<StudyView>;
  openStudy(file: {
    fileName: string;
    bytes: Uint8Array;
    path: string | null;
  }): Promise<Result<Omit<StudyView, 'file'>>>;
  saveStudy(
    path: string,
    document: unknown,
    overwriteChanged: boolean,
  ): Promise<
    | { saved: true; backupKept: boolean; document?: unknown }
    | { saved: false; reason: 'changed-on-disk' | 'refused'; message: string }
  >;
  inspectData(file: {
    fileName: string;
    bytes: Uint8Array;
  }): Promise<Result<{ sheets: string[]; columns: string[]; preview: string[][] }>>;
  analyze(
    observations: Observation[],
    exclusions: Exclusion[],
    options: AnalysisOptions,
  ): Result<AnalysisResult>;
  readSettings(): Promise<Result<SiteSettings>>;
  writeSettings(settings: SiteSettings): Promise<SiteSettings>;
}

export interface HostContext {
  kind: 'electron' | 'web';
  version: string;
  workspaceName?: string;
  files: FileRegistry;
  picker: FilePicker;
  jobs: JobRunner;
  services: HostServices;
  recovery: RecoveryStore;
  /** Where personal signing keys made in the app are written (in the user's data folder). */
  keysFolder?: string;
  /** Told whenever the renderer's study gains or loses unsaved changes (the close prompt asks). */
  onUnsaved?(unsaved: boolean): void;
  /** Shows a file in the desktop's file manager (Electron's shell); absent on the web host. */
  revealFile?(path: string): void;
}

export type Handlers = { [C in ChannelName]: (request: ParsedRequestOf<C>) => Promise<ResponseOf<C>> };

/** What every transport returns for a call: the response, or an error the screens can show. */
export type Envelope =
  { ok: true; value: unknown } | { ok: false; error: { code: string; message: string; issues?: string[] } };

/**
 * Validates one raw call against the channel table and runs its handler. Unknown channels and
 * malformed requests are refused before any handler runs; errors other than HostError are reported
 * without their details.
 */
export async function dispatch(handlers: Handlers, channel: string, raw: unknown): Promise<Envelope> {
  if (!isChannelName(channel)) {
    return {
      ok: false,
      error: { code: 'unknown-channel', message: `there is no channel "${channel.slice(0, 60)}"` },
    };
  }
  const parsed = (channels[channel].request as z.ZodType).safeParse(raw);
  if (!parsed.success) {
    const issues = parsed.error.issues.map(
      (issue) => `${issue.path.join('.') || 'request'}: ${issue.message}`,
    );
    return {
      ok: false,
      error: { code: 'bad-request', message: `${channel}: the request is malformed`, issues },
    };
  }
  try {
    const handler = handlers[channel] as (request: unknown) => Promise<unknown>;
    return { ok: true, value: await handler(parsed.data) };
  } catch (error) {
    if (error instanceof HostError) {
      return { ok: false, error: { code: error.code, message: error.message, issues: error.issues } };
    }
    return {
      ok: false,
      error: { code: 'internal', message: `${channel} failed unexpectedly; the log has the details` },
    };
  }
}

const purposeOfJob = { importData: 'data', exportPacket: 'packet', signStudy: 'key' } as const;

export function createHandlers(context: HostContext): Handlers {
  const { files, picker, jobs, services, recovery } = context;
  let currentStudyName: string | null = null;

  /** Forgets an uploaded key's bytes once its job is over; a key chosen by path stays usable. */
  const releaseUpload = (handle: string): void => {
    try {
      if (files.get(handle).bytes !== null) files.release(handle);
    } catch {
      // Already released.
    }
  };

  const withFile = (view: Omit<StudyView, 'file'>, file: FileHandle | null): StudyView => ({ ...view, file });

  return {
    async hostInfo() {
      return {
        host: context.kind,
        version: context.version,
        ...(context.workspaceName ? { workspace: context.workspaceName } : {}),
      };
    },

    async demoStudy() {
      currentStudyName = null;
      return services.demoStudy();
    },

    async chooseFile({ purpose }) {
      const path = await picker.chooseFile(purpose);
      return path === null ? null : files.issuePath(path, purpose, purpose === 'study');
    },

    async chooseSaveTarget({ purpose, suggestedName }) {
      const path = await picker.chooseSaveTarget(purpose, suggestedName);
      return path === null ? null : files.issuePath(path, purpose, true);
    },

    async listWorkspace() {
      const paths = await picker.listStudies();
      return { files: await Promise.all(paths.map((path) => files.issuePath(path, 'study', true))) };
    },

    async uploadFile({ purpose, fileName, bytes }) {
      return files.issueBytes(fileName, new Uint8Array(Buffer.from(bytes, 'base64')), purpose);
    },

    async openStudy({ file }) {
      const source = await files.read(file);
      const opened = await services.openStudy(source);
      if (!opened.ok) return opened;
      const restored = recoveredOriginal(source.fileName);
      currentStudyName = restored === undefined ? source.fileName : restored;
      const entry = files.get(file);
      const handle = entry.path !== null ? await files.issuePath(entry.path, 'study', true) : null;
      return { ok: true as const, value: withFile(opened.value, handle) };
    },

    async saveStudy({ target, document, overwriteChanged }) {
      const path = files.writablePath(target);
      const outcome = await services.saveStudy(path, document, overwriteChanged);
      if (!outcome.saved) return outcome;
      const file = await files.issuePath(path, 'study', true);
      currentStudyName = file.fileName;
      context.onUnsaved?.(false);
      return {
        saved: true as const,
        file,
        backupKept: outcome.backupKept,
        ...(outcome.document !== undefined ? { document: outcome.document } : {}),
      };
    },

    async setUnsaved({ unsaved }) {
      context.onUnsaved?.(unsaved);
      return {};
    },

    async autosave({ document }) {
      await recovery.save(document, currentStudyName);
      return {};
    },

    async listRecovery() {
      const leftovers = await recovery.leftovers();
      return {
        copies: await Promise.all(
          leftovers.map(async (entry) => ({
            recovery: await files.issuePath(entry.path, 'study', false),
            original: entry.original,
            savedAt: entry.savedAt,
          })),
        ),
      };
    },

    async discardRecovery({ file }) {
      const entry = files.get(file);
      if (entry.path !== null) await recovery.discard(entry.path);
      files.release(file);
      return {};
    },

    async inspectData({ file }) {
      const source = await files.read(file);
      const inspected = await services.inspectData(source);
      if (!inspected.ok) return inspected;
      return {
        ok: true as const,
        value: { file: { handle: file, fileName: source.fileName }, ...inspected.value },
      };
    },

    async importData({ file, mapping }) {
      const source = await files.read(file);
      const jobId = jobs.start('importData', {
        fileName: source.fileName,
        bytes: source.bytes,
        request: mapping,
      });
      return { jobId };
    },

    async analyze({ observations, exclusions, options }) {
      // AnalysisResult is an interface; the schema's open object adds an index signature.
      return services.analyze(observations, exclusions, options) as ResponseOf<'analyze'>;
    },

    async exportPacket({ document, format, target, signature }) {
      if (signature && format !== 'pdf') {
        releaseUpload(signature.key);
        throw new HostError(
          'bad-request',
          'only the PDF packet carries a signature; the workbook is not signed',
        );
      }
      // As for signStudy: the key's bytes and the passphrase live in the worker for this job only.
      const key = signature ? await files.read(signature.key) : undefined;
      const fileName = `${(currentStudyName ?? 'study').replace(/\.ledger$/i, '')}${format === 'pdf' ? '.pdf' : '.xlsx'}`;
      let path: string;
      let downloadUrl: string | undefined;
      if (target !== undefined) path = files.writablePath(target);
      else {
        const destination = (await picker.exportDestination?.(fileName)) ?? null;
        if (destination === null) throw new HostError('no-target', 'choose where to save the packet first');
        ({ path, downloadUrl } = destination);
      }
      const settings = await services.readSettings();
      const paper = settings.ok && settings.value.paperSize === 'Letter' ? 'letter' : 'a4';
      const jobId = jobs.start(
        'exportPacket',
        {
          document,
          format,
          paper,
          ...(signature && key ? { signature: { key, passphrase: signature.passphrase } } : {}),
        },
        {
          outputTarget: path,
          finish: async (result) => {
            const signedBy = (result as { signedBy?: unknown } | undefined)?.signedBy;
            const file = await files.issuePath(path, purposeOfJob.exportPacket, false);
            return {
              // A download reaches the user under its own name, not the host's unique temporary one.
              file: downloadUrl ? { ...file, fileName } : file,
              ...(downloadUrl ? { downloadUrl } : {}),
              ...(typeof signedBy === 'string' ? { signedBy } : {}),
            };
          },
        },
      );
      if (signature) void jobs.settled(jobId).then(() => releaseUpload(signature.key));
      return { jobId };
    },

    async signStudy({ document, meaning, printedName, role, key, passphrase }) {
      const keyFile = await files.read(key);
      // The key's bytes and the passphrase go to the worker and live only as long as the job.
      const jobId = jobs.start('signStudy', {
        document,
        meaning,
        printedName,
        role,
        key: keyFile,
        passphrase,
      });
      void jobs.settled(jobId).then(() => releaseUpload(key));
      return { jobId };
    },

    async createSigningKey({ printedName, organization, passphrase }) {
      const folder = context.keysFolder;
      if (!folder) throw new HostError('no-key-folder', 'this host has no folder for signing keys');
      await mkdir(folder, { recursive: true, mode: 0o700 });
      const slug =
        printedName
          .normalize('NFKD')
          .replace(/[^A-Za-z0-9]+/g, '-')
          .replace(/^-+|-+$/g, '')
          .toLowerCase()
          .slice(0, 40) || 'signer';
      // A fresh name each time: a new key never replaces an older one that signed something.
      const path = join(folder, `${slug}-${randomBytes(4).toString('hex')}.key`);
      // The passphrase goes to the worker for this job only; the key stays in the file, encrypted.
      const jobId = jobs.start(
        'createSigningKey',
        { printedName, ...(organization ? { organization } : {}), passphrase },
        {
          outputTarget: path,
          finish: async (result) => {
            const made = result as { fingerprint: string; commonName: string };
            return {
              key: await files.issuePath(path, 'key', false),
              fingerprint: made.fingerprint,
              commonName: made.commonName,
            };
          },
        },
      );
      return { jobId };
    },

    async revealExport({ file }) {
      const entry = files.get(file);
      // Only files an export job wrote, at the path the host recorded, are shown: never a study, a key or an upload.
      if (entry.purpose !== purposeOfJob.exportPacket || entry.path === null)
        throw new HostError(
          'not-an-export',
          `${entry.fileName}: only an exported packet can be shown in its folder`,
        );
      if (!context.revealFile)
        throw new HostError('not-available', 'this host has no folders to show; the packet was downloaded');
      context.revealFile(entry.path);
      return {};
    },

    async cancelJob({ jobId }) {
      return { cancelled: await jobs.cancel(jobId) };
    },

    async jobStatus({ jobId }) {
      const status = jobs.status(jobId);
      if (status === undefined) throw new HostError('unknown-job', 'there is no such job');
      return status;
    },

    async siteSettings() {
      const settings = await services.readSettings();
      if (!settings.ok) {
        throw new HostError(
          'bad-settings',
          'the site settings file is not valid',
          settings.findings.map((finding) => `${finding.column ?? ''} ${finding.message}`.trim()),
        );
      }
      return settings.value;
    },

    async saveSiteSettings(settings) {
      return services.writeSettings(settings);
    },
  };
}
