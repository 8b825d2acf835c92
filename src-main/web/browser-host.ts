import { existsSync } from 'node:fs';
import { mkdir } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { basename, dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { randomBytes } from 'node:crypto';
import { dataFolders, userDataFolder } from '../desktop/data-folders.js';
import { createHost, type HostParts } from '../desktop/host.js';
import type { HostServices } from '../desktop/host-handlers.js';
import { nodeHostServices } from '../desktop/host-services.js';
import { DownloadStore } from './downloads.js';
import { startWebHost, type WebHost } from './server.js';
import { workspacePicker } from './workspace-picker.js';

export interface BrowserHostOptions {
  port?: number;
  workspace?: string | null;
  dataFolder?: string | null;
  rendererDir?: string;
  services?: HostServices;
  taskModule?: string;
  log?: (line: string) => void;
}

export interface BrowserHost extends WebHost {
  parts: HostParts;
  workspace: string;
}

export const appVersion = '0.1.0';

/** The built renderer: dist/renderer, found from the compiled module or from the source tree. */
export function defaultRendererDir(): string {
  const here = dirname(fileURLToPath(import.meta.url));
  const built = join(here, '..', '..', 'renderer');
  return existsSync(built) ? built : join(here, '..', '..', 'dist', 'renderer');
}

/** The browser host with everything wired: workspace, data folder, downloads, services and jobs. */
export async function startBrowserHost(options: BrowserHostOptions = {}): Promise<BrowserHost> {
  const folders = dataFolders(options.dataFolder ?? userDataFolder());
  const workspace = options.workspace ?? folders.workspace;
  await mkdir(workspace, { recursive: true });
  const downloads = new DownloadStore(
    join(tmpdir(), `limit-ledger-downloads-${randomBytes(6).toString('hex')}`),
  );
  const parts = createHost({
    kind: 'web',
    version: appVersion,
    picker: workspacePicker(workspace, downloads),
    services: options.services ?? nodeHostServices(folders),
    recoveryFolder: folders.recovery,
    workspaceName: basename(workspace),
    taskModule: options.taskModule,
  });
  const host = await startWebHost({
    rendererDir: options.rendererDir ?? defaultRendererDir(),
    handlers: parts.handlers,
    events: parts.events,
    downloads,
    port: options.port ?? 0,
    log: options.log,
  });
  return {
    ...host,
    parts,
    workspace,
    async close() {
      await parts.jobs.cancelAll();
      await host.close();
      await parts.recovery.closeCleanly();
      await downloads.clear();
    },
  };
}
