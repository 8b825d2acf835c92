import { createHash } from 'node:crypto';
import { open } from 'node:fs/promises';
import { basename } from 'node:path';
import type { DecodedTable } from '../../../shared-core/import/decoded-table.js';
import type { UnitsTable } from '../../../shared-core/import/event-periods.js';
import type { ImportOutcome } from '../../../shared-core/import/import-report.js';
import type { TablePreview } from '../../../shared-core/import/table-preview.js';
import { readObservations } from '../../../shared-core/import/read-observations.js';
import type { Result } from '../../../shared-core/result.js';
import { fail, ok } from '../../../shared-core/result.js';
import { decodeText, type DecodedText, type TextEncoding } from './decode-text.js';
import { delimitedTable } from './delimited-table.js';
import { fastDelimitedOutcome } from './fast-delimited.js';
import { importLimits, megabytes, type ImportLimits } from './import-limits.js';
import type { ImportRequest, ProgressListener } from './import-request.js';

export interface ImportOptions {
  onProgress?: ProgressListener;
  limits?: Partial<ImportLimits>;
  /** Skip the one-pass reader of common delimited files (tests compare the two readers). */
  generalReaderOnly?: boolean;
}

/** How to decode one table: what the user named, and the columns its header must hold. */
interface TableRequest {
  sheet?: string;
  encoding?: TextEncoding;
  delimiter?: string;
  columns: string[];
}

/** XLSX is a zip archive (PK\x03\x04); the old binary .xls is an OLE compound file. */
function fileKind(bytes: Uint8Array): 'zip' | 'xls' | 'text' {
  if (bytes[0] === 0x50 && bytes[1] === 0x4b && bytes[2] === 0x03 && bytes[3] === 0x04) return 'zip';
  if (bytes[0] === 0xd0 && bytes[1] === 0xcf && bytes[2] === 0x11 && bytes[3] === 0xe0) return 'xls';
  return 'text';
}

const sha256 = (bytes: Uint8Array) => createHash('sha256').update(bytes).digest('hex');

const cancelled = <T>(file: string) => fail<T>({ file, message: 'the import was cancelled' });

const named = (names: (string | undefined)[]) =>
  names.filter((name): name is string => typeof name === 'string' && name !== '');

/** The bytes of a delimited text file or a workbook as a table, within the limits. */
async function decodeTable(
  file: string,
  bytes: Uint8Array,
  request: TableRequest,
  limits: ImportLimits,
  signal: AbortSignal | undefined,
  options: ImportOptions,
  decodedText?: DecodedText,
): Promise<Result<DecodedTable>> {
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
  if (kind === 'zip') {
    options.onProgress?.({ phase: 'checking' });
    const { checkZipInflation } = await import('./zip-inflation-guard.js');
    const checked = await checkZipInflation(bytes, file, limits, signal);
    if (!checked.ok) return checked;
    if (signal?.aborted) return cancelled(file);
    options.onProgress?.({ phase: 'decoding' });
    // The workbook reader is large: load it only for workbooks, so text imports start fast.
    const { xlsxTable } = await import('./xlsx-table.js');
    return xlsxTable(
      bytes,
      file,
      { format: 'xlsx', ...source },
      { sheet: request.sheet, headerNames: request.columns, limits },
    );
  }
  options.onProgress?.({ phase: 'decoding' });
  if (request.sheet !== undefined) {
    return fail({ file, message: `is a text file, not a workbook; --sheet ${request.sheet} does not apply` });
  }
  let text: string, encoding: TextEncoding, encodingSource: DecodedText['source'];
  if (decodedText) ({ text, encoding, source: encodingSource } = decodedText);
  else {
    const decoded = decodeText(bytes, file, request.encoding);
    if (!decoded.ok) return decoded;
    ({ text, encoding, source: encodingSource } = decoded.value);
  }
  return delimitedTable(
    text,
    file,
    { format: 'delimited', ...source, encoding, encodingSource },
    { delimiter: request.delimiter, headerNames: request.columns, limits },
  );
}

/**
 * The outcome of a common delimited file by the one-pass reader, or the decoded text for the
 * general reader when the fast one hands the file over (so it is decoded once); undefined when the
 * bytes are not a text file within the limits (the general path words the refusal).
 */
