import { deflateRawSync, crc32 } from 'node:zlib';
import { mkdtemp, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import ExcelJS from 'exceljs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { importBytes, importFile } from '../../src-main/services/import/import-file.js';
import { checkZipInflation } from '../../src-main/services/import/zip-inflation-guard.js';
import type { ImportRequest } from '../../src-main/services/import/import-request.js';
import { describeFinding } from '../../shared-core/result.js';

let dir: string;
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'll-xlsx-'));
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

async function saved(workbook: ExcelJS.Workbook, name: string): Promise<string> {
  const path = join(dir, name);
  await writeFile(path, new Uint8Array(await workbook.xlsx.writeBuffer()));
  return path;
}

async function imported(path: string, request: ImportRequest) {
  const result = await importFile(path, request);
  if (!result.ok) throw new Error(result.findings.map(describeFinding).join('\n'));
  return result.value;
}

const mapping: ImportRequest = { count: 'Defects', units: 'Boards', label: 'Lot', date: 'Date' };

/** An invented plant's inspection log: a notes sheet, then the data under a title and a merged header. */
function inspectionLog(): ExcelJS.Workbook {
  const workbook = new ExcelJS.Workbook();
  workbook.addWorksheet('Notes').addRow(['Invented data for tests; no real plant.']);
  const sheet = workbook.addWorksheet('Line 4');
  sheet.addRow(['Line 4 solder inspection (invented)']); // row 1: a title
  sheet.addRow([]); // row 2: blank
  sheet.addRow(['Lot', 'Date', 'Defects', '', 'Boards']); // row 3: the header, Defects merged over C:D
  sheet.mergeCells('C3:D3');
  sheet.addRow(['A-1', new Date(Date.UTC(2026, 2, 2)), 3, null, 50]);
  sheet.addRow(['A-2', new Date(Date.UTC(2026, 2, 3)), { formula: 'C4+1', result: 4 }, null, 50]);
  sheet.addRow([
    { richText: [{ text: 'A-' }, { text: '3', font: { bold: true } }] },
    new Date(Date.UTC(2026, 2, 4)),
    2,
    null,
    48,
  ]);
  sheet.addRow(['A-4', new Date(Date.UTC(2026, 2, 5)), { formula: 'C6*2' }, null, 50]);
  sheet.addRow(['A-5', new Date(Date.UTC(2026, 2, 6)), 1, null, 50]);
  sheet.getRow(8).hidden = true;
  sheet.addRow([]);
  sheet.addRow([]);
  return workbook;
}

