import ExcelJS from 'exceljs';
import type { Result } from '../../../shared-core/result.js';
import { fail, ok } from '../../../shared-core/result.js';
import type {
  Cell,
  DecodedTable,
  DecoderNote,
  TableSource,
} from '../../../shared-core/import/decoded-table.js';
import { cellText, isBlankCell } from '../../../shared-core/import/decoded-table.js';
import {
  columnLetter,
  findHeader,
  headerNames,
  headerSearchRows,
  locateHeader,
} from '../../../shared-core/import/header-row.js';
import { importLimits, type ImportLimits } from './import-limits.js';

/** A sheet's cells as read: values, which cells are merged into which, hidden rows. */
interface SheetGrid {
  name: string;
  hidden: boolean;
  /** Index r holds spreadsheet row r + 1. */
  rows: Cell[][];
  /** Spreadsheet rows that are hidden. */
  hiddenRows: Set<number>;
  /** "row:column" (1-based) of a merged cell → its master's row and column. */
  mergedInto: Map<string, { row: number; column: number }>;
  /** "row:column" of formula cells with no saved result, for the report. */
  uncachedFormulas: Map<string, string>;
}

type CellValue = ExcelJS.CellValue;

/** A workbook cell as a decoded cell: formulas by their cached result, rich text as its text. */
function decodedCell(value: CellValue, onUncachedFormula: (formula: string) => void): Cell {
  if (value === null || value === undefined) return null;
  if (typeof value === 'number' || typeof value === 'string' || typeof value === 'boolean') return value;
  if (value instanceof Date) return value;
  if ('formula' in value || 'sharedFormula' in value) {
    const formula = 'formula' in value ? value.formula : value.sharedFormula;
    if (value.result === undefined || value.result === null) {
      onUncachedFormula(String(formula));
      return null;
    }
    return decodedCell(value.result as CellValue, onUncachedFormula);
  }
  if ('richText' in value) return value.richText.map((run) => run.text).join('');
  if ('error' in value) return String(value.error);
  if ('text' in value) {
    const text = value.text as unknown;
    return typeof text === 'string' ? text : decodedCell(text as CellValue, onUncachedFormula);
  }
  return String(value);
}

function sheetGrid(worksheet: ExcelJS.Worksheet, maxRows: number): SheetGrid | 'too-many-rows' {
  const grid: SheetGrid = {
    name: worksheet.name,
    hidden: worksheet.state !== 'visible',
    rows: [],
    hiddenRows: new Set(),
    mergedInto: new Map(),
    uncachedFormulas: new Map(),
  };
  if (worksheet.rowCount > maxRows + headerAllowance) return 'too-many-rows';
  worksheet.eachRow({ includeEmpty: false }, (row, rowNumber) => {
    const cells: Cell[] = [];
    if (row.hidden) grid.hiddenRows.add(rowNumber);
    row.eachCell({ includeEmpty: false }, (cell, column) => {
      const key = `${rowNumber}:${column}`;
      if (cell.type === ExcelJS.ValueType.Merge) {
        const master = cell.master;
        grid.mergedInto.set(key, { row: Number(master.row), column: Number(master.col) });
      }
      cells[column - 1] = decodedCell(cell.value, (formula) => grid.uncachedFormulas.set(key, formula));
    });
    for (let i = 0; i < cells.length; i++) if (cells[i] === undefined) cells[i] = null;
    grid.rows[rowNumber - 1] = cells;
  });
  for (let i = 0; i < grid.rows.length; i++) grid.rows[i] ??= [];
  return grid;
}

/**
 * The first rows as header candidates: a header cell merged across columns names its first column;
 * the columns it spans beyond the first get the name and their letter ("Defects (D)").
 */
function headerView(grid: SheetGrid): Cell[][] {
  return grid.rows.slice(0, headerSearchRows).map((cells, index) =>
    cells.map((cell, column) => {
      const master = grid.mergedInto.get(`${index + 1}:${column + 1}`);
      return master && master.row === index + 1 ? `${cellText(cell)} (${columnLetter(column)})` : cell;
    }),
  );
}

/** Rows a sheet may hold above its data (titles, the header) beyond the row limit. */
const headerAllowance = 100;

export interface XlsxOptions {
  sheet?: string;
  headerNames?: string[];
  limits?: Partial<ImportLimits>;
}

/**
 * A table from the bytes of an XLSX workbook (checked for zip bombs before this is called): the
 * named sheet, or the first sheet whose header holds the named columns. Formula cells are read by
 * their saved result (a note where none is saved); dates come out by the workbook's own date system
 * (1900 or 1904); a header cell merged across columns names its first column, merged data cells
 * are read in their first cell only; hidden rows are read and reported.
 */
