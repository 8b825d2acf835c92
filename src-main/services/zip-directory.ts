/** One entry of a zip archive, as its central directory lists it. */
export interface ZipEntry {
  name: string;
  /** 0 stored, 8 deflated (the only methods XLSX uses). */
  method: number;
  /** General-purpose flags (bit 0: encrypted, bit 3: sizes in a data descriptor after the data). */
  flags: number;
  compressedSize: number;
  /** The entry's central header: where it starts and its length with name, extra field and comment. */
  central: number;
  centralLength: number;
  /** Where the entry's local header starts, and its data after that header's name and extra field. */
  local: number;
  dataStart: number;
}

export type ZipDirectory =
  | { ok: true; entries: ZipEntry[]; end: number }
  | { ok: false; problem: 'damaged' | 'zip64' | 'too many entries'; count?: number };

export const maxZipEntries = 10_000;

/**
 * The entries of a zip archive from its central directory (PKWARE APPNOTE 4.3.12 and 4.3.16: the
 * end-of-central-directory record, then one central header per entry pointing at its local header),
 * each checked to lie inside the archive. `end` is where the end record starts.
 */
export function readZipDirectory(bytes: Uint8Array): ZipDirectory {
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const damaged = { ok: false, problem: 'damaged' } as const;
  let end = -1;
  for (let i = bytes.length - 22; i >= Math.max(0, bytes.length - 22 - 0xffff); i--) {
    if (view.getUint32(i, true) === 0x06054b50) {
      end = i;
      break;
    }
  }
  if (end < 0) return damaged;
  const count = view.getUint16(end + 10, true);
  let offset = view.getUint32(end + 16, true);
  if (count === 0xffff || offset === 0xffffffff) return { ok: false, problem: 'zip64' };
  if (count > maxZipEntries) return { ok: false, problem: 'too many entries', count };
  const entries: ZipEntry[] = [];
  const decoder = new TextDecoder();
  for (let i = 0; i < count; i++) {
    if (offset + 46 > bytes.length || view.getUint32(offset, true) !== 0x02014b50) return damaged;
    const nameLength = view.getUint16(offset + 28, true);
    const centralLength =
      46 + nameLength + view.getUint16(offset + 30, true) + view.getUint16(offset + 32, true);
    const local = view.getUint32(offset + 42, true);
    if (local + 30 > bytes.length || view.getUint32(local, true) !== 0x04034b50) return damaged;
    const dataStart = local + 30 + view.getUint16(local + 26, true) + view.getUint16(local + 28, true);
    const compressedSize = view.getUint32(offset + 20, true);
    if (dataStart + compressedSize > bytes.length) return damaged;
    entries.push({
      name: decoder.decode(bytes.subarray(offset + 46, offset + 46 + nameLength)),
      method: view.getUint16(offset + 10, true),
      flags: view.getUint16(offset + 8, true),
      compressedSize,
      central: offset,
      centralLength,
      local,
      dataStart,
    });
    offset += centralLength;
  }
  return { ok: true, entries, end };
}
