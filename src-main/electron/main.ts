/**
 * The Electron main process: one hardened window on the app's own scheme, native menus and
 * dialogs, the single-instance lock, remembered window bounds, drops and launches of files, the
 * unsaved-changes prompt, crash-recovery copies and a log in the user's log folder. The logic lives
 * in src-main/desktop (tested without Electron); this file only wires it to Electron.
 */
import { readFile, stat } from 'node:fs/promises';
import { join } from 'node:path';
import { app, BrowserWindow, dialog, Menu, protocol, screen, session, shell } from 'electron';
import type { FilePurpose, SavePurpose } from '../../shared-core/api.js';
import { closeChoice, closePrompt } from '../desktop/close-guard.js';
import { contentSecurityPolicy } from '../desktop/content-security-policy.js';
import { dataFolders } from '../desktop/data-folders.js';
import { openFilters, saveFilters } from '../desktop/electron-picker.js';
import { fileLog } from '../desktop/file-log.js';
import { createHost, type HostParts } from '../desktop/host.js';
import type { FilePicker } from '../desktop/host-handlers.js';
import { nodeHostServices } from '../desktop/host-services.js';
import { filesFromArgv, purposeOfFile } from '../desktop/launch-files.js';
import { menuTemplate } from '../desktop/menu-template.js';
import { rendererFileFor } from '../desktop/app-protocol.js';
import { readRecent, recentLabel, withRecent, writeRecent } from '../desktop/recent-files.js';
import {
  appEntry,
  appScheme,
  isAllowedNavigation,
  mainWindowOptions,
  permissionHandler,
  windowOpenHandler,
} from '../desktop/window-options.js';
import {
  fitToDisplays,
  readWindowState,
  writeWindowState,
  type WindowState,
} from '../desktop/window-state.js';
import { registerIpc } from './ipc.js';

const here = import.meta.dirname;
const rendererDir = join(here, '..', '..', 'renderer');
const preloadPath = join(here, 'preload.cjs');

protocol.registerSchemesAsPrivileged([
  { scheme: appScheme, privileges: { standard: true, secure: true, supportFetchAPI: true, codeCache: true } },
]);

if (!app.requestSingleInstanceLock()) {
  app.quit();
} else {
  void start();
}