describe('importFile: XLSX', () => {
  it('finds the sheet and the header, reads formulas by their saved result and reports what it met', async () => {
    const outcome = await imported(await saved(inspectionLog(), 'log.xlsx'), mapping);
    expect(outcome.report.settings).toMatchObject({ sheet: 'Line 4', headerRow: 3, format: 'xlsx' });
    expect(outcome.report.location).toBe('log.xlsx, sheet "Line 4"');
    expect(outcome.observations).toEqual([
      { label: 'A-1', row: 4, count: 3, units: 50, date: '2026-03-02' },
      { label: 'A-2', row: 5, count: 4, units: 50, date: '2026-03-03' },
      { label: 'A-3', row: 6, count: 2, units: 48, date: '2026-03-04' },
      { label: 'A-5', row: 8, count: 1, units: 50, date: '2026-03-06' },
    ]);
    expect(outcome.rejected).toEqual([
      { row: 7, column: 'Defects', value: '', message: 'the cell is blank; a blank is never read as 0' },
    ]);
    const codes = outcome.report.warnings.map((w) => [w.code, w.row]);
    expect(codes).toContainEqual(['formula-without-value', 7]);
    expect(codes).toContainEqual(['hidden-row', 8]);
    expect(codes).toContainEqual(['above-header', 3]);
    const formula = outcome.report.warnings.find((w) => w.code === 'formula-without-value');
    expect(formula?.message).toContain('=C6*2');
    expect(outcome.report.rowsRead).toBe(5);
  });

  it('names a merged header by its first column and gives the other columns their letter', async () => {
    const result = await importFile(await saved(inspectionLog(), 'merged.xlsx'), { count: 'Defects (D)' });
    expect(result.ok).toBe(true);
    if (!result.ok) return;
    expect(result.value.rejected[0]).toMatchObject({
      column: 'Defects (D)',
      message: expect.stringContaining('blank'),
    });
  });

  it('reads the sheet named with --sheet, and lists the sheets when it does not exist', async () => {
    const path = await saved(inspectionLog(), 'sheets.xlsx');
    const outcome = await imported(path, { ...mapping, sheet: 'line 4' });
    expect(outcome.report.settings.sheet).toBe('Line 4');
    const missing = await importFile(path, { ...mapping, sheet: 'Line 5' });
    expect(!missing.ok && describeFinding(missing.findings[0])).toBe(
      'sheets.xlsx: has no sheet "Line 5" (sheets: "Notes", "Line 4")',
    );
  });

  it('names the sheet, the header row and the columns found when a column is missing', async () => {
    const result = await importFile(await saved(inspectionLog(), 'nocol.xlsx'), {
      count: 'Faults',
      sheet: 'Line 4',
    });
    expect(!result.ok && describeFinding(result.findings[0])).toBe(
      'nocol.xlsx, sheet "Line 4", row 1, column "Faults": there is no column "Faults" in the header row (columns found: "Line 4 solder inspection (invented)")',
    );
  });

  // Serial day numbers of the two date systems (Microsoft's "Date systems in Excel", from memory):
  // in the 1900 system day 1 is 1900-01-01 and, because of the phantom 1900-02-29, any day after
  // February 1900 is 1899-12-30 plus the serial; in the 1904 system day 0 is 1904-01-01.
  const dayMs = 86_400_000;
  const iso = (ms: number) => new Date(ms).toISOString().slice(0, 10);

  it.each([
    [false, 46083, iso(Date.UTC(1899, 11, 30) + 46083 * dayMs)],
    [true, 44621, iso(Date.UTC(1904, 0, 1) + 44621 * dayMs)],
  ])('reads date serials by the workbook date system (1904: %s)', async (date1904, serial, expected) => {
    const workbook = new ExcelJS.Workbook();
    workbook.properties.date1904 = date1904;
    const sheet = workbook.addWorksheet('Data');
    sheet.addRow(['Date', 'Defects']);
    sheet.addRow([serial, 2]);
    sheet.getCell('A2').numFmt = 'yyyy-mm-dd';
    const outcome = await imported(await saved(workbook, `serial-${date1904}.xlsx`), {
      count: 'Defects',
      date: 'Date',
    });
    expect(outcome.observations[0].date).toBe(expected);
    expect(expected).toBe('2026-03-02'); // both serials name the same day: the systems differ by 1462 days
  });

  it('reads decimal-comma text in a workbook only once the mark is decided, recording the change', async () => {
    const workbook = new ExcelJS.Workbook();
    const sheet = workbook.addWorksheet('Data');
    sheet.addRow(['Defects', 'Area']);
    sheet.addRow([1, '2,5']);
    const outcome = await imported(await saved(workbook, 'text-number.xlsx'), {
      count: 'Defects',
      units: 'Area',
    });
    expect(outcome.observations[0].units).toBe(2.5);
    expect(outcome.report.changedCells).toEqual([{ row: 2, column: 'Area', from: '2,5', to: '2.5' }]);
  });

  it('refuses an old binary .xls workbook with advice', async () => {
    const bytes = Uint8Array.from([0xd0, 0xcf, 0x11, 0xe0, 0xa1, 0xb1, 0x1a, 0xe1, 0, 0]);
    const result = await importBytes('old.xls', bytes, mapping);
    expect(!result.ok && result.findings[0].message).toContain('.xlsx');
  });

  it('refuses a damaged workbook with a message instead of throwing', async () => {
    const bytes = new Uint8Array(await inspectionLog().xlsx.writeBuffer());
    const damaged = bytes.slice(0, Math.floor(bytes.length / 2));
    const result = await importBytes('damaged.xlsx', damaged, mapping);
    expect(result.ok).toBe(false);
    expect(!result.ok && result.findings[0].file).toBe('damaged.xlsx');
  });
});

