import type { Cell } from './decoded-table.js';
import { cellText, isBlankCell } from './decoded-table.js';
import { columnIndex } from './column-mapping.js';

/** How far down a sheet to look for the header (titles and notes often sit above it). */
export const headerSearchRows = 50;

/** The index of the first of the first rows that holds every named column, or null. */
export function findHeader(rows: Cell[][], names: string[]): number | null {
  const wanted = names.filter((name) => name !== '');
  if (wanted.length === 0) return null;
  const limit = Math.min(rows.length, headerSearchRows);
  for (let i = 0; i < limit; i++) {
    const header = rows[i].map((cell) => cellText(cell).trim());
    if (wanted.every((name) => 'index' in columnIndex(header, name))) return i;
  }
  return null;
}

/**
 * The index of the header among the first rows of a table: the first row that holds every named
 * column, else the first row that is not blank. Titles above the header are skipped that way.
 */
export function locateHeader(rows: Cell[][], names: string[]): number {
  const found = findHeader(rows, names);
  if (found !== null) return found;
  const first = rows.findIndex((row) => row.some((cell) => !isBlankCell(cell)));
  return first < 0 ? 0 : first;
}

/** Header names as text; blank names get a placeholder naming their column letter. */
export function headerNames(cells: Cell[]): string[] {
  return cells.map((cell, index) => {
    const text = cellText(cell).trim();
    return text === '' ? `(column ${columnLetter(index)})` : text;
  });
}

/** Spreadsheet column letters: 0 → A, 25 → Z, 26 → AA. */
export function columnLetter(index: number): string {
  let letters = '';
  for (let n = index + 1; n > 0; n = Math.floor((n - 1) / 26))
    letters = String.fromCharCode(65 + ((n - 1) % 26)) + letters;
  return letters;
}
