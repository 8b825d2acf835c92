import { createHash } from 'node:crypto';
import { copyFile, link, open, readFile, readdir, rename, stat, unlink } from 'node:fs/promises';
import { basename, dirname, join } from 'node:path';
import { fail, ok, type Result } from '../../shared-core/result.js';
import { formatStudy, parseStudy } from '../../shared-core/study/study-text.js';
import { hasErrors, type StudyProblem } from '../../shared-core/study/study-problem.js';
import { verifyStudy } from '../../shared-core/study/verify-study.js';
import type { Study } from '../../shared-core/study/study-schema.js';

/**
 * Study files (`.ledger`) on disk: open without ever changing the file, save atomically with the
 * previous version kept as `<name>.bak`, and never overwrite a file that changed since it was
 * opened.
 */

export interface OpenedStudy {
  study: Study;
  /** True when the chain or the document does not verify: the study can only be saved as a copy. */
  readOnly: boolean;
  problems: StudyProblem[];
  /** SHA-256 of the file's bytes as read: pass it back to saveStudyFile as expectedDiskHash. */
  diskHash: string;
  /** The schema version the file was written in when it was brought forward on open; else null. */
  migratedFrom: number | null;
}

export interface SaveOptions {
  /**
   * The diskHash from when the file was opened (or last saved); null when the file must not exist
   * yet. Leave it out only when the caller means to replace whatever is there.
   */
  expectedDiskHash?: string | null;
}

export interface SavedStudy {
  diskHash: string;
  /** The path of the previous version, when there was one. */
  backup: string | null;
}

const hashBytes = (bytes: Uint8Array | string): string => createHash('sha256').update(bytes).digest('hex');

export async function openStudyFile(path: string): Promise<Result<OpenedStudy>> {
  let bytes: Buffer;
  try {
    bytes = await readFile(path);
  } catch (error) {
    return fail({ file: path, message: `cannot be read (${describeError(error)})` });
  }
  const parsed = parseStudy(bytes.toString('utf8').replace(/^\uFEFF/, ''), path);
  if (!parsed.ok) return parsed;
  const problems = verifyStudy(parsed.value.study);
  return ok({
    study: parsed.value.study,
    readOnly: hasErrors(problems),
    problems,
    diskHash: hashBytes(bytes),
    migratedFrom: parsed.value.migratedFrom,
  });
}

/**
 * Saves atomically: write a temporary file in the same folder, flush it to disk, keep the current
 * file as `<name>.bak`, rename the temporary file over the study, flush the folder. A crash at any
 * moment leaves the old or the new version, never a mixture, and a whole backup.
 *
 * Refuses a study whose chain or document does not verify (use saveStudyCopy for those) and a file
 * that changed on disk since it was opened.
 */
export async function saveStudyFile(
  path: string,
  study: Study,
  options: SaveOptions = {},
): Promise<Result<SavedStudy>> {
  const problems = verifyStudy(study).filter((problem) => problem.level === 'error');
  if (problems.length > 0) {
    return fail(
      ...problems.map((problem) => ({
        file: path,
        message: `not saved: ${problem.message}; a study with a broken record can only be saved as a copy`,
      })),
    );
  }
  return writeStudy(path, formatStudy(study), options);
}

/**
 * "Save a copy": writes the study exactly as it is, problems included. It never re-seals, so a
 * broken chain stays broken, and on record, in the copy. By default it will not replace a file.
 */
export async function saveStudyCopy(
  path: string,
  study: Study,
  options: SaveOptions = { expectedDiskHash: null },
): Promise<Result<SavedStudy>> {
  return writeStudy(path, formatStudy(study), options);
}

let temporaryCounter = 0;

