import { readFile, writeFile } from 'node:fs/promises';
import { basename } from 'node:path';

/** The studies opened most recently, newest first, at most ten. */
export async function readRecent(path: string): Promise<string[]> {
  try {
    const list = JSON.parse(await readFile(path, 'utf8')) as unknown;
    return Array.isArray(list)
      ? list.filter((item): item is string => typeof item === 'string').slice(0, 10)
      : [];
  } catch {
    return [];
  }
}

export function withRecent(list: readonly string[], path: string): string[] {
  return [path, ...list.filter((item) => item !== path)].slice(0, 10);
}

export async function writeRecent(path: string, list: readonly string[]): Promise<void> {
  await writeFile(path, JSON.stringify(list)).catch(() => undefined);
}

export const recentLabel = (path: string): string => basename(path);