export async function xlsxTable(
  bytes: Uint8Array,
  file: string,
  source: Omit<TableSource, 'encoding' | 'delimiter'>,
  options: XlsxOptions = {},
): Promise<Result<DecodedTable>> {
  const maxRows = options.limits?.maxRows ?? importLimits.maxRows;
  const workbook = new ExcelJS.Workbook();
  try {
    // exceljs types its argument as an ArrayBuffer but reads a Node Buffer.
    await workbook.xlsx.load(
      Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength) as unknown as ArrayBuffer,
    );
  } catch (error) {
    return fail({ file, message: `is not a readable XLSX workbook (${(error as Error).message})` });
  }
  const sheetNames = workbook.worksheets.map((sheet) => `"${sheet.name}"`).join(', ') || 'none';
  let candidates = workbook.worksheets;
  if (options.sheet !== undefined) {
    const wanted = options.sheet;
    const exact = candidates.filter((sheet) => sheet.name === wanted);
    const loose = candidates.filter(
      (sheet) => sheet.name.trim().toLowerCase() === wanted.trim().toLowerCase(),
    );
    candidates = exact.length > 0 ? exact : loose;
    if (candidates.length !== 1)
      return fail({ file, message: `has no sheet "${wanted}" (sheets: ${sheetNames})` });
  }
  if (candidates.length === 0) return fail({ file, message: 'holds no sheets' });

  const names = options.headerNames ?? [];
  let chosen: { grid: SheetGrid; headerIndex: number } | undefined;
  for (const worksheet of candidates) {
    const grid = sheetGrid(worksheet, maxRows);
    if (grid === 'too-many-rows') {
      return fail({
        file,
        message: `sheet "${worksheet.name}" has more than ${maxRows.toLocaleString('en-US')} rows; split the workbook`,
      });
    }
    const found = findHeader(headerView(grid), names);
    if (found !== null) {
      chosen = { grid, headerIndex: found };
      break;
    }
    chosen ??= { grid, headerIndex: locateHeader(headerView(grid), names) };
    if (options.sheet !== undefined) break;
  }
  const { grid, headerIndex } = chosen!;
  const table = tableFromGrid(grid, headerIndex, file, source);
  if (table.rows.length > maxRows) {
    return fail({
      file,
      message: `has more than ${maxRows.toLocaleString('en-US')} data rows; split the workbook`,
    });
  }
  return ok(table);
}

function tableFromGrid(
  grid: SheetGrid,
  headerIndex: number,
  file: string,
  source: Omit<TableSource, 'encoding' | 'delimiter'>,
): DecodedTable {
  const headerRow = headerIndex + 1;
  const notes: DecoderNote[] = [];
  const names = headerNames(headerView(grid)[headerIndex] ?? []);
  const width = names.length;
  if (grid.hidden)
    notes.push({ code: 'hidden-sheet', message: `sheet "${grid.name}" is hidden in the workbook` });
  if (headerIndex > 0) {
    notes.push({
      code: 'above-header',
      row: headerRow,
      message: `the header is on row ${headerRow}; rows 1 to ${headerIndex} above it are not read`,
    });
  }

  let first = headerIndex + 1;
  // Rows whose only cells continue the header's vertical merges belong to the header.
  while (first < grid.rows.length) {
    const cells = grid.rows[first];
    const rowNumber = first + 1;
    const filled = cells.flatMap((cell, index) => (isBlankCell(cell) ? [] : [index]));
    const continuesHeader =
      filled.length > 0 &&
      filled.every(
        (index) => (grid.mergedInto.get(`${rowNumber}:${index + 1}`)?.row ?? Infinity) <= headerRow,
      );
    if (!continuesHeader) break;
    notes.push({
      code: 'merged-header',
      row: rowNumber,
      message: 'the row continues the merged header cells above it; it is not read',
    });
    first++;
  }

  let last = grid.rows.length - 1;
  while (last >= first && grid.rows[last].every(isBlankCell)) last--;
  const table: DecodedTable = {
    file,
    sheet: grid.name,
    headerRow,
    header: names,
    rows: [],
    source: { ...source },
    notes,
    blankRows: [],
  };
  const reportedMerges = new Set<string>();
  for (let index = first; index <= last; index++) {
    const rowNumber = index + 1;
    const raw = grid.rows[index];
    const cells: Cell[] = [];
    for (let column = 0; column < width; column++) {
      const key = `${rowNumber}:${column + 1}`;
      const master = grid.mergedInto.get(key);
      if (master) {
        const masterKey = `${master.row}:${master.column}`;
        const masterValue = grid.rows[master.row - 1]?.[master.column - 1] ?? null;
        if (!reportedMerges.has(masterKey) && !isBlankCell(masterValue)) {
          reportedMerges.add(masterKey);
          notes.push({
            code: 'merged-cell',
            row: rowNumber,
            column: names[column],
            message: `is merged with ${columnLetter(master.column - 1)}${master.row}; its value "${cellText(masterValue)}" is read there only`,
          });
        }
        cells.push(null);
        continue;
      }
      const formula = grid.uncachedFormulas.get(key);
      if (formula !== undefined) {
        notes.push({
          code: 'formula-without-value',
          row: rowNumber,
          column: names[column],
          message: `holds the formula =${formula} with no saved result; it is read as blank (open and save the workbook in a spreadsheet program to store results)`,
        });
      }
      cells.push(raw[column] ?? null);
    }
    if (cells.every(isBlankCell)) {
      table.blankRows!.push(rowNumber);
      continue;
    }
    const extra = raw.slice(width).some((cell) => !isBlankCell(cell));
    if (extra) {
      notes.push({
        code: 'extra-cells',
        row: rowNumber,
        message: `has cells beyond the header's ${width} columns; they are not read`,
      });
    }
    table.rows.push({ row: rowNumber, cells, ...(grid.hiddenRows.has(rowNumber) ? { hidden: true } : {}) });
  }
  return table;
}
