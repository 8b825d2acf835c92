import { randomBytes } from 'node:crypto';
import { mkdir, readdir, rm } from 'node:fs/promises';
import { join } from 'node:path';

/**
 * Exports made in the browser host are written to a private folder and handed to the browser once,
 * as a download at /download/<id>; the file is deleted after it is sent, and the folder on close.
 */
export class DownloadStore {
  private readonly entries = new Map<string, { path: string; fileName: string }>();

  constructor(private readonly folder: string) {}

  async reserve(fileName: string): Promise<{ path: string; downloadUrl: string }> {
    await mkdir(this.folder, { recursive: true, mode: 0o700 });
    const id = randomBytes(18).toString('base64url');
    const path = join(this.folder, `${id}-${fileName.replace(/[^\p{L}\p{N} _.-]/gu, '_')}`);
    this.entries.set(id, { path, fileName });
    return { path, downloadUrl: `/download/${id}` };
  }

  /** The download for an id, once. */
  take(id: string): { path: string; fileName: string } | null {
    const entry = this.entries.get(id) ?? null;
    this.entries.delete(id);
    return entry;
  }

  async clear(): Promise<void> {
    this.entries.clear();
    const names = await readdir(this.folder).catch(() => [] as string[]);
    await Promise.all(names.map((name) => rm(join(this.folder, name), { force: true })));
    await rm(this.folder, { recursive: true, force: true });
  }
}
