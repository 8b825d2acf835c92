import { mkdir, readFile, rename, writeFile, open } from 'node:fs/promises';
import { dirname, join, basename } from 'node:path';
import {
  defaultSiteSettings,
  SiteSettingsSchema,
  type SiteSettings,
} from '../../shared-core/settings/site-settings.js';
import { fail, ok, type Result } from '../../shared-core/result.js';

/** The site settings file's name inside the application's data folder. */
export const siteSettingsFileName = 'site-settings.json';

/**
 * Reads the site settings. A missing file means the defaults; a file that is not valid JSON or
 * fails the schema is reported with the field that is wrong, and never silently replaced.
 */
export async function readSiteSettings(path: string): Promise<Result<SiteSettings>> {
  let text: string;
  try {
    text = await readFile(path, 'utf8');
  } catch (error) {
    if ((error as NodeJS.ErrnoException).code === 'ENOENT') return ok(structuredClone(defaultSiteSettings));
    return fail({
      file: basename(path),
      message: `cannot be read (${(error as NodeJS.ErrnoException).code})`,
    });
  }
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (error) {
    return fail({ file: basename(path), message: `is not valid JSON: ${(error as Error).message}` });
  }
  const parsed = SiteSettingsSchema.safeParse(json);
  if (!parsed.success) {
    return fail(
      ...parsed.error.issues.map((issue) => ({
        file: basename(path),
        column: issue.path.join('.') || undefined,
        message: issue.message,
      })),
    );
  }
  return ok(parsed.data);
}

/** Saves the settings atomically: a temporary file in the same folder, flushed, then renamed. */
export async function writeSiteSettings(path: string, settings: SiteSettings): Promise<SiteSettings> {
  const valid = SiteSettingsSchema.parse(settings);
  await mkdir(dirname(path), { recursive: true });
  const temporary = join(dirname(path), `.${basename(path)}.${process.pid}.tmp`);
  await writeFile(temporary, `${JSON.stringify(valid, null, 2)}\n`, { mode: 0o600 });
  const handle = await open(temporary, 'r+');
  try {
    await handle.sync();
  } finally {
    await handle.close();
  }
  await rename(temporary, path);
  return valid;
}
