import type { ColumnMapping } from '../../../shared-core/import/column-mapping.js';
import type { ImportSettings } from '../../../shared-core/import/import-settings.js';
import type { TextEncoding } from './decode-text.js';

/** How to group an event list (one row per nonconformity) into periods. */
export interface EventsRequest {
  period: 'lot' | 'shift' | 'day' | 'week';
  /** The column with each event's timestamp (day, week, shift) or its period (lot). */
  time: string;
  category?: string;
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
