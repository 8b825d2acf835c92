import { errorText } from '../transport/error-text.js';
import { toBase64 } from '../transport/base64.js';
import Papa from 'papaparse';
import { api, ApiError } from '../transport/index.js';
import type { FileHandle } from '../../shared-core/api.js';
import type { Observation } from '../../shared-core/study/analysis-types.js';
import type { Finding } from '../../shared-core/result.js';
import { describeFinding } from '../../shared-core/result.js';
import { study } from './study.svelte.js';
import { navigation } from './navigation.svelte.js';
import { studyFile } from './study-file.svelte.js';

interface ChangedCell {
  row: number;
  column: string;
  from: string;
  to: string;
}

export interface MappingChoice {
  count: string;
  units: string;
  label: string;
  date: string;
  sheet: string;
  unitName: string;
  eventList: boolean;
  eventPeriod: 'lot' | 'shift' | 'day' | 'week';
  eventTime: string;
  eventCategory: string;
}

/** Guesses a column for a role from its header name (the user confirms in the mapping). */
function guess(columns: string[], ...patterns: RegExp[]): string {
  for (const pattern of patterns) {
    const found = columns.find((c) => pattern.test(c));
    if (found) return found;
  }
  return '';
}

/** What an import hands over: the observations read, with the file's name, hash, settings and report. */
export interface ImportedData {
  title: string;
  unit: string;
  file: string;
  sha256: string;
  observations: Observation[];
  importSettings: Record<string, unknown>;
  importReport: Record<string, unknown>;
}

/** The Data screen's destination: the import becomes a new study. */
function openAsNewStudy(imported: ImportedData): Finding[] {
  study.loadImport(imported);
  studyFile.opened(null);
  return [];
}

/**
 * An import: choose or paste, map the columns, import with progress, read the report. The Data
 * screen's opens a new study; another screen may deliver the periods elsewhere (the Changes screen
 * appends them to the open study), and the problems `deliver` returns are reported as the import's.
 */
export class DataImport {
  readonly deliver: (imported: ImportedData) => Finding[];
  constructor(deliver: (imported: ImportedData) => Finding[] = openAsNewStudy) {
    this.deliver = deliver;
  }

  step = $state<'choose' | 'map' | 'importing' | 'done'>('choose');
  file = $state.raw<FileHandle | null>(null);
  columns = $state.raw<string[]>([]);
  sheets = $state.raw<string[]>([]);
  preview = $state.raw<string[][]>([]);
  mapping = $state<MappingChoice>({
    count: '',
    units: '',
    label: '',
    date: '',
    sheet: '',
    unitName: 'inspection unit',
    eventList: false,
    eventPeriod: 'day',
    eventTime: '',
    eventCategory: '',
  });
  pasted = $state('');
  progress = $state(0);
  progressMessage = $state('');
  error = $state('');
  report = $state.raw<Finding[]>([]);
  rejected = $state.raw<{ row: number; column: string; value: string; message: string }[]>([]);
  changed = $state.raw<ChangedCell[]>([]);
  noProduction = $state(0);
  imported = $state(false);
  #abort: AbortController | null = null;

  reset(): void {
    this.step = 'choose';
    this.file = null;
    this.error = '';
    this.report = [];
    this.rejected = [];
    this.imported = false;
  }

  async chooseFile(file: File): Promise<void> {
    await this.#upload(file.name, new Uint8Array(await file.arrayBuffer()));
  }

  async usePasted(): Promise<void> {
    if (this.pasted.trim() === '') {
      this.error = 'Paste the table first (a header row, then one row per period).';
      return;
    }
    await this.#upload('pasted.csv', new TextEncoder().encode(this.pasted));
  }

  async #upload(fileName: string, bytes: Uint8Array): Promise<void> {
    this.error = '';
    try {
      const safeName = fileName.replace(/[\\/:*?"<>|]+/g, '-').replace(/^\.+/, '') || 'data.csv';
      const handle = await api.uploadFile({ purpose: 'data', fileName: safeName, bytes: toBase64(bytes) });
      try {
        await this.inspect(handle);
      } catch (error) {
        // A host without the inspection service still imports; the preview of a text file is read here.
        if (!(error instanceof ApiError && error.code === 'unavailable') || /\.xlsx$/i.test(safeName))
          throw error;
        this.#previewText(handle, new TextDecoder().decode(bytes.subarray(0, 256 * 1024)));
      }
    } catch (error) {
      this.error = errorText(error);
    }
  }

  #previewText(handle: FileHandle, text: string): void {
    const parsed = Papa.parse<string[]>(text.replace(/^\uFEFF/, ''), { preview: 9, skipEmptyLines: true });
    const [header = [], ...rows] = parsed.data;
    this.#mapColumns(handle, header, [], rows);
  }

