import { createHash } from 'node:crypto';
import ExcelJS from 'exceljs';
import { cellText, type DecodedTable } from '../../../shared-core/import/decoded-table.js';
import { fail, ok, type Result } from '../../../shared-core/result.js';
import { decodeText } from './decode-text.js';
import { delimitedTable } from './delimited-table.js';
import { xlsxTable } from './xlsx-table.js';
import { checkZipInflation } from './zip-inflation-guard.js';

export interface DataPreview {
  sheets: string[];
  columns: string[];
  preview: string[][];
}

/**
 * A first look at a data file for the column mapping: its sheets (for a workbook), the header's
 * column names and the first rows as text. It uses the import service's own readers, so what the
 * preview shows is what the import will read; a workbook is checked for zip bombs first.
 */
export async function inspectData(
  fileName: string,
  bytes: Uint8Array,
  rows = 8,
): Promise<Result<DataPreview>> {
  const source = { sha256: createHash('sha256').update(bytes).digest('hex'), bytes: bytes.byteLength };
  const isZip = bytes[0] === 0x50 && bytes[1] === 0x4b && bytes[2] === 0x03 && bytes[3] === 0x04;
  let table: Result<DecodedTable>;
  let sheets: string[] = [];
  if (isZip) {
    const checked = await checkZipInflation(bytes, fileName);
    if (!checked.ok) return checked;
    const workbook = new ExcelJS.Workbook();
    try {
      // exceljs types its argument as an ArrayBuffer but reads a Node Buffer.
      await workbook.xlsx.load(
        Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength) as unknown as ArrayBuffer,
      );
    } catch (error) {
      return fail({
        file: fileName,
        message: `is not a readable XLSX workbook (${(error as Error).message})`,
      });
    }
    sheets = workbook.worksheets.map((sheet) => sheet.name);
    table = await xlsxTable(bytes, fileName, { format: 'xlsx', ...source });
  } else {
    const decoded = decodeText(bytes, fileName);
    if (!decoded.ok) return decoded;
    table = delimitedTable(decoded.value.text, fileName, {
      format: 'delimited',
      ...source,
      encoding: decoded.value.encoding,
      encodingSource: decoded.value.source,
    });
  }
  if (!table.ok) return table;
  return ok({
    sheets,
    columns: table.value.header,
    preview: table.value.rows.slice(0, rows).map((row) => row.cells.map(cellText)),
  });
}
