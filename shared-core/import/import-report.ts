import type { Finding } from '../result.js';
import type { Observation } from '../study/analysis-types.js';
import type { ColumnMapping } from './column-mapping.js';
import type { TableSource } from './decoded-table.js';
import type { DateOrder } from './date-text.js';
import type { DecimalMark } from './number-text.js';

/** A cell that kept its row out of the analysis: the `rejected` shape of the analyze contract. */
export interface Rejection {
  /** Set only when the cell is in a second table (the units table of an event list). */
  file?: string;
  row: number;
  column: string;
  /** The cell as written ('' for a blank cell). */
  value: string;
  message: string;
}

/** A cell read as something other than its literal text ("1,5" read as 1.5). */
export interface ChangedCell {
  row: number;
  column: string;
  from: string;
  to: string;
}

export interface ImportWarning {
  code: string;
  message: string;
  row?: number;
  column?: string;
}

/** How each setting was decided: stated by the user, detected from the cells, or a default. */
export interface ImportSettingsUsed {
  mapping: ColumnMapping;
  decimal: DecimalMark;
  decimalSource: 'given' | 'detected' | 'default';
  decimalReason: string;
  dateOrder?: DateOrder;
  dateOrderSource?: 'given' | 'detected' | 'none';
  dateOrderReason?: string;
  inspectionUnit?: string;
  format?: TableSource['format'];
  encoding?: string;
  encodingSource?: TableSource['encodingSource'];
  delimiter?: string;
  delimiterSource?: TableSource['delimiterSource'];
  sheet?: string;
  headerRow: number;
  /** For event lists: how events were grouped into periods. */
  events?: {
    period: string;
    time?: string;
    category?: string;
    shiftStarts?: string;
    unitsFrom?: string;
    unitsKey?: string;
  };
}

/**
 * Everything a reviewer needs to trust an import: what was read, what was kept, what was left out
 * and why, what was reinterpreted, and the fingerprint of the source. Nothing is dropped without a
 * line here: rowsRead = accepted + rejectedRows + noProduction.
 */
export interface ImportReport {
  file: string;
  /** The file and, for a workbook, the sheet, as messages name them (`h.xlsx, sheet "Line 4"`). */
  location: string;
  sha256: string | null;
  bytes: number | null;
  rowsRead: number;
  accepted: number;
  rejectedRows: number;
  noProduction: number;
  /** Entirely blank rows between data rows: not periods, listed so that nothing vanishes unseen. */
  blankRows: number[];
  rejected: Rejection[];
  changedCells: ChangedCell[];
  settings: ImportSettingsUsed;
  warnings: ImportWarning[];
  /** Event lists: how many periods the rows were grouped into. */
  periods?: number;
  /** Event lists: the rows of the units table, accounted for like the event rows. */
  unitsTable?: {
    file: string;
    rowsRead: number;
    accepted: number;
    rejectedRows: number;
    noProduction: number;
  };
  /** Event lists: nonconformities per category over the accepted periods, most frequent first. */
  categories?: { category: string; count: number }[];
}

export interface ImportOutcome {
  /** Accepted periods in period order (date order where dated, else file order). */
  observations: Observation[];
  rejected: Rejection[];
  /** Periods with 0 units and a blank or 0 count: kept on record, shown, not analysed. */
  noProduction: Observation[];
  report: ImportReport;
}

/** A rejection as a finding, for messages: a blank cell shows no empty quotes. */
export function rejectionFinding(file: string, rejection: Rejection): Finding {
  const { row, column, value, message } = rejection;
  const where = rejection.file ?? file;
  return value === '' ? { file: where, row, column, message } : { file: where, row, column, value, message };
}