async function writeStudy(path: string, text: string, options: SaveOptions): Promise<Result<SavedStudy>> {
  const changed = await changedOnDisk(path, options.expectedDiskHash);
  if (changed) return fail(changed);

  const folder = dirname(path);
  const name = basename(path);
  await sweepTemporaries(folder, name);
  const temporary = join(folder, `.${name}.${process.pid}.${++temporaryCounter}.tmp`);
  try {
    await writeDurably(temporary, text, await permissionsOf(path));
    // Checked again just before the rename: the window for a missed change is the rename itself.
    const changedSince = await changedOnDisk(path, options.expectedDiskHash);
    if (changedSince) {
      await unlink(temporary);
      return fail(changedSince);
    }
    const backup = (await currentHash(path)) === null ? null : await keepBackup(path);
    await rename(temporary, path);
    await syncFolder(folder);
    return ok({ diskHash: hashBytes(text), backup });
  } catch (error) {
    await unlink(temporary).catch(() => undefined);
    return fail({
      file: path,
      message: `could not be saved (${describeError(error)}); the file on disk is as it was`,
    });
  }
}

/** Removes the temporary files that saves killed part-way left behind (their process is gone). */
async function sweepTemporaries(folder: string, name: string): Promise<void> {
  const prefix = `.${name}.`;
  let names: string[];
  try {
    names = await readdir(folder);
  } catch {
    return;
  }
  for (const candidate of names) {
    if (!candidate.startsWith(prefix) || !candidate.endsWith('.tmp')) continue;
    const match = /^(?:bak\.)?(\d+)\.\d+\.tmp$/.exec(candidate.slice(prefix.length));
    if (match && !isRunning(Number(match[1]))) await unlink(join(folder, candidate)).catch(() => undefined);
  }
}

function isRunning(pid: number): boolean {
  if (pid === process.pid) return true;
  try {
    process.kill(pid, 0);
    return true;
  } catch (error) {
    return (error as NodeJS.ErrnoException).code === 'EPERM';
  }
}

/** The permissions of the file being replaced, so that a study kept private stays private. */
async function permissionsOf(path: string): Promise<number | null> {
  try {
    return (await stat(path)).mode & 0o777;
  } catch {
    return null;
  }
}

async function writeDurably(path: string, text: string, mode: number | null): Promise<void> {
  const handle = await open(path, 'wx', mode ?? 0o644);
  try {
    if (mode !== null) await handle.chmod(mode);
    await handle.writeFile(text, 'utf8');
    await handle.sync();
  } finally {
    await handle.close();
  }
}

/**
 * Keeps the current file as `<name>.bak`, replacing the older backup in one rename so the backup is
 * always a whole file. A hard link costs nothing; where links are refused, a flushed copy.
 */
async function keepBackup(path: string): Promise<string> {
  const backup = `${path}.bak`;
  const staging = join(dirname(path), `.${basename(path)}.bak.${process.pid}.${++temporaryCounter}.tmp`);
  try {
    await link(path, staging);
  } catch {
    await copyFile(path, staging);
    const handle = await open(staging, 'r+');
    await handle.sync().finally(() => handle.close());
  }
  await rename(staging, backup);
  return backup;
}

async function syncFolder(folder: string): Promise<void> {
  // Makes the rename itself durable; folders cannot be opened this way on Windows, where the
  // rename is already durable once it returns.
  try {
    const handle = await open(folder, 'r');
    await handle.sync().finally(() => handle.close());
  } catch {
    /* not supported here */
  }
}

async function currentHash(path: string): Promise<string | null> {
  try {
    return hashBytes(await readFile(path));
  } catch (error) {
    if ((error as NodeJS.ErrnoException).code === 'ENOENT') return null;
    throw error;
  }
}

async function changedOnDisk(path: string, expected: string | null | undefined) {
  if (expected === undefined) return null;
  const actual = await currentHash(path);
  if (actual === expected) return null;
  if (expected === null)
    return { file: path, message: 'already exists: choose another name, or open it first' };
  if (actual === null)
    return {
      file: path,
      message: 'was moved or deleted since it was opened: not saved, so nothing is overwritten',
    };
  return {
    file: path,
    message:
      'was changed on disk since it was opened (by another program or window): not saved, so nothing is overwritten; save a copy, or reopen it',
  };
}

function describeError(error: unknown): string {
  const code = (error as NodeJS.ErrnoException).code;
  return code ? `${code}: ${(error as Error).message}` : String(error);
}
