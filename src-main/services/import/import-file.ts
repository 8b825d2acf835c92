import { createHash } from 'node:crypto';
import { open } from 'node:fs/promises';
import { basename } from 'node:path';
import type { DecodedTable } from '../../../shared-core/import/decoded-table.js';
import type { ImportOutcome } from '../../../shared-core/import/import-report.js';
import { readObservations } from '../../../shared-core/import/read-observations.js';
import type { Result } from '../../../shared-core/result.js';
import { fail } from '../../../shared-core/result.js';
import { decodeText } from './decode-text.js';
import { delimitedTable } from './delimited-table.js';
import { importLimits, megabytes, type ImportLimits } from './import-limits.js';
import type { ImportRequest, ProgressListener } from './import-request.js';

export interface ImportOptions {
  onProgress?: ProgressListener;
  limits?: Partial<ImportLimits>;
}

const sha256 = (bytes: Uint8Array) => createHash('sha256').update(bytes).digest('hex');

const cancelled = (file: string) => fail<ImportOutcome>({ file, message: 'the import was cancelled' });

/** Column names the header must hold, used to find the header row below any title rows. */
function wantedColumns(request: ImportRequest): string[] {
  return [request.count, request.units, request.label, request.date].filter(
    (name): name is string => typeof name === 'string' && name !== '',
  );
}

function outcomeFromTable(table: DecodedTable, request: ImportRequest): Result<ImportOutcome> {
  const { count, units, label, date, decimal, dateOrder, inspectionUnit } = request;
  return readObservations(table, { count, units, label, date }, { decimal, dateOrder, inspectionUnit });
}

/**
 * Periods from the bytes of a delimited text file or a workbook (files that arrive as uploads in
 * the browser host). `fileName` names the source in every message.
 */
export async function importBytes(
  fileName: string,
  bytes: Uint8Array,
  request: ImportRequest,
  signal?: AbortSignal,
  options: ImportOptions = {},
): Promise<Result<ImportOutcome>> {
  const limits = { ...importLimits, ...options.limits };
  const file = fileName;
  if (bytes.byteLength > limits.maxFileBytes) {
    return fail({
      file,
      message: `is ${megabytes(bytes.byteLength)}; files over ${megabytes(limits.maxFileBytes)} are refused`,
    });
  }
  if (signal?.aborted) return cancelled(file);
  options.onProgress?.({ phase: 'decoding' });
  const source = { sha256: sha256(bytes), bytes: bytes.byteLength };
  const decoded = decodeText(bytes, file, request.encoding);
  if (!decoded.ok) return decoded;
  const table = delimitedTable(
    decoded.value.text,
    file,
    {
      format: 'delimited',
      ...source,
      encoding: decoded.value.encoding,
      encodingSource: decoded.value.source,
    },
    { delimiter: request.delimiter, headerNames: wantedColumns(request), limits },
  );
  if (!table.ok) return table;
  if (signal?.aborted) return cancelled(file);
  options.onProgress?.({ phase: 'validating' });
  return outcomeFromTable(table.value, request);
}

/** Periods from a file on disk; files over the size limit are refused before they are read. */
export async function importFile(
  path: string,
  request: ImportRequest,
  signal?: AbortSignal,
  options: ImportOptions = {},
): Promise<Result<ImportOutcome>> {
  const limits = { ...importLimits, ...options.limits };
  const file = basename(path);
  let handle;
  try {
    handle = await open(path, 'r');
  } catch (error) {
    return fail({
      file,
      message: `cannot be opened (${(error as NodeJS.ErrnoException).code ?? String(error)})`,
    });
  }
  try {
    const { size } = await handle.stat();
    if (size > limits.maxFileBytes) {
      return fail({
        file,
        message: `is ${megabytes(size)}; files over ${megabytes(limits.maxFileBytes)} are refused`,
      });
    }
    options.onProgress?.({ phase: 'reading', fraction: 0 });
    const bytes = new Uint8Array(size);
    let offset = 0;
    while (offset < size) {
      if (signal?.aborted) return cancelled(file);
      const { bytesRead } = await handle.read(
        bytes,
        offset,
        Math.min(size - offset, 4 * 1024 * 1024),
        offset,
      );
      if (bytesRead === 0) break;
      offset += bytesRead;
      options.onProgress?.({ phase: 'reading', fraction: offset / size });
    }
    return await importBytes(file, bytes.subarray(0, offset), request, signal, options);
  } finally {
    await handle.close();
  }
}

/**
 * Periods from text pasted from the clipboard: spreadsheets copy cells as tab-separated text,
 * which takes the same path as a file (tab unless another delimiter is named).
 */
export async function importPastedText(
  text: string,
  request: ImportRequest,
  signal?: AbortSignal,
  options: ImportOptions = {},
): Promise<Result<ImportOutcome>> {
  const file = 'pasted cells';
  if (signal?.aborted) return cancelled(file);
  const bytes = new TextEncoder().encode(text);
  const table = delimitedTable(
    text,
    file,
    {
      format: 'paste',
      sha256: sha256(bytes),
      bytes: bytes.byteLength,
      encoding: 'utf-8',
      encodingSource: 'given',
    },
    {
      delimiter: request.delimiter ?? '\t',
      headerNames: wantedColumns(request),
      limits: { ...importLimits, ...options.limits },
    },
  );
  if (!table.ok) return table;
  return outcomeFromTable(table.value, request);
}
