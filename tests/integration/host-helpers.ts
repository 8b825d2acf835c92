import { mkdir, mkdtemp, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import type { StudyView } from '../../shared-core/api.js';
import { defaultSiteSettings } from '../../shared-core/settings/site-settings.js';
import { ok } from '../../shared-core/result.js';
import type { HostServices } from '../../src-main/desktop/host-handlers.js';
import { startBrowserHost, type BrowserHost } from '../../src-main/web/browser-host.js';

export const fixtureTaskModule = pathToFileURL(join(import.meta.dirname, 'host-fixture-tasks.mjs')).href;

/** A small study view for channel tests (invented numbers, not a statistical check). */
export const sampleStudy: StudyView = {
  file: null,
  title: 'Invented sample',
  unitName: 'one panel',
  document: { schemaVersion: 1 },
  observations: [
    { label: 'L1', row: 2, count: 3, units: 1 },
    { label: 'L2', row: 3, count: 5, units: 1 },
  ],
  exclusions: [],
  options: { limits: 'sigma', multiplier: 3, alpha: 0.0027, rules: ['beyond'] },
  readOnly: false,
  findings: [],
};

/** Services that record each call, so tests can prove a refused request reached none of them. */
export function fakeServices(): HostServices & { calls: string[] } {
  const calls: string[] = [];
  let settings = structuredClone(defaultSiteSettings);
  return {
    calls,
    async demoStudy() {
      calls.push('demoStudy');
      return sampleStudy;
    },
    async openStudy(file) {
      calls.push(`openStudy ${file.fileName}`);
      return ok({ ...sampleStudy, document: JSON.parse(new TextDecoder().decode(file.bytes)) });
    },
    async saveStudy(path) {
      calls.push(`saveStudy ${path}`);
      return { saved: true, backupKept: false };
    },
    async inspectData(file) {
      calls.push(`inspectData ${file.fileName}`);
      return ok({ sheets: [], columns: ['lot', 'count'], preview: [['A', '3']] });
    },
    analyze() {
      calls.push('analyze');
      throw new Error('not used');
    },
    async readSettings() {
      calls.push('readSettings');
      return ok(settings);
    },
    async writeSettings(next) {
      calls.push('writeSettings');
      settings = next;
      return next;
    },
  };
}

export async function startTestHost(): Promise<{
  host: BrowserHost;
  services: ReturnType<typeof fakeServices>;
  root: string;
}> {
  const root = await mkdtemp(join(tmpdir(), 'll-host-'));
  const rendererDir = join(root, 'renderer');
  await mkdir(join(rendererDir, 'assets'), { recursive: true });
  await writeFile(
    join(rendererDir, 'index.html'),
    '<!doctype html><title>Limit Ledger</title><div id="app"></div>',
  );
  await writeFile(join(rendererDir, 'assets', 'app.js'), 'console.log(1)');
  await writeFile(join(root, 'secret.txt'), 'outside the renderer');
  const services = fakeServices();
  const host = await startBrowserHost({
    port: 0,
    workspace: join(root, 'workspace'),
    dataFolder: join(root, 'data'),
    rendererDir,
    services,
    taskModule: fixtureTaskModule,
  });
  return { host, services, root };
}