async function start(): Promise<void> {
  // Every web contents, now or later: no navigation away from the app, no new windows, no webviews.
  app.on('web-contents-created', (_event, contents) => {
    contents.on('will-navigate', (event, url) => {
      if (!isAllowedNavigation(url)) event.preventDefault();
    });
    contents.on('will-redirect', (event, url) => {
      if (!isAllowedNavigation(url)) event.preventDefault();
    });
    contents.on('will-attach-webview', (event) => event.preventDefault());
    contents.setWindowOpenHandler(windowOpenHandler);
  });

  const pendingFiles: string[] = filesFromArgv(process.argv, process.cwd());
  // macOS hands files over by event, possibly before the window exists; those wait their turn.
  let openWhenReady: ((path: string) => void) | null = null;
  app.on('open-file', (event, path) => {
    event.preventDefault();
    if (openWhenReady) openWhenReady(path);
    else pendingFiles.push(path);
  });

  await app.whenReady();
  const folders = dataFolders(app.getPath('userData'));
  app.setAppLogsPath();
  const logsFolder = app.getPath('logs');
  const log = fileLog(logsFolder);
  log(`start ${app.getVersion()} electron ${process.versions.electron}`);
  process.on('uncaughtException', (error) => {
    // Logged, told, and stopped: the autosave copy is offered on the next start.
    log(`uncaught: ${error.stack ?? error.message}`);
    dialog.showErrorBox(
      'Limit Ledger stopped',
      `An unexpected error stopped the app. The log is in ${logsFolder}.`,
    );
    app.exit(1);
  });

  const appSession = session.defaultSession;
  appSession.setPermissionRequestHandler((_contents, permission, callback) =>
    callback(permissionHandler(permission)),
  );
  appSession.setPermissionCheckHandler((_contents, permission) => permissionHandler(permission));
  // No remote content: the renderer only ever loads from the app's scheme.
  appSession.webRequest.onBeforeRequest(
    { urls: ['http://*/*', 'https://*/*', 'ws://*/*', 'wss://*/*'] },
    (_details, callback) => callback({ cancel: true }),
  );
  protocol.handle(appScheme, async (request) => {
    const file = rendererFileFor(request.url, rendererDir);
    const bytes = file ? await readFile(file.path).catch(() => null) : null;
    if (!file || bytes === null)
      return new Response('Not found', {
        status: 404,
        headers: { 'content-security-policy': contentSecurityPolicy },
      });
    return new Response(new Uint8Array(bytes), { headers: file.headers });
  });

  const recentPath = join(folders.root, 'recent.json');
  const windowStatePath = join(folders.root, 'window-state.json');
  let recent = await readRecent(recentPath);
  let window: BrowserWindow | null = null;
  let unsaved = false;
  let closeConfirmed = false;
  const savedWaiters = new Set<() => void>();

  const picker: FilePicker = {
    async chooseFile(purpose: FilePurpose) {
      const result = await dialog.showOpenDialog(window!, {
        properties: ['openFile'],
        filters: openFilters[purpose],
      });
      return result.canceled ? null : (result.filePaths[0] ?? null);
    },
    async chooseSaveTarget(purpose: SavePurpose, suggestedName: string) {
      const result = await dialog.showSaveDialog(window!, {
        defaultPath: join(app.getPath('documents'), suggestedName),
        filters: saveFilters[purpose],
      });
      return result.canceled || !result.filePath ? null : result.filePath;
    },
    async listStudies() {
      const present = await Promise.all(
        recent.map(async (path) => ((await stat(path).catch(() => null))?.isFile() ? path : null)),
      );
      return present.filter((path): path is string => path !== null);
    },
    async exportDestination(fileName: string) {
      const purpose: SavePurpose = fileName.endsWith('.pdf') ? 'packet' : 'workbook';
      const path = await picker.chooseSaveTarget(purpose, fileName);
      return path === null ? null : { path };
    },
  };

  const host: HostParts = createHost({
    kind: 'electron',
    version: app.getVersion(),
    picker,
    services: nodeHostServices(folders),
    recoveryFolder: folders.recovery,
    revealFile: (path) => shell.showItemInFolder(path),
    onUnsaved(value) {
      unsaved = value;
      window?.setDocumentEdited(value);
      if (!value) for (const resolve of savedWaiters) resolve();
    },
  });

  async function openPath(path: string): Promise<void> {
    const purpose = purposeOfFile(path);
    const info = await stat(path).catch(() => null);
    if (purpose === null || !info?.isFile()) {
      log(`refused to open ${path}: not a study or data file`);
      return;
    }
    const file = await host.files.issuePath(path, purpose, purpose === 'study');
    if (purpose === 'study') {
      recent = withRecent(recent, path);
      await writeRecent(recentPath, recent);
      buildMenu();
    }
    host.events.publish({ type: 'file-opened', file, purpose });
    if (window) {
      if (window.isMinimized()) window.restore();
      window.focus();
    }
  }

  function buildMenu(): void {
    Menu.setApplicationMenu(
      Menu.buildFromTemplate(
        menuTemplate({
          send: (command) => host.events.publish({ type: 'menu', command }),
          openRecent: (path) => void openPath(path),
          clearRecent: () => {
            recent = [];
            void writeRecent(recentPath, recent);
            buildMenu();
          },
          openLogs: () => void shell.openPath(logsFolder),
          recent: recent.map((path) => ({ path, label: recentLabel(path) })),
          platform: process.platform,
        }) as Electron.MenuItemConstructorOptions[],
      ),
    );
  }

  registerIpc(
    host.handlers,
    host.events,
    () => window,
    (paths) => {
      for (const path of paths) void openPath(path);
    },
  );
  buildMenu();

  const state = fitToDisplays(
    await readWindowState(windowStatePath),
    screen.getAllDisplays().map((display) => display.workArea),
  );
  window = new BrowserWindow(mainWindowOptions(preloadPath, state));
  if (state.maximized) window.maximize();
  window.once('ready-to-show', () => window?.show());
  window.webContents.on('render-process-gone', (_event, details) => log(`renderer gone: ${details.reason}`));
  window.webContents.once('did-finish-load', () => {
    openWhenReady = (path) => void openPath(path);
    for (const path of pendingFiles.splice(0)) void openPath(path);
  });

  window.on('close', (event) => {
    const current = window!;
    const bounds: WindowState = { ...current.getNormalBounds(), maximized: current.isMaximized() };
    void writeWindowState(windowStatePath, bounds);
    if (!unsaved || closeConfirmed) return;
    event.preventDefault();
    void dialog.showMessageBox(current, closePrompt).then(async ({ response }) => {
      const choice = closeChoice(response);
      if (choice === 'discard') {
        closeConfirmed = true;
        current.close();
      } else if (choice === 'save') {
        host.events.publish({ type: 'menu', command: 'save' });
        const saved = await new Promise<boolean>((resolve) => {
          const done = (): void => resolve(true);
          savedWaiters.add(done);
          setTimeout(() => {
            savedWaiters.delete(done);
            resolve(false);
          }, 120_000);
        });
        if (saved) {
          closeConfirmed = true;
          current.close();
        }
      }
    });
  });
  window.on('closed', () => (window = null));

  app.on('second-instance', (_event, argv, cwd) => {
    for (const path of filesFromArgv(argv, cwd)) void openPath(path);
    if (window) {
      if (window.isMinimized()) window.restore();
      window.focus();
    }
  });

  app.on('window-all-closed', () => app.quit());
  app.on('will-quit', (event) => {
    event.preventDefault();
    app.removeAllListeners('will-quit');
    void Promise.all([host.jobs.cancelAll(), host.recovery.closeCleanly()]).finally(() => {
      log('quit');
      app.quit();
    });
  });

  await window.loadURL(appEntry);
}
