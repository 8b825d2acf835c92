import { createInflateRaw } from 'node:zlib';
import type { Result } from '../../../shared-core/result.js';
import { fail, ok } from '../../../shared-core/result.js';
import { importLimits, megabytes, type ImportLimits } from './import-limits.js';

interface ZipEntry {
  name: string;
  method: number;
  compressedSize: number;
  dataStart: number;
}

const maxEntries = 10_000;

/**
 * The entries of a zip archive from its central directory (PKWARE APPNOTE 4.3.12 and 4.3.16: the
 * end-of-central-directory record, then one central header per entry pointing at its local header).
 */
function zipEntries(bytes: Uint8Array, file: string): Result<ZipEntry[]> {
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const notZip = () =>
    fail<ZipEntry[]>({ file, message: 'is not a readable XLSX workbook (its zip structure is damaged)' });
  let end = -1;
  for (let i = bytes.length - 22; i >= Math.max(0, bytes.length - 22 - 0xffff); i--) {
    if (view.getUint32(i, true) === 0x06054b50) {
      end = i;
      break;
    }
  }
  if (end < 0) return notZip();
  const count = view.getUint16(end + 10, true);
  let offset = view.getUint32(end + 16, true);
  if (count === 0xffff || offset === 0xffffffff)
    return fail({ file, message: 'is a ZIP64 archive, which no XLSX workbook of this size needs' });
  if (count > maxEntries)
    return fail({ file, message: `holds ${count} zip entries; more than ${maxEntries} are refused` });
  const entries: ZipEntry[] = [];
  const decoder = new TextDecoder();
  for (let i = 0; i < count; i++) {
    if (offset + 46 > bytes.length || view.getUint32(offset, true) !== 0x02014b50) return notZip();
    const method = view.getUint16(offset + 10, true);
    const compressedSize = view.getUint32(offset + 20, true);
    const nameLength = view.getUint16(offset + 28, true);
    const extraLength = view.getUint16(offset + 30, true);
    const commentLength = view.getUint16(offset + 32, true);
    const local = view.getUint32(offset + 42, true);
    const name = decoder.decode(bytes.subarray(offset + 46, offset + 46 + nameLength));
    if (local + 30 > bytes.length || view.getUint32(local, true) !== 0x04034b50) return notZip();
    const dataStart = local + 30 + view.getUint16(local + 26, true) + view.getUint16(local + 28, true);
    if (dataStart + compressedSize > bytes.length) return notZip();
    entries.push({ name, method, compressedSize, dataStart });
    offset += 46 + nameLength + extraLength + commentLength;
  }
  return ok(entries);
}

/** Inflates one entry, counting bytes and stopping as soon as the cap is passed. */
function inflatedSize(
  data: Uint8Array,
  cap: number,
  signal?: AbortSignal,
): Promise<number | 'over' | 'damaged' | 'cancelled'> {
  return new Promise((resolve) => {
    const inflate = createInflateRaw();
    let total = 0;
    let settled = false;
    const settle = (value: number | 'over' | 'damaged' | 'cancelled') => {
      if (settled) return;
      settled = true;
      inflate.destroy();
      resolve(value);
    };
    inflate.on('data', (chunk: Buffer) => {
      total += chunk.length;
      if (total > cap) settle('over');
      else if (signal?.aborted) settle('cancelled');
    });
    inflate.on('error', () => settle('damaged'));
    inflate.on('end', () => settle(total));
    inflate.end(data);
  });
}

/**
 * Checks an XLSX (zip) file by inflating every entry and counting the bytes that actually come
 * out, whatever the headers declare: the total is capped, and each entry's ratio of inflated to
 * compressed bytes is capped beyond a small floor, so a zip bomb stops early. Only then is the
 * workbook handed to the reader, which inflates it again.
 */
export async function checkZipInflation(
  bytes: Uint8Array,
  file: string,
  limits: Partial<ImportLimits> = {},
  signal?: AbortSignal,
): Promise<Result<{ entries: number; inflatedBytes: number }>> {
  const { maxInflatedBytes, maxEntryRatio, ratioFloorBytes } = { ...importLimits, ...limits };
  const listed = zipEntries(bytes, file);
  if (!listed.ok) return listed;
  let total = 0;
  for (const entry of listed.value) {
    const data = bytes.subarray(entry.dataStart, entry.dataStart + entry.compressedSize);
    const entryCap = Math.max(ratioFloorBytes, maxEntryRatio * entry.compressedSize);
    const cap = Math.min(entryCap, maxInflatedBytes - total);
    let size: number | 'over' | 'damaged' | 'cancelled';
    if (entry.method === 0) size = data.length > cap ? 'over' : data.length;
    else if (entry.method === 8) size = await inflatedSize(data, cap, signal);
    else
      return fail({
        file,
        message: `zip entry "${entry.name}" uses compression method ${entry.method}, which XLSX does not use`,
      });
    if (size === 'cancelled') return fail({ file, message: 'the import was cancelled' });
    if (size === 'damaged')
      return fail({ file, message: `zip entry "${entry.name}" is damaged and cannot be inflated` });
    if (size === 'over') {
      const why =
        cap < entryCap
          ? `the workbook inflates to more than ${megabytes(maxInflatedBytes)} in total`
          : `zip entry "${entry.name}" inflates to more than ${maxEntryRatio} times its compressed size`;
      return fail({ file, message: `is refused: ${why} (a zip bomb or a damaged file)` });
    }
    total += size;
  }
  return ok({ entries: listed.value.length, inflatedBytes: total });
}
