import type { ColumnMapping } from './column-mapping.js';
import { suggestMapping } from './column-mapping.js';
import type { DecodedTable } from './decoded-table.js';
import { cellText } from './decoded-table.js';

/** What the mapping screen shows before anything is validated: the first rows and a suggestion. */
export interface TablePreview {
  file: string;
  sheet?: string;
  headerRow: number;
  header: string[];
  /** The first data rows as the user would read them, with their spreadsheet row numbers. */
  rows: { row: number; cells: string[] }[];
  totalRows: number;
  /** Columns suggested from the header names; the user confirms or changes each one. */
  suggested: Partial<ColumnMapping>;
}

/** The first `limit` rows of a decoded table as text, with a suggested column mapping. */
export function tablePreview(table: DecodedTable, limit = 20): TablePreview {
  return {
    file: table.file,
    ...(table.sheet === undefined ? {} : { sheet: table.sheet }),
    headerRow: table.headerRow,
    header: [...table.header],
    rows: table.rows.slice(0, limit).map(({ row, cells }) => ({
      row,
      cells: table.header.map((_, index) => {
        const cell = cells[index] ?? null;
        // A workbook date shows as its calendar date (or date-time), not as a UTC timestamp.
        if (cell instanceof Date && !Number.isNaN(cell.getTime())) {
          const iso = cell.toISOString();
          return iso.endsWith('T00:00:00.000Z') ? iso.slice(0, 10) : iso.slice(0, 19).replace('T', ' ');
        }
        return cellText(cell);
      }),
    })),
    totalRows: table.rows.length,
    suggested: suggestMapping(table.header),
  };
}
