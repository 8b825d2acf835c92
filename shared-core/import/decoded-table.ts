/**
 * A table as a decoder produced it, before any validation: the header and the data rows with their
 * spreadsheet row numbers. Delimited text gives strings; XLSX gives numbers, booleans and dates too.
 *
 * Decoding bytes (encodings, delimiters, XLSX, zip) happens in the host; everything from here on is
 * the same for every host, so the app and the CLI show the same import report.
 */
export type Cell = string | number | boolean | Date | null;

export interface DecodedRow {
  /** The row as the spreadsheet numbers it (the header of a plain text file is row 1). */
  row: number;
  cells: Cell[];
  /** The row is hidden in the workbook (reported, still read). */
  hidden?: boolean;
}

/** What the decoder knows about the source bytes and the settings it used or detected. */
export interface TableSource {
  format: 'delimited' | 'xlsx' | 'paste';
  /** Lowercase hex SHA-256 of the source bytes (for pasted text: of its UTF-8 encoding). */
  sha256: string;
  bytes: number;
  encoding?: string;
  delimiter?: string;
  /** How the encoding and delimiter were chosen: given by the user or detected. */
  encodingSource?: 'given' | 'bom' | 'detected';
  delimiterSource?: 'given' | 'detected';
}

/** A note from the decoder that belongs in the import report (a formula without a cached value). */
export interface DecoderNote {
  code: string;
  message: string;
  row?: number;
  column?: string;
}

export interface DecodedTable {
  file: string;
  sheet?: string;
  /** The spreadsheet row of the header. */
  headerRow: number;
  header: string[];
  rows: DecodedRow[];
  source?: TableSource;
  notes?: DecoderNote[];
  /** Spreadsheet rows that were entirely blank between data rows (listed, not read). */
  blankRows?: number[];
}

/** The text a user would see in the cell, for messages and the report. */
export function cellText(cell: Cell): string {
  if (cell === null) return '';
  if (cell instanceof Date) return Number.isNaN(cell.getTime()) ? 'invalid date' : cell.toISOString();
  return String(cell);
}

/** A cell that holds nothing (empty, or only spaces). */
export function isBlankCell(cell: Cell): boolean {
  return cell === null || (typeof cell === 'string' && cell.trim() === '');
}
