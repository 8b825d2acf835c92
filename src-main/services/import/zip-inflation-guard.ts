import { createInflateRaw } from 'node:zlib';
import type { Result } from '../../../shared-core/result.js';
import { fail, ok } from '../../../shared-core/result.js';
import { maxZipEntries, readZipDirectory, type ZipEntry } from '../zip-directory.js';
import { importLimits, megabytes, type ImportLimits } from './import-limits.js';

/** The archive's entries, or why they cannot be listed, in words naming the file. */
function zipEntries(bytes: Uint8Array, file: string): Result<ZipEntry[]> {
  const directory = readZipDirectory(bytes);
  if (directory.ok) return ok(directory.entries);
  switch (directory.problem) {
    case 'zip64':
      return fail({ file, message: 'is a ZIP64 archive, which no XLSX workbook of this size needs' });
    case 'too many entries':
      return fail({
        file,
        message: `holds ${directory.count} zip entries; more than ${maxZipEntries} are refused`,
      });
    case 'damaged':
      return fail({ file, message: 'is not a readable XLSX workbook (its zip structure is damaged)' });
  }
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
