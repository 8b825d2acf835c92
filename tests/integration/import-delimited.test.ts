import { mkdtemp, rm, writeFile } from 'node:fs/promises';
import { createHash } from 'node:crypto';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { importFile, importPastedText, previewBytes } from '../../src-main/services/import/import-file.js';
import type { ImportRequest } from '../../src-main/services/import/import-request.js';
import { describeFinding } from '../../shared-core/result.js';

let dir: string;
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'll-import-'));
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

async function write(name: string, bytes: Uint8Array | string): Promise<string> {
  const path = join(dir, name);
  await writeFile(path, bytes);
  return path;
}

async function imported(path: string, request: ImportRequest) {
  const result = await importFile(path, request);
  if (!result.ok) throw new Error(result.findings.map(describeFinding).join('\n'));
  return result.value;
}

const mapping: ImportRequest = { count: 'defects', units: 'boards', label: 'lot' };
// Invented lots of an invented plant; the labels carry accented letters and the euro sign.
const rows = [
  ['lot', 'defects', 'boards'],
  ['Lé-01', '3', '50'],
  ['L€-02', '1', '48'],
];
const expected = [
  { label: 'Lé-01', row: 2, count: 3, units: 50 },
  { label: 'L€-02', row: 3, count: 1, units: 48 },
];
const csv = rows.map((r) => r.join(',')).join('\r\n') + '\r\n';

/** UTF-16 code units in the given byte order (the Unicode standard's encoding forms). */
function utf16(text: string, order: 'le' | 'be'): Uint8Array {
  const bytes = new Uint8Array(2 + text.length * 2);
  const view = new DataView(bytes.buffer);
  view.setUint16(0, 0xfeff, order === 'le');
  for (let i = 0; i < text.length; i++) view.setUint16(2 + i * 2, text.charCodeAt(i), order === 'le');
  return bytes;
}

/** Windows-1252 bytes, written by hand from its code chart: é is 0xE9, € is 0x80 (from memory). */
function windows1252(text: string): Uint8Array {
  return Uint8Array.from([...text].map((ch) => (ch === '€' ? 0x80 : ch === 'é' ? 0xe9 : ch.charCodeAt(0))));
}

describe('importFile: encodings', () => {
  it.each([
    ['utf8.csv', new TextEncoder().encode(csv), 'utf-8', 'detected'],
    ['utf8-bom.csv', Uint8Array.from([0xef, 0xbb, 0xbf, ...new TextEncoder().encode(csv)]), 'utf-8', 'bom'],
    ['utf16le.txt', utf16(csv.replaceAll(',', '\t'), 'le'), 'utf-16le', 'bom'],
    ['utf16be.txt', utf16(csv.replaceAll(',', '\t'), 'be'), 'utf-16be', 'bom'],
    ['cp1252.csv', windows1252(csv), 'windows-1252', 'detected'],
  ])('reads %s as %s (%s)', async (name, bytes, encoding, source) => {
    const path = await write(name, bytes);
    const outcome = await imported(path, mapping);
    expect(outcome.observations).toEqual(expected);
    expect(outcome.report.settings).toMatchObject({ encoding, encodingSource: source });
    expect(outcome.report.sha256).toBe(createHash('sha256').update(bytes).digest('hex'));
    expect(outcome.report.bytes).toBe(bytes.length);
    expect(outcome.report.settings.headerRow).toBe(1);
  });

  it('reads UTF-16 without a byte-order mark only when named, and says so otherwise', async () => {
    const path = await write('utf16-nobom.txt', utf16(csv, 'le').subarray(2));
    const refused = await importFile(path, mapping);
    expect(refused.ok).toBe(false);
    expect(!refused.ok && describeFinding(refused.findings[0])).toContain('--encoding utf-16le');
    const outcome = await imported(path, { ...mapping, encoding: 'utf-16le' });
    expect(outcome.observations).toEqual(expected);
  });
});