function fastOutcome(
  file: string,
  bytes: Uint8Array,
  request: ImportRequest,
  limits: ImportLimits,
  options: ImportOptions,
): { outcome: ImportOutcome } | { decoded: DecodedText } | undefined {
  if (bytes.byteLength > limits.maxFileBytes || fileKind(bytes) !== 'text') return undefined;
  const decoded = decodeText(bytes, file, request.encoding);
  if (!decoded.ok) return undefined;
  options.onProgress?.({ phase: 'decoding' });
  const { text, encoding, source: encodingSource } = decoded.value;
  const source = { format: 'delimited' as const, sha256: sha256(bytes), bytes: bytes.byteLength };
  const outcome = fastDelimitedOutcome(text, file, { ...source, encoding, encodingSource }, request, limits);
  return outcome ? { outcome } : { decoded: decoded.value };
}

/** The table's periods: rows as periods, or events grouped into periods. */
async function outcomeFromTable(
  table: DecodedTable,
  request: ImportRequest,
  unitsTable: DecodedTable | undefined,
): Promise<Result<ImportOutcome>> {
  const { count, units, label, date, decimal, dateOrder, inspectionUnit, events } = request;
  const settings = { decimal, dateOrder, inspectionUnit };
  if (!events) return readObservations(table, { count, units, label, date }, settings);
  const unitsSource: UnitsTable | undefined =
    unitsTable && units ? { table: unitsTable, key: events.unitsKey ?? events.time, units } : undefined;
  // Event lists are the rarer import: their grouping code loads only for them.
  const { readEventPeriods } = await import('../../../shared-core/import/event-periods.js');
  return readEventPeriods(
    table,
    {
      time: events.time,
      ...(events.category ? { category: events.category } : {}),
      ...(count ? { count } : {}),
      ...(units && !unitsSource ? { units } : {}),
    },
    { ...settings, period: events.period, shiftStarts: events.shiftStarts, unitsTable: unitsSource },
  );
}

function eventsColumns(request: ImportRequest): string[] {
  const events = request.events!;
  const unitsElsewhere = events.unitsSheet ?? events.unitsFile ?? events.unitsUpload;
  return named([events.time, events.category, request.count, unitsElsewhere ? undefined : request.units]);
}

function mainColumns(request: ImportRequest): string[] {
  if (request.events) return eventsColumns(request);
  return named([request.count, request.units, request.label, request.date]);
}

async function importDecoded(
  file: string,
  bytes: Uint8Array,
  request: ImportRequest,
  readUnitsFile: (() => Promise<Result<{ file: string; bytes: Uint8Array }>>) | undefined,
  signal: AbortSignal | undefined,
  options: ImportOptions,
): Promise<Result<ImportOutcome>> {
  const limits = { ...importLimits, ...options.limits };
  const { encoding, delimiter, sheet, events } = request;
  let decodedText: DecodedText | undefined;
  if (!events && sheet === undefined && !options.generalReaderOnly) {
    const fast = fastOutcome(file, bytes, request, limits, options);
    if (fast && 'outcome' in fast) {
      if (signal?.aborted) return cancelled(file);
      options.onProgress?.({ phase: 'validating' });
      return ok(fast.outcome);
    }
    decodedText = fast?.decoded;
  }
  const table = await decodeTable(
    file,
    bytes,
    { sheet, encoding, delimiter, columns: mainColumns(request) },
    limits,
    signal,
    options,
    decodedText,
  );
  if (!table.ok) return table;
  let unitsTable: DecodedTable | undefined;
  if (events && (events.unitsSheet || readUnitsFile)) {
    if (!request.units)
      return fail({ file, message: 'a units table needs --units COL (its column of inspection units)' });
    const unitsColumns = named([events.unitsKey ?? events.time, request.units]);
    let decodedUnits: Result<DecodedTable>;
    if (events.unitsSheet) {
      decodedUnits = await decodeTable(
        file,
        bytes,
        { sheet: events.unitsSheet, columns: unitsColumns },
        limits,
        signal,
        options,
      );
    } else {
      const unitsSource = await readUnitsFile!();
      if (!unitsSource.ok) return unitsSource;
      decodedUnits = await decodeTable(
        unitsSource.value.file,
        unitsSource.value.bytes,
        { encoding, delimiter, columns: unitsColumns },
        limits,
        signal,
        options,
      );
    }
    if (!decodedUnits.ok) return decodedUnits;
    unitsTable = decodedUnits.value;
  }
  if (signal?.aborted) return cancelled(file);
  options.onProgress?.({ phase: 'validating' });
  return outcomeFromTable(table.value, request, unitsTable);
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
  const upload = request.events?.unitsUpload;
  const readUnits = upload ? async () => ok({ file: upload.fileName, bytes: upload.bytes }) : undefined;
  return guarded(fileName, () => importDecoded(fileName, bytes, request, readUnits, signal, options));
}

