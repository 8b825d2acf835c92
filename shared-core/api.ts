/**
 * The contract between the renderer and its host: one table of channels, each a request schema and
 * a response schema (and, for long work, the schema of the job's result).
 *
 * The Electron preload, the ipc handlers, the loopback web host and the renderer's client are all
 * derived from `channels`; every request is validated against its schema on the host side before a
 * service sees it. Files are named by host-side handles (from a dialog, a drop, an upload or the
 * workspace), never by a path the renderer supplies.
 */
import { z } from 'zod';
import { AnalysisOptionsSchema, ChartKindSchema, LimitsMethodSchema } from './settings/method.js';
import { SignOffMeaning, SiteSettingsSchema } from './settings/site-settings.js';

export {
  AnalysisOptionsSchema,
  ChartKindSchema,
  LimitsMethodSchema,
  RuleIdSchema,
} from './settings/method.js';
export { SignOffMeaning, SiteSettingsSchema, type SiteSettings } from './settings/site-settings.js';

// ---- Building blocks -------------------------------------------------------------------------

const Empty = z.object({}).strict();

/** A host-side handle for a file the user chose; opaque to the renderer. */
export const FileHandleId = z
  .string()
  .regex(/^[A-Za-z0-9_-]{8,64}$/, 'a file handle is an opaque id issued by the host');

/** What the renderer may know about a chosen file: its handle and its display name, never a path. */
export const FileHandle = z.object({
  handle: FileHandleId,
  fileName: z.string().min(1).max(255),
  size: z.number().int().nonnegative().optional(),
  /** ISO time the file was last modified, where known. */
  modified: z.string().optional(),
});
export type FileHandle = z.infer<typeof FileHandle>;