describe('importFile: delimiters, quotes and decimal marks', () => {
  it.each([
    ['semicolon', ';'],
    ['tab', '\t'],
    ['pipe', '|'],
    ['comma', ','],
  ])('detects the %s delimiter', async (name, delimiter) => {
    const path = await write(`${name}.txt`, rows.map((r) => r.join(delimiter)).join('\n'));
    const outcome = await imported(path, mapping);
    expect(outcome.observations).toEqual(expected);
    expect(outcome.report.settings).toMatchObject({ delimiter, delimiterSource: 'detected' });
  });

  it('reads a semicolon file with decimal commas and thousands points, recording each changed cell', async () => {
    const text = 'Los;Fehler;Fläche\nA;3;1.250,5\nB;12;12,25\n';
    const outcome = await imported(await write('de.csv', text), {
      count: 'Fehler',
      units: 'Fläche',
      label: 'Los',
    });
    expect(outcome.observations.map((o) => o.units)).toEqual([1250.5, 12.25]);
    expect(outcome.report.settings).toMatchObject({ decimal: 'comma', decimalSource: 'detected' });
    expect(outcome.report.changedCells).toEqual([
      { row: 2, column: 'Fläche', from: '1.250,5', to: '1250.5' },
      { row: 3, column: 'Fläche', from: '12,25', to: '12.25' },
    ]);
  });

  it('reads quoted fields holding delimiters, quotes and line breaks, numbering rows as records', async () => {
    const text =
      'lot,defects,boards,note\n"L,1",2,10,"line one\nline two"\n"L ""2""",3,10,plain\nL3,"1,000",1000,\n\n\n';
    const outcome = await imported(await write('quoted.csv', text), mapping);
    expect(outcome.observations).toEqual([
      { label: 'L,1', row: 2, count: 2, units: 10 },
      { label: 'L "2"', row: 3, count: 3, units: 10 },
      { label: 'L3', row: 4, count: 1000, units: 1000 },
    ]);
    expect(outcome.report.blankRows).toEqual([]); // trailing blank lines are not rows
    expect(outcome.report.changedCells).toEqual([{ row: 4, column: 'defects', from: '1,000', to: '1000' }]);
  });

  it('lists blank rows between data rows and finds the header below title rows', async () => {
    const text = 'Invented plant, line 4\nexported 2026-03-01\nlot,defects,boards\nA,1,10\n,,\nB,2,10\n';
    const outcome = await imported(await write('titled.csv', text), mapping);
    expect(outcome.report.settings.headerRow).toBe(3);
    expect(outcome.observations.map((o) => o.row)).toEqual([4, 6]);
    expect(outcome.report.blankRows).toEqual([5]);
    expect(outcome.report.warnings).toContainEqual(expect.objectContaining({ code: 'above-header' }));
  });

  it('takes the delimiter from a "sep=" first line and numbers rows after it, as spreadsheets do', async () => {
    const outcome = await imported(
      await write('sep.csv', 'sep=;\r\nlot;defects;boards\r\nA;1,5;10\r\n'),
      mapping,
    );
    expect(outcome.report.settings).toMatchObject({ delimiter: ';', headerRow: 1 });
    expect(outcome.rejected).toEqual([
      { row: 2, column: 'defects', value: '1,5', message: 'is not a whole number of nonconformities' },
    ]);
  });

  it('takes a named delimiter over the detected one', async () => {
    const path = await write('named.txt', 'lot;defects;boards\nA;1;10\n');
    const outcome = await imported(path, { ...mapping, delimiter: ';' });
    expect(outcome.report.settings).toMatchObject({ delimiter: ';', delimiterSource: 'given' });
  });

  it('refuses an unterminated quote, naming its row', async () => {
    const result = await importFile(
      await write('open-quote.csv', 'lot,defects,boards\nA,1,10\n"B,2,10\n'),
      mapping,
    );
    expect(result.ok).toBe(false);
    expect(!result.ok && describeFinding(result.findings[0])).toMatch(
      /^open-quote\.csv, row 3: .*never closed/,
    );
  });
});

describe('importFile: limits and errors', () => {
  it('refuses a file over the size limit before reading it', async () => {
    const path = await write('big.csv', csv);
    const result = await importFile(path, mapping, undefined, { limits: { maxFileBytes: 10 } });
    expect(result.ok).toBe(false);
    expect(!result.ok && result.findings[0].message).toContain('are refused');
  });

  it('refuses more data rows than the row limit', async () => {
    const path = await write('rows.csv', csv);
    const result = await importFile(path, mapping, undefined, { limits: { maxRows: 1 } });
    expect(result.ok).toBe(false);
    expect(!result.ok && result.findings[0].message).toContain('more than 1 data rows');
  });

  it('names a file that cannot be opened', async () => {
    const result = await importFile(join(dir, 'missing.csv'), mapping);
    expect(result).toMatchObject({
      ok: false,
      findings: [{ file: 'missing.csv', message: expect.stringContaining('ENOENT') }],
    });
  });

  it('names a folder given as a file instead of throwing', async () => {
    const result = await importFile(dir, mapping);
    expect(result).toMatchObject({ ok: false, findings: [{ message: expect.stringContaining('EISDIR') }] });
  });

  it('stops when cancelled', async () => {
    const controller = new AbortController();
    controller.abort();
    const result = await importFile(await write('cancel.csv', csv), mapping, controller.signal);
    expect(result).toMatchObject({ ok: false, findings: [{ message: 'the import was cancelled' }] });
  });
});

describe('previewBytes', () => {
  it('shows the decoded first rows and suggests a mapping before anything is validated', async () => {
    const bytes = new TextEncoder().encode('Lot;Defects;Boards\nA;3;50\nB;x;48\n');
    const result = await previewBytes('p.csv', bytes);
    expect(result).toMatchObject({
      ok: true,
      value: {
        headerRow: 1,
        header: ['Lot', 'Defects', 'Boards'],
        rows: [
          { row: 2, cells: ['A', '3', '50'] },
          { row: 3, cells: ['B', 'x', '48'] },
        ],
        suggested: { count: 'Defects', units: 'Boards', label: 'Lot' },
      },
    });
  });
});

describe('importPastedText', () => {
  it('reads cells copied from a spreadsheet (tab-separated) through the same path', async () => {
    const result = await importPastedText(
      'lot\tdefects\tboards\r\nLé-01\t3\t50\r\nL€-02\t1\t48\r\n',
      mapping,
    );
    expect(result).toMatchObject({ ok: true, value: { observations: expected } });
    if (result.ok) expect(result.value.report.settings).toMatchObject({ format: 'paste', delimiter: '\t' });
  });
});
