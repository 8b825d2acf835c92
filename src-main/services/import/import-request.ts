import type { ColumnMapping } from '../../../shared-core/import/column-mapping.js';
import type { ImportSettings } from '../../../shared-core/import/import-settings.js';
import type { TextEncoding } from './decode-text.js';

/** How to group an event list (one row per nonconformity) into periods. */
export interface EventsRequest {
  period: 'lot' | 'shift' | 'day' | 'week';
  /** The column with each event's timestamp (day, week, shift) or its period (lot). */
  time: string;
  category?: string;
  /** Shift start times (HH:MM) for grouping by shift. */
  shiftStarts?: string[];
  /** A sheet of the same workbook that gives each period's units (in its `units` column). */
  unitsSheet?: string;
  /** A second file that gives each period's units (importFile only: a path). */
  unitsFile?: string;
  /** A second table's bytes that give each period's units (importBytes: an upload). */
  unitsUpload?: { fileName: string; bytes: Uint8Array };
  /** The column of the units table that names the period; the `time` column's name by default. */
  unitsKey?: string;
}

/** Everything the user states about one import; what is left out is detected or asked. */
export type ImportRequest = ColumnMapping &
  ImportSettings & {
    /** A delimiter character: ',', ';', '\t' or '|'. */
    delimiter?: string;
    encoding?: TextEncoding;
    sheet?: string;
    events?: EventsRequest;
  };

export interface ImportProgress {
  phase: 'reading' | 'checking' | 'decoding' | 'validating';
  /** 0 to 1 when known. */
  fraction?: number;
}

export type ProgressListener = (progress: ImportProgress) => void;