/** A bare file name for the workspace or a download: no folders, no dot-dot, no control characters. */
export const PlainFileName = z
  .string()
  .min(1)
  .max(200)
  .refine(
    (name) => !/[\\/:*?"<>|\p{Cc}]/u.test(name) && name !== '.' && name !== '..' && !name.startsWith('.'),
    'a file name without folders or special characters',
  );

/** File contents carried as base64 (the same encoding over IPC and over HTTP). */
export const Base64Bytes = z.base64().max(200 * 1024 * 1024, 'files larger than 150 MB are not accepted');

export const FindingSchema = z.object({
  file: z.string().optional(),
  row: z.number().int().optional(),
  column: z.string().optional(),
  value: z.string().optional(),
  message: z.string(),
});

/** Which kind of file a dialog or upload is for; the host filters extensions by it. */
export const FilePurpose = z.enum(['study', 'data', 'key', 'certificate']);
export type FilePurpose = z.infer<typeof FilePurpose>;

/** Which kind of file a save target is for. */
export const SavePurpose = z.enum(['study', 'packet', 'workbook', 'certificate']);
export type SavePurpose = z.infer<typeof SavePurpose>;

// ---- The analysis shapes (mirroring shared-core/study/analysis-types.ts) ---------------------

export const ObservationSchema = z.object({
  label: z.string().max(500),
  row: z.number().int().positive(),
  rows: z.tuple([z.number().int().positive(), z.number().int().positive()]).optional(),
  count: z.number().int().nonnegative(),
  units: z.number().positive().finite(),
  date: z.string().max(40).optional(),
  categories: z.record(z.string(), z.number().int().nonnegative()).optional(),
});

export const AssignableCauseSchema = z.object({
  category: z.string().min(1).max(200),
  description: z.string().min(1).max(5000),
  reference: z.string().max(200).optional(),
});

export const ExclusionSchema = z.object({
  index: z.number().int().nonnegative(),
  cause: AssignableCauseSchema,
});

const WarningSchema = z.object({ code: z.string(), message: z.string() });
const IntervalSchema = z.object({ lower: z.number(), upper: z.number() });

/** Results are open objects: the engine may add fields (DESIGN.md), and they must pass through. */
export const PeriodResultSchema = z.looseObject({
  index: z.number().int(),
  label: z.string(),
  row: z.number().int(),
  rows: z.tuple([z.number().int(), z.number().int()]).optional(),
  count: z.number(),
  units: z.number(),
  rate: z.number(),
  center: z.number(),
  lcl: z.number().nullable(),
  ucl: z.number(),
  z: z.number(),
  status: z.enum(['in', 'signal', 'excluded']),
  rules: z.array(z.string()),
  cause: AssignableCauseSchema.optional(),
});

export const AnalysisResultSchema = z.looseObject({
  chart: ChartKindSchema,
  limits: LimitsMethodSchema,
  center: z.number(),
  rate: z.number(),
  rateSource: z.enum(['estimated', 'known']),
  rateInterval: IntervalSchema,
  sigmaZ: z.number().nullable(),
  multiplier: z.number(),
  alpha: z.number().nullable(),
  fap: z.number(),
  m: z.number().int(),
  totals: z.object({ count: z.number(), units: z.number() }),
  periods: z.array(PeriodResultSchema),
  dispersion: z.object({
    statistic: z.number(),
    df: z.number(),
    pOver: z.number(),
    pUnder: z.number(),
    smallExpected: z.number(),
    advice: z.string(),
  }),
  averageK: z.object({ units: z.number(), lcl: z.number().nullable(), ucl: z.number() }).nullable(),
  stable: z.boolean(),
  warnings: z.array(WarningSchema),
});

/** A value or the findings that explain why there is none (shared-core/result.ts). */
export const resultOf = <T extends z.ZodType>(value: T) =>
  z.discriminatedUnion('ok', [
    z.object({ ok: z.literal(true), value }),
    z.object({ ok: z.literal(false), findings: z.array(FindingSchema) }),
  ]);

// ---- Studies ---------------------------------------------------------------------------------

/**
 * The study as the renderer sees it. `document` is the `.ledger` JSON as the study-file service
 * reads it (its schema and migrations live in shared-core/study); the analysis input is lifted out
 * so that the screens can recompute with the core without knowing the document's layout.
 */
export const StudyView = z.object({
  /** The file the study came from or was last saved to; null for a study not yet saved. */
  file: FileHandle.nullable(),
  title: z.string(),
  /** What one inspection unit is ("one board", "50 m² of cloth"). */
  unitName: z.string(),
  document: z.unknown(),
  observations: z.array(ObservationSchema),
  exclusions: z.array(ExclusionSchema),
  options: AnalysisOptionsSchema,
  /** A study whose audit chain is broken opens read-only. */
  readOnly: z.boolean(),
  /** Problems found on opening (a broken chain, a migrated schema, a voided sign-off). */
  findings: z.array(FindingSchema),
});
export type StudyView = z.infer<typeof StudyView>;

export const SaveStudyRequest = z.object({
  /** Where to save: the study's own file, or a target from `chooseSaveTarget`. */
  target: FileHandleId,
  document: z.unknown(),
  /** Save even though the file changed on disk since it was opened (the user said so). */
  overwriteChanged: z.boolean().default(false),
});

export const SaveStudyResponse = z.discriminatedUnion('saved', [
  z.object({
    saved: z.literal(true),
    file: FileHandle,
    backupKept: z.boolean(),
    /** The document as written (with the site settings it was made under recorded, on first save). */
    document: z.unknown().optional(),
  }),
  z.object({ saved: z.literal(false), reason: z.enum(['changed-on-disk', 'refused']), message: z.string() }),
]);

// ---- Import ----------------------------------------------------------------------------------

/**
 * Which columns hold what and how to read them (the import service's ImportRequest); the service
 * checks the names against the file's header and reports every problem with its row and column.
 */
export const ImportMapping = z.strictObject({
  count: z.string().min(1).max(500),
  units: z.string().max(500).optional(),
  label: z.string().max(500).optional(),
  date: z.string().max(500).optional(),
  decimal: z.enum(['comma', 'point']).optional(),
  dateOrder: z.enum(['dmy', 'mdy']).optional(),
  inspectionUnit: z.string().max(200).optional(),
  delimiter: z.enum([',', ';', '\t', '|']).optional(),
  encoding: z.enum(['utf-8', 'utf-16le', 'utf-16be', 'windows-1252']).optional(),
  sheet: z.string().max(500).optional(),
  events: z
    .strictObject({
      period: z.enum(['lot', 'shift', 'day', 'week']),
      time: z.string().min(1).max(500),
      category: z.string().max(500).optional(),
    })
    .optional(),
});

export const ImportRequest = z.object({ file: FileHandleId, mapping: ImportMapping });

export const InspectDataResponse = z.object({
  file: FileHandle,
  sheets: z.array(z.string()),
  columns: z.array(z.string()),
  /** The first rows as text, for the mapping preview. */
  preview: z.array(z.array(z.string())),
});

const RejectionSchema = z.object({
  row: z.number().int(),
  column: z.string(),
  value: z.string(),
  message: z.string(),
});

/**
 * What an import produced (shared-core/import/import-report.ts): the accepted periods, every
 * rejected cell, the no-production periods and the full report; or the findings that stopped it.
 */
export const ImportOutcome = resultOf(
  z.looseObject({
    observations: z.array(ObservationSchema),
    rejected: z.array(RejectionSchema),
    noProduction: z.array(
      z.looseObject({ label: z.string(), row: z.number().int(), count: z.number(), units: z.number() }),
    ),
    report: z.looseObject({
      file: z.string(),
      sha256: z.string().nullable(),
      rowsRead: z.number().int(),
      accepted: z.number().int(),
      rejected: z.array(RejectionSchema),
    }),
  }),
);

// ---- Packet, signing -------------------------------------------------------------------------

export const ExportPacketRequest = z.object({
  document: z.unknown(),
  format: z.enum(['pdf', 'workbook']),
  /** A target from `chooseSaveTarget` (desktop); omitted on the web host, where it becomes a download. */
  target: FileHandleId.optional(),
  /**
   * A key to put a PDF signature on the packet (PDF only): the key file, chosen or uploaded, and its
   * passphrase, kept in memory for this job only, as for `signStudy`. Without it the PDF is unsigned.
   */
  signature: z.object({ key: FileHandleId, passphrase: z.string().min(1).max(1024) }).optional(),
});

export const ExportPacketResult = z.object({
  file: FileHandle,
  /** On the web host: a same-origin URL that downloads the file once. */
  downloadUrl: z.string().startsWith('/download/').optional(),
  /** The SHA-256 fingerprint of the certificate that signed the PDF, when it was signed. */
  signedBy: z.string().optional(),
});

export const SignStudyRequest = z.object({
  document: z.unknown(),
  meaning: SignOffMeaning,
  printedName: z.string().min(1).max(200),
  role: z.string().min(1).max(200),
  /** The key file (PKCS#12 or encrypted PKCS#8), chosen or uploaded; kept in memory for this job only. */
  key: FileHandleId,
  passphrase: z.string().min(1).max(1024),
});

export const SignStudyResult = z.object({
  document: z.unknown(),
  fingerprint: z.string(),
  /** What happened, in words (a new draft revision, a sign-off that voided others). */
  notes: z.array(z.string()).optional(),
});

/**
 * A personal signing certificate made on this computer (RSA 3072, self-issued). The host writes the
 * key, encrypted with the passphrase, into the user's data folder (mode 0600) and returns a handle
 * to it; the key itself never reaches the renderer.
 */
export const CreateSigningKeyRequest = z.object({
  printedName: z.string().trim().min(1).max(200),
  organization: z.string().trim().max(200).optional(),
  passphrase: z.string().min(8).max(1024),
});

export const CreateSigningKeyResult = z.object({
  key: FileHandle,
  fingerprint: z.string(),
  commonName: z.string(),
});

// ---- Jobs and host events --------------------------------------------------------------------

export const JobId = z.string().regex(/^job-[A-Za-z0-9_-]{6,64}$/);

export const JobStarted = z.object({ jobId: JobId });

export const JobEvent = z.discriminatedUnion('state', [
  z.object({
    jobId: JobId,
    state: z.literal('progress'),
    /** 0..1 */
    fraction: z.number().min(0).max(1),
    message: z.string(),
  }),
  z.object({ jobId: JobId, state: z.literal('done'), result: z.unknown() }),
  z.object({ jobId: JobId, state: z.literal('failed'), findings: z.array(FindingSchema) }),
  z.object({ jobId: JobId, state: z.literal('cancelled') }),
]);
export type JobEvent = z.infer<typeof JobEvent>;

/** Commands from native menus and the operating system, forwarded to the screens. */
export const MenuCommand = z.enum([
  'new-from-import',
  'open',
  'save',
  'save-as',
  'export-packet',
  'undo',
  'redo',
  'about',
]);

/** Everything the host pushes to the renderer. */
export const HostEvent = z.discriminatedUnion('type', [
  z.object({ type: z.literal('job'), event: JobEvent }),
  z.object({ type: z.literal('menu'), command: MenuCommand }),
  /** A file reached the app by drag and drop, a second launch or the file association. */
  z.object({ type: z.literal('file-opened'), file: FileHandle, purpose: FilePurpose }),
]);
export type HostEvent = z.infer<typeof HostEvent>;

// ---- The table -------------------------------------------------------------------------------

export const HostInfo = z.object({
  host: z.enum(['electron', 'web']),
  version: z.string(),
  /** Display name of the web host's workspace folder. */
  workspace: z.string().optional(),
});

export const RecoveryCopy = z.object({
  recovery: FileHandle,
  original: z.string().nullable(),
  savedAt: z.string(),
});

/**
 * channel name → schemas. `result` is present on channels that start a job: their response is
 * `JobStarted` and the job's `done` event carries a value of `result`.
 */
export const channels = {
  hostInfo: { request: Empty, response: HostInfo },
  demoStudy: { request: Empty, response: StudyView },

  // Files: dialogs on the desktop, the workspace and uploads on the web.
  chooseFile: { request: z.object({ purpose: FilePurpose }), response: FileHandle.nullable() },
  chooseSaveTarget: {
    request: z.object({ purpose: SavePurpose, suggestedName: PlainFileName }),
    response: FileHandle.nullable(),
  },
  listWorkspace: { request: Empty, response: z.object({ files: z.array(FileHandle) }) },
  uploadFile: {
    request: z.object({ purpose: FilePurpose, fileName: PlainFileName, bytes: Base64Bytes }),
    response: FileHandle,
  },

  // Studies.
  openStudy: { request: z.object({ file: FileHandleId }), response: resultOf(StudyView) },
  saveStudy: { request: SaveStudyRequest, response: SaveStudyResponse },
  setUnsaved: { request: z.object({ unsaved: z.boolean() }), response: Empty },
  autosave: { request: z.object({ document: z.unknown() }), response: Empty },
  listRecovery: { request: Empty, response: z.object({ copies: z.array(RecoveryCopy) }) },
  discardRecovery: { request: z.object({ file: FileHandleId }), response: Empty },

  // Import, analysis.
  inspectData: { request: z.object({ file: FileHandleId }), response: resultOf(InspectDataResponse) },
  importData: { request: ImportRequest, response: JobStarted, result: ImportOutcome },
  analyze: {
    request: z.object({
      observations: z.array(ObservationSchema).max(1_000_000),
      exclusions: z.array(ExclusionSchema),
      options: AnalysisOptionsSchema,
    }),
    response: resultOf(AnalysisResultSchema),
  },

  // Packet and signing.
  exportPacket: { request: ExportPacketRequest, response: JobStarted, result: ExportPacketResult },
  signStudy: { request: SignStudyRequest, response: JobStarted, result: SignStudyResult },
  createSigningKey: {
    request: CreateSigningKeyRequest,
    response: JobStarted,
    result: CreateSigningKeyResult,
  },
  /**
   * Shows an exported packet in the desktop's file manager: `file` is the handle the export job's
   * result gave back; the host reveals the path it recorded itself. The web host has no folders and
   * refuses it.
   */
  revealExport: { request: z.object({ file: FileHandleId }).strict(), response: Empty },

  // Jobs.
  cancelJob: { request: z.object({ jobId: JobId }), response: z.object({ cancelled: z.boolean() }) },
  jobStatus: { request: z.object({ jobId: JobId }), response: JobEvent },

  // Site configuration.
  siteSettings: { request: Empty, response: SiteSettingsSchema },
  saveSiteSettings: { request: SiteSettingsSchema, response: SiteSettingsSchema },
} as const;

export type Channels = typeof channels;
export type ChannelName = keyof Channels;
export type RequestOf<C extends ChannelName> = z.input<Channels[C]['request']>;
export type ParsedRequestOf<C extends ChannelName> = z.output<Channels[C]['request']>;
export type ResponseOf<C extends ChannelName> = z.output<Channels[C]['response']>;
export type JobChannelName = {
  [C in ChannelName]: Channels[C] extends { result: z.ZodType } ? C : never;
}[ChannelName];
export type JobResultOf<C extends JobChannelName> = Channels[C] extends { result: infer R extends z.ZodType }
  ? z.output<R>
  : never;

export const channelNames = Object.keys(channels) as ChannelName[];

export function isChannelName(name: string): name is ChannelName {
  return Object.hasOwn(channels, name);
}

/** The Electron ipc channel name of a table channel (namespaced so no other listener can collide). */
export const ipcChannelOf = (name: ChannelName): string => `limit-ledger:${name}`;
/** The ipc channel that carries HostEvent from main to the preload. */
export const hostEventChannel = 'limit-ledger:event';

/** The object the preload exposes as `window.limitLedger`, and nothing else. */
export interface BridgeApi {
  invoke(channel: ChannelName, request: unknown): Promise<unknown>;
  onEvent(listener: (event: HostEvent) => void): () => void;
}