  #mapColumns(handle: FileHandle, columns: string[], sheets: string[], preview: string[][]): void {
    this.file = handle;
    this.columns = columns;
    this.sheets = sheets;
    this.preview = preview;
    const c = columns;
    this.mapping.count =
      guess(c, /^(count|defects?|nonconformit|errors?|faults?)/i, /count|defect|nonconform/i) || c[0] || '';
    this.mapping.units = guess(
      c,
      /^(units?|k|inspected|panels?|boards?|size|area|n)$/i,
      /unit|inspected|area/i,
    );
    this.mapping.label = guess(c, /^(label|lot|batch|shift|period|id|sample)/i);
    this.mapping.date = guess(c, /date|day|time/i);
    this.mapping.sheet = sheets[0] ?? '';
    this.step = 'map';
  }

  async inspect(handle: FileHandle): Promise<void> {
    const inspected = await api.inspectData({ file: handle.handle });
    if (!inspected.ok) {
      this.error = inspected.findings.map(describeFinding).join('\n');
      return;
    }
    this.#mapColumns(handle, inspected.value.columns, inspected.value.sheets, inspected.value.preview);
  }

  async runImport(): Promise<void> {
    if (!this.file) return;
    const m = this.mapping;
    if (!m.eventList && !m.count) {
      this.error = 'Choose the column that holds the count of nonconformities.';
      return;
    }
    this.error = '';
    this.step = 'importing';
    this.progress = 0;
    this.#abort = new AbortController();
    try {
      const mapping = {
        count: m.count,
        ...(m.units ? { units: m.units } : {}),
        ...(m.label ? { label: m.label } : {}),
        ...(m.date ? { date: m.date } : {}),
        ...(m.sheet && this.sheets.length > 1 ? { sheet: m.sheet } : {}),
        inspectionUnit: m.unitName,
        ...(m.eventList
          ? {
              events: {
                period: m.eventPeriod,
                time: m.eventTime,
                ...(m.eventCategory ? { category: m.eventCategory } : {}),
              },
            }
          : {}),
      };
      const outcome = await api.runJob(
        'importData',
        { file: this.file.handle, mapping },
        {
          signal: this.#abort.signal,
          onProgress: (fraction, message) => {
            this.progress = fraction;
            this.progressMessage = message;
          },
        },
      );
      if (!outcome.ok) {
        this.report = outcome.findings;
        this.rejected = [];
        this.changed = [];
        this.imported = false;
      } else {
        const { observations, rejected, report } = outcome.value;
        this.rejected = rejected;
        this.changed = (report.changedCells as ChangedCell[] | undefined) ?? [];
        this.report = ((report.warnings as Finding[] | undefined) ?? []).map((w) => ({
          message: w.message,
          row: w.row,
          column: w.column,
        }));
        this.noProduction = outcome.value.noProduction.length;
        if (observations.length > 0) {
          const problems = this.deliver({
            title: this.file.fileName.replace(/\.[^.]+$/, ''),
            unit: m.unitName || 'inspection unit',
            file: this.file.fileName,
            sha256: report.sha256 ?? '',
            observations,
            importSettings: mapping,
            importReport: report,
          });
          if (problems.length > 0) this.report = [...problems, ...this.report];
          this.imported = problems.length === 0;
        }
      }
      this.step = 'done';
    } catch (error) {
      this.error =
        error instanceof ApiError && error.code === 'cancelled'
          ? 'The import was cancelled; nothing changed.'
          : errorText(error);
      this.step = 'map';
    } finally {
      this.#abort = null;
    }
  }

  cancel(): void {
    this.#abort?.abort();
  }

  review(): void {
    navigation.go('review');
  }
}

export const dataImport = new DataImport();
