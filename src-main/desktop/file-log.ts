import { appendFileSync, mkdirSync, renameSync, statSync } from 'node:fs';
import { join } from 'node:path';

/**
 * A plain log in the user's log folder: one line per event with its time; the file is rolled to
 * main.old.log past 5 MB. Nothing secret is logged (no passphrases, no document contents).
 */
export function fileLog(folder: string, name = 'main.log', limit = 5 * 1024 * 1024): (line: string) => void {
  mkdirSync(folder, { recursive: true });
  const path = join(folder, name);
  return (line: string) => {
    try {
      if ((statSync(path, { throwIfNoEntry: false })?.size ?? 0) > limit)
        renameSync(path, join(folder, name.replace(/\.log$/, '.old.log')));
      appendFileSync(path, `${new Date().toISOString()} ${line.replace(/[\r\n]+/g, ' ')}\n`);
    } catch {
      // A full disk must not take the app down with it.
    }
  };
}