/**
 * A zip archive written byte by byte (PKWARE APPNOTE: local headers, data, central directory, end
 * record), whose headers may declare sizes that lie.
 */
function zipArchive(entries: { name: string; data: Uint8Array; declaredSize?: number }[]): Uint8Array {
  const parts: Buffer[] = [];
  const central: Buffer[] = [];
  let offset = 0;
  for (const entry of entries) {
    const name = Buffer.from(entry.name);
    const compressed = deflateRawSync(entry.data, { level: 9 });
    const declared = entry.declaredSize ?? entry.data.length;
    const local = Buffer.alloc(30);
    local.writeUInt32LE(0x04034b50, 0);
    local.writeUInt16LE(20, 4);
    local.writeUInt16LE(8, 8);
    local.writeUInt32LE(crc32(entry.data), 14);
    local.writeUInt32LE(compressed.length, 18);
    local.writeUInt32LE(declared, 22);
    local.writeUInt16LE(name.length, 26);
    const header = Buffer.alloc(46);
    header.writeUInt32LE(0x02014b50, 0);
    header.writeUInt16LE(20, 4);
    header.writeUInt16LE(20, 6);
    header.writeUInt16LE(8, 10);
    header.writeUInt32LE(crc32(entry.data), 16);
    header.writeUInt32LE(compressed.length, 20);
    header.writeUInt32LE(declared, 24);
    header.writeUInt16LE(name.length, 28);
    header.writeUInt32LE(offset, 42);
    parts.push(local, name, compressed);
    central.push(header, name);
    offset += local.length + name.length + compressed.length;
  }
  const directory = Buffer.concat(central);
  const end = Buffer.alloc(22);
  end.writeUInt32LE(0x06054b50, 0);
  end.writeUInt16LE(entries.length, 8);
  end.writeUInt16LE(entries.length, 10);
  end.writeUInt32LE(directory.length, 12);
  end.writeUInt32LE(offset, 16);
  return new Uint8Array(Buffer.concat([...parts, directory, end]));
}

describe('zip bombs', () => {
  it('stops a real zip bomb whose headers declare a tiny size, by the bytes actually inflated', async () => {
    // 64 MB of zeros deflate to about 64 KB: a ratio near deflate's maximum of about 1032:1.
    const bomb = zipArchive([
      { name: '[Content_Types].xml', data: Buffer.from('<Types/>') },
      { name: 'xl/worksheets/sheet1.xml', data: Buffer.alloc(64 * 1024 * 1024), declaredSize: 1000 },
    ]);
    expect(bomb.length).toBeLessThan(200 * 1024);
    const result = await importBytes('bomb.xlsx', bomb, mapping);
    expect(result.ok).toBe(false);
    expect(!result.ok && describeFinding(result.findings[0])).toMatch(
      /^bomb\.xlsx: is refused: zip entry "xl\/worksheets\/sheet1\.xml" inflates to more than 200 times its compressed size/,
    );
  });

  it('caps the total inflated across entries, each of which looks modest', async () => {
    const entries = [1, 2, 3].map((n) => ({
      name: `xl/part${n}.xml`,
      data: Buffer.alloc(3 * 1024 * 1024, 32),
    }));
    const result = await checkZipInflation(zipArchive(entries), 'many.xlsx', {
      maxInflatedBytes: 8 * 1024 * 1024,
    });
    expect(!result.ok && result.findings[0].message).toContain('more than 8 MB in total');
    const allowed = await checkZipInflation(zipArchive(entries), 'many.xlsx', {
      maxInflatedBytes: 10 * 1024 * 1024,
    });
    expect(allowed).toEqual({ ok: true, value: { entries: 3, inflatedBytes: 9 * 1024 * 1024 } });
  });

  it('lets an ordinary workbook through, counting what it inflates', async () => {
    const bytes = new Uint8Array(await inspectionLog().xlsx.writeBuffer());
    const result = await checkZipInflation(bytes, 'log.xlsx');
    expect(result.ok && result.value.inflatedBytes).toBeGreaterThan(bytes.length);
  });
});