/**
 * The first rows of a file and a suggested mapping, for the mapping screen: the same decoding as
 * an import (encoding, delimiter, sheet and header detection), no validation yet.
 */
export async function previewBytes(
  fileName: string,
  bytes: Uint8Array,
  request: Partial<ImportRequest> = {},
  options: ImportOptions = {},
): Promise<Result<TablePreview>> {
  const limits = { ...importLimits, ...options.limits };
  const { sheet, encoding, delimiter } = request;
  const columns = named([request.count, request.units, request.label, request.date]);
  try {
    const table = await decodeTable(
      fileName,
      bytes,
      { sheet, encoding, delimiter, columns },
      limits,
      undefined,
      options,
    );
    if (!table.ok) return table;
    const { tablePreview } = await import('../../../shared-core/import/table-preview.js');
    return ok(tablePreview(table.value));
  } catch (error) {
    return fail({ file: fileName, message: `${unexpectedFailure} (${(error as Error).message})` });
  }
}

/** Reading that fails in a way no check foresaw (a folder named as a file, a disk error). */
export const unexpectedFailure = 'could not be imported because of an unexpected error';

/** Every failure comes back as a finding that names the file; the importer never throws. */
async function guarded(
  file: string,
  work: () => Promise<Result<ImportOutcome>>,
): Promise<Result<ImportOutcome>> {
  try {
    return await work();
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code;
    return fail({
      file,
      message: `${unexpectedFailure} (${code ?? (error as Error).message ?? String(error)})`,
    });
  }
}

/** The bytes of a file, refused before reading when it is over the size limit. */
async function readLimited(
  path: string,
  limits: ImportLimits,
  signal: AbortSignal | undefined,
  options: ImportOptions,
): Promise<Result<{ file: string; bytes: Uint8Array }>> {
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
    return ok({ file, bytes: bytes.subarray(0, offset) });
  } finally {
    await handle.close();
  }
}

/** Periods from a file on disk; files over the size limit are refused before they are read. */
export async function importFile(
  path: string,
  request: ImportRequest,
  signal?: AbortSignal,
  options: ImportOptions = {},
): Promise<Result<ImportOutcome>> {
  const limits = { ...importLimits, ...options.limits };
  return guarded(basename(path), async () => {
    const read = await readLimited(path, limits, signal, options);
    if (!read.ok) return read;
    const unitsFile = request.events?.unitsFile;
    const readUnits = unitsFile ? () => readLimited(unitsFile, limits, signal, options) : undefined;
    return importDecoded(read.value.file, read.value.bytes, request, readUnits, signal, options);
  });
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
  const limits = { ...importLimits, ...options.limits };
  const bytes = new TextEncoder().encode(text);
  if (bytes.byteLength > limits.maxFileBytes) {
    return fail({
      file,
      message: `are ${megabytes(bytes.byteLength)}; more than ${megabytes(limits.maxFileBytes)} is refused`,
    });
  }
  return guarded(file, async () => {
    const source = {
      sha256: sha256(bytes),
      bytes: bytes.byteLength,
      encoding: 'utf-8',
      encodingSource: 'given' as const,
    };
    const table = delimitedTable(
      text,
      file,
      { format: 'paste', ...source },
      { delimiter: request.delimiter ?? '\t', headerNames: mainColumns(request), limits },
    );
    if (!table.ok) return table;
    return outcomeFromTable(table.value, request, undefined);
  });
}
