import { randomBytes } from 'node:crypto';
import { readFile, stat } from 'node:fs/promises';
import { basename } from 'node:path';
import type { FileHandle } from '../../shared-core/api.js';
import { HostError } from './host-error.js';

/**
 * The host's table of files the user chose: a dialog, a drop, a second launch, the workspace or an
 * upload puts a file here and the renderer gets an opaque handle back. Requests name files only by
 * handle, so no path from the renderer ever reaches the file system.
 */
export interface FileEntry {
  handle: string;
  fileName: string;
  purpose: string;
  /** On disk; null for an upload held in memory. */
  path: string | null;
  /** An upload's bytes (key files stay here, in memory, for the one operation). */
  bytes: Uint8Array | null;
  /** Whether the handle may be written to (a save target or the study's own file). */
  writable: boolean;
}

export class FileRegistry {
  private readonly entries = new Map<string, FileEntry>();

  /** Uploads held in memory at once; the oldest is forgotten beyond this (its handle then asks again). */
  constructor(private readonly maxUploads = 16) {}

  /** Registers a path the host itself chose (dialog, drop, workspace); the same path keeps its handle. */
  async issuePath(path: string, purpose: string, writable: boolean): Promise<FileHandle> {
    let entry = [...this.entries.values()].find((each) => each.path === path && each.purpose === purpose);
    if (entry === undefined) {
      entry = { handle: newHandle(), fileName: basename(path), purpose, path, bytes: null, writable };
      this.entries.set(entry.handle, entry);
    } else if (writable) entry.writable = true;
    return describe(entry, await stat(path).catch(() => null));
  }

  issueBytes(fileName: string, bytes: Uint8Array, purpose: string): FileHandle {
    const entry: FileEntry = { handle: newHandle(), fileName, purpose, path: null, bytes, writable: false };
    this.entries.set(entry.handle, entry);
    const uploads = [...this.entries.values()].filter((each) => each.bytes !== null);
    for (const old of uploads.slice(0, Math.max(0, uploads.length - this.maxUploads)))
      this.release(old.handle);
    return { handle: entry.handle, fileName, size: bytes.byteLength };
  }

  get(handle: string): FileEntry {
    const entry = this.entries.get(handle);
    if (entry === undefined)
      throw new HostError('unknown-file', 'that file is no longer available; choose it again');
    return entry;
  }

  async read(handle: string): Promise<{ fileName: string; bytes: Uint8Array; path: string | null }> {
    const entry = this.get(handle);
    if (entry.bytes !== null) return { fileName: entry.fileName, bytes: entry.bytes, path: null };
    try {
      return {
        fileName: entry.fileName,
        bytes: new Uint8Array(await readFile(entry.path!)),
        path: entry.path,
      };
    } catch (error) {
      throw new HostError(
        'unreadable',
        `${entry.fileName}: cannot be read (${(error as NodeJS.ErrnoException).code ?? 'error'})`,
      );
    }
  }

  /** The path to write to; refuses handles that were not issued as save targets. */
  writablePath(handle: string): string {
    const entry = this.get(handle);
    if (!entry.writable || entry.path === null) {
      throw new HostError('not-writable', `${entry.fileName}: choose where to save it first`);
    }
    return entry.path;
  }

  /** Forgets a handle and drops any bytes it held (key files after their one operation). */
  release(handle: string): void {
    const entry = this.entries.get(handle);
    if (entry?.bytes) entry.bytes.fill(0);
    this.entries.delete(handle);
  }
}

function newHandle(): string {
  return randomBytes(18).toString('base64url');
}

function describe(entry: FileEntry, info: { size: number; mtime: Date } | null): FileHandle {
  return {
    handle: entry.handle,
    fileName: entry.fileName,
    ...(info ? { size: info.size, modified: info.mtime.toISOString() } : {}),
  };
}
