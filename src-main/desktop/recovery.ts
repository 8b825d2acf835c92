import { randomBytes } from 'node:crypto';
import { mkdir, readdir, rename, rm, stat, writeFile } from 'node:fs/promises';
import { join } from 'node:path';

const suffix = '.recovery.ledger';

export interface RecoveryEntry {
  path: string;
  /** The study's own file name, when it had one. */
  original: string | null;
  savedAt: string;
}

/**
 * The study name a recovery copy was saved for (null when the study had no file yet), or undefined
 * when the file is not a recovery copy: a restored copy keeps saving under the study's own name.
 */
export function recoveredOriginal(fileName: string): string | null | undefined {
  if (!fileName.endsWith(suffix)) return undefined;
  const stem = fileName.slice(0, -suffix.length).replace(/\.[0-9a-f]{12}$/, '');
  return stem === 'untitled' ? null : `${stem}.ledger`;
}

/**
 * Autosave copies for crash recovery. Each run writes its own copy (named for the study and the
 * run) every time the renderer autosaves; a clean close removes it. Copies left by an earlier run
 * that did not close cleanly are offered on the next start.
 */
export class RecoveryStore {
  private readonly run = randomBytes(6).toString('hex');
  private current: string | null = null;

  constructor(private readonly folder: string) {}

  async save(document: unknown, original: string | null): Promise<void> {
    await mkdir(this.folder, { recursive: true, mode: 0o700 });
    const stem = (original ?? 'untitled').replace(/\.ledger$/i, '').replace(/[^\p{L}\p{N} _.-]/gu, '_');
    const path = join(this.folder, `${stem}.${this.run}${suffix}`);
    const temporary = `${path}.tmp`;
    await writeFile(temporary, JSON.stringify(document), { mode: 0o600 });
    await rename(temporary, path);
    if (this.current !== null && this.current !== path) await rm(this.current, { force: true });
    this.current = path;
  }

  /** Copies from earlier runs, newest first. */
  async leftovers(): Promise<RecoveryEntry[]> {
    const names = await readdir(this.folder).catch(() => [] as string[]);
    const entries: RecoveryEntry[] = [];
    for (const name of names) {
      if (!name.endsWith(suffix) || name.includes(`.${this.run}${suffix}`)) continue;
      const path = join(this.folder, name);
      const info = await stat(path).catch(() => null);
      if (!info) continue;
      entries.push({ path, original: recoveredOriginal(name) ?? null, savedAt: info.mtime.toISOString() });
    }
    return entries.sort((a, b) => b.savedAt.localeCompare(a.savedAt));
  }

  async discard(path: string): Promise<void> {
    if (!path.startsWith(this.folder) || !path.endsWith(suffix)) return;
    await rm(path, { force: true });
  }

  /** A clean close: this run's copy is no longer needed. */
  async closeCleanly(): Promise<void> {
    if (this.current !== null) await rm(this.current, { force: true });
    this.current = null;
  }
}
