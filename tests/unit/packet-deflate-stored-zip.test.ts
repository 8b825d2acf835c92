import { createRequire } from 'node:module';
import { describe, expect, it } from 'vitest';
import { deflateStoredEntries } from '../../src-main/services/packet/deflate-stored-zip.js';
import { readZipDirectory } from '../../src-main/services/zip-directory.js';

/**
 * Stored zip archives deflated with Node's zlib, read back by an independent zip reader: JSZip
 * (the library exceljs zips with), checking every CRC-32, so a header field copied wrongly fails.
 */
type JSZipClass = typeof import('jszip');
const JSZip = createRequire(createRequire(import.meta.url).resolve('exceljs'))('jszip') as JSZipClass;

const contents: Record<string, string | Uint8Array> = {
  '[Content_Types].xml':
    '<?xml version="1.0"?><Types>' + '<Default Extension="xml"/>'.repeat(200) + '</Types>',
  'xl/worksheets/sheet1.xml': Array.from(
    { length: 500 },
    (_, i) => `<row r="${i + 2}"><c>${i * 7}</c></row>`,
  ).join(''),
  'xl/empty.txt': '',
  'docProps/tiny.bin': new Uint8Array([7, 1, 9]),
  'xl/media/ünïcode näme.txt': 'Invented panel PX-200: 3 blemishes in 45 panels. '.repeat(30),
};

async function storedZip(options: { streamFiles: boolean }): Promise<Buffer> {
  const zip = new JSZip();
  for (const [name, value] of Object.entries(contents)) zip.file(name, value);
  zip.folder('xl/folder-of-nothing');
  return zip.generateAsync({ type: 'nodebuffer', compression: 'STORE', ...options });
}

async function readBack(bytes: Buffer): Promise<Record<string, Uint8Array>> {
  const zip = await JSZip.loadAsync(bytes, { checkCRC32: true });
  const files: Record<string, Uint8Array> = {};
  for (const [name, file] of Object.entries(zip.files)) {
    if (!file.dir) files[name] = await file.async('uint8array');
  }
  return files;
}

const asBytes = (value: string | Uint8Array) =>
  typeof value === 'string' ? new Uint8Array(Buffer.from(value, 'utf8')) : value;

describe('deflating the stored entries of a zip archive', () => {
  for (const streamFiles of [false, true]) {
    it(`keeps every entry's bytes, name and order${streamFiles ? ', from data descriptors' : ''}`, async () => {
      const before = await storedZip({ streamFiles });
      const after = deflateStoredEntries(before);
      const files = await readBack(after);
      expect(Object.keys(files).sort()).toEqual(Object.keys(contents).sort());
      for (const [name, value] of Object.entries(contents)) expect(files[name]).toEqual(asBytes(value));

      const listed = (bytes: Buffer) => {
        const directory = readZipDirectory(bytes);
        if (!directory.ok) throw new Error(directory.problem);
        return directory.entries;
      };
      const [old, fresh] = [listed(before), listed(after)];
      expect(fresh.map((e) => e.name)).toEqual(old.map((e) => e.name));
      const methods = Object.fromEntries(fresh.map((e) => [e.name, e.method]));
      expect(methods['xl/worksheets/sheet1.xml']).toBe(8);
      expect(methods['xl/empty.txt']).toBe(0); // nothing to deflate
      expect(methods['docProps/tiny.bin']).toBe(0); // deflating three bytes would grow them
      expect(methods['xl/folder-of-nothing/']).toBe(0);
      // Sizes and CRC-32 stand in the local headers, not in descriptors after the data, and agree
      // with the central directory's (APPNOTE 4.4.7 to 4.4.9): readers that stream an archive trust
      // the local headers.
      for (const entry of fresh) {
        expect(entry.flags & 0x8).toBe(0);
        const local = after.subarray(entry.local + 14, entry.local + 26);
        expect(local).toEqual(after.subarray(entry.central + 16, entry.central + 28));
        expect(after.readUInt16LE(entry.local + 8)).toBe(entry.method);
      }
      expect(after.length).toBeLessThan(before.length / 3);
    });
  }

  it('refuses what is not a zip archive', () => {
    expect(() => deflateStoredEntries(Buffer.from('not a zip archive at all, just text'))).toThrow(
      /cannot be read \(damaged\)/,
    );
  });
});
