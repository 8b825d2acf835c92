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
import { checkZipInflation } from './zip-inflation-guard.js';
import { xlsxTable } from './xlsx-table.js';
import { importLimits, megabytes, type ImportLimits } from './import-limits.js';
import type { ImportRequest, ProgressListener } from './import-request.js';

export interface ImportOptions {
  onProgress?: ProgressListener;
  limits?: Partial<ImportLimits>;
}

/** XLSX is a zip archive (PK\x03\x04); the old binary .xls is an OLE compound file. */
function fileKind(bytes: Uint8Array): 'zip' | 'xls' | 'text' {
  if (bytes[0] === 0x50 && bytes[1] === 0x4b && bytes[2] === 0x03 && bytes[3] === 0x04) return 'zip';
  if (bytes[0] === 0xd0 && bytes[1] === 0xcf && bytes[2] === 0x11 && bytes[3] === 0xe0) return 'xls';
  return 'text';
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
  const source = { sha256: sha256(bytes), bytes: bytes.byteLength };
  const kind = fileKind(bytes);
  if (kind === 'xls') {
    return fail({
      file,
      message: 'is an old binary .xls workbook; save it as .xlsx or as CSV text and import that',
    });
  }
  let table: Result<DecodedTable>;
  if (kind === 'zip') {
    options.onProgress?.({ phase: 'checking' });
    const checked = await checkZipInflation(bytes, file, limits, signal);
    if (!checked.ok) return checked;
    if (signal?.aborted) return cancelled(file);
    options.onProgress?.({ phase: 'decoding' });
    table = await xlsxTable(
      bytes,
      file,
      { format: 'xlsx', ...source },
      {
        sheet: request.sheet,
        headerNames: wantedColumns(request),
        limits,
      },
    );
  } else {
    options.onProgress?.({ phase: 'decoding' });
    if (request.sheet !== undefined) {
      return fail({
        file,
        message: `is a text file, not a workbook; --sheet ${request.sheet} does not apply`,
      });
    }
    const decoded = decodeText(bytes, file, request.encoding);
    if (!decoded.ok) return decoded;
    table = delimitedTable(
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
  }
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
