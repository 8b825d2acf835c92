import { mkdtemp, readdir, readFile, rm, stat, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { defaultSiteSettings, SiteSettingsSchema } from '../../shared-core/settings/site-settings.js';
import { RecoveryStore } from '../../src-main/desktop/recovery.js';
import { readSiteSettings, writeSiteSettings } from '../../src-main/services/site-settings.js';
import { parseServeOptions } from '../../src-main/web/serve-options.js';
import { dataFolders, userDataFolder } from '../../src-main/desktop/data-folders.js';

let folder: string;
beforeEach(async () => {
  folder = await mkdtemp(join(tmpdir(), 'll-settings-'));
});
afterEach(async () => {
  await rm(folder, { recursive: true, force: true });
});

describe('site settings', () => {
  it('starts from valid defaults when there is no file', async () => {
    const read = await readSiteSettings(join(folder, 'site-settings.json'));
    expect(read).toEqual({ ok: true, value: defaultSiteSettings });
    expect(SiteSettingsSchema.parse(defaultSiteSettings)).toEqual(defaultSiteSettings);
  });

  it('saves atomically with owner-only permissions and reads back what it saved', async () => {
    const path = join(folder, 'site-settings.json');
    const settings = {
      ...defaultSiteSettings,
      paperSize: 'Letter' as const,
      causeCategories: ['Resin lot', 'Press 4'],
    };
    await writeSiteSettings(path, settings);
    expect(await readSiteSettings(path)).toEqual({ ok: true, value: settings });
    expect((await stat(path)).mode & 0o777).toBe(0o600);
    expect(await readdir(folder)).toEqual(['site-settings.json']);
  });

  it('reports a broken file with the field that is wrong, and never replaces it', async () => {
    const path = join(folder, 'site-settings.json');
    await writeFile(
      path,
      JSON.stringify({
        ...defaultSiteSettings,
        defaults: { ...defaultSiteSettings.defaults, multiplier: -1 },
      }),
    );
    const read = await readSiteSettings(path);
    expect(read.ok).toBe(false);
    expect(!read.ok && read.findings[0]).toMatchObject({
      file: 'site-settings.json',
      column: 'defaults.multiplier',
    });
    await writeFile(path, '{ not json');
    const broken = await readSiteSettings(path);
    expect(!broken.ok && broken.findings[0].message).toMatch(/^is not valid JSON/);
    expect(await readFile(path, 'utf8')).toBe('{ not json');
  });

  it('refuses settings that would leave a study unsignable or trust a non-certificate', () => {
    expect(
      SiteSettingsSchema.safeParse({
        ...defaultSiteSettings,
        signOff: { required: [], separatePeople: true },
      }).success,
    ).toBe(false);
    expect(SiteSettingsSchema.safeParse({ ...defaultSiteSettings, causeCategories: [] }).success).toBe(false);
    const notPem = { name: 'x', pem: 'hello', fingerprint: 'ab'.repeat(32) };
    expect(
      SiteSettingsSchema.safeParse({ ...defaultSiteSettings, trustedCertificates: [notPem] }).success,
    ).toBe(false);
  });
});

describe('crash-recovery copies', () => {
  it('offers the copy a run left behind, and a clean close leaves none', async () => {
    const crashed = new RecoveryStore(folder);
    await crashed.save({ schemaVersion: 1, marker: 'first' }, 'line 3.ledger');
    await crashed.save({ schemaVersion: 1, marker: 'second' }, 'line 3.ledger');
    // The next run sees the earlier run's copy (one per study and run, the latest content).
    const next = new RecoveryStore(folder);
    const leftovers = await next.leftovers();
    expect(leftovers).toHaveLength(1);
    expect(leftovers[0].original).toBe('line 3.ledger');
    expect(JSON.parse(await readFile(leftovers[0].path, 'utf8'))).toEqual({
      schemaVersion: 1,
      marker: 'second',
    });
    expect(await crashed.leftovers()).toEqual([]);
    await next.discard(leftovers[0].path);
    expect(await next.leftovers()).toEqual([]);

    const clean = new RecoveryStore(folder);
    await clean.save({ schemaVersion: 1 }, null);
    await clean.closeCleanly();
    expect(await readdir(folder)).toEqual([]);
  });

  it('discards only its own recovery files', async () => {
    await writeFile(join(folder, 'keep.ledger'), '{}');
    await new RecoveryStore(folder).discard(join(folder, 'keep.ledger'));
    await new RecoveryStore(folder).discard('/etc/passwd');
    expect(await readdir(folder)).toEqual(['keep.ledger']);
  });
});

describe('serve options and folders', () => {
  it('reads --port, --workspace, --data and --no-open', () => {
    expect(
      parseServeOptions(
        ['--port', '8123', '--workspace', 'studies', '--no-open', '--data=/srv/ll'],
        '/home/qa',
      ),
    ).toEqual({
      port: 8123,
      workspace: '/home/qa/studies',
      open: false,
      dataFolder: '/srv/ll',
      help: false,
    });
    expect(parseServeOptions([], '/x')).toEqual({
      port: 0,
      workspace: null,
      open: true,
      dataFolder: null,
      help: false,
    });
  });

  it('names the option that is wrong', () => {
    expect(parseServeOptions(['--port', 'eighty'])).toEqual({
      error: '--port needs a whole number from 0 to 65535, not "eighty"',
    });
    expect(parseServeOptions(['--port', '70000'])).toMatchObject({
      error: expect.stringContaining('"70000"'),
    });
    expect(parseServeOptions(['--workspace'])).toEqual({ error: '--workspace needs a folder' });
    expect(parseServeOptions(['--host', '0.0.0.0'])).toEqual({ error: 'unknown option "--host"' });
  });

  it('keeps data where each platform expects an application’s data', () => {
    expect(userDataFolder({ XDG_CONFIG_HOME: '/home/qa/.config' }, 'linux')).toBe(
      '/home/qa/.config/Limit Ledger',
    );
    expect(userDataFolder({ APPDATA: 'C:\\Users\\qa\\AppData\\Roaming' }, 'win32')).toMatch(/Limit Ledger$/);
    expect(dataFolders('/d')).toEqual({
      root: '/d',
      workspace: '/d/workspace',
      recovery: '/d/recovery',
      logs: '/d/logs',
      siteSettings: '/d/site-settings.json',
    });
  });
});

describe('the file handles', () => {
  it('hands out opaque handles, keeps at most the newest uploads in memory, and wipes what it forgets', async () => {
    const { FileRegistry } = await import('../../src-main/desktop/file-registry.js');
    const registry = new FileRegistry(2);
    const first = new Uint8Array([1, 2, 3]);
    const a = registry.issueBytes('a.csv', first, 'data');
    const b = registry.issueBytes('b.csv', new Uint8Array([4]), 'data');
    const c = registry.issueBytes('c.csv', new Uint8Array([5]), 'data');
    expect(a.handle).toMatch(/^[A-Za-z0-9_-]{24}$/);
    expect(() => registry.get(a.handle)).toThrow('no longer available');
    expect([...first]).toEqual([0, 0, 0]);
    expect((await registry.read(b.handle)).fileName).toBe('b.csv');
    expect((await registry.read(c.handle)).bytes).toEqual(new Uint8Array([5]));
    expect(() => registry.writablePath(c.handle)).toThrow('choose where to save it first');
  });
});
