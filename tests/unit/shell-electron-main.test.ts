import { mkdtemp, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { channelNames, hostEventChannel, ipcChannelOf } from '../../shared-core/api.js';

/**
 * main.ts run against a stand-in for Electron (the binary is never present here): what it asks of
 * Electron is recorded, so the wiring of the window, the scheme, the ipc channels, navigation,
 * permissions, the close prompt and the second launch is checked without the runtime.
 */
const recorded = vi.hoisted(() => {
  type Listener = (...args: unknown[]) => unknown;
  const on = () => {
    const listeners = new Map<string, Listener[]>();
    return {
      listeners,
      on(name: string, listener: Listener) {
        listeners.set(name, [...(listeners.get(name) ?? []), listener]);
        return this;
      },
      once(name: string, listener: Listener) {
        return this.on(name, listener);
      },
      emit(name: string, ...args: unknown[]) {
        for (const listener of listeners.get(name) ?? []) listener(...args);
      },
    };
  };
  const state = {
    root: '',
    schemes: [] as unknown[],
    protocolHandlers: new Map<string, (request: Request) => Promise<Response>>(),
    ipcHandlers: new Map<string, Listener>(),
    ipcListeners: new Map<string, Listener>(),
    windows: [] as {
      options: Record<string, unknown>;
      loaded: string[];
      sent: [string, unknown][];
      events: ReturnType<typeof on>;
      contents: ReturnType<typeof on>;
      prevented: number;
    }[],
    permissionRequest: null as null | Listener,
    permissionCheck: null as null | Listener,
    beforeRequest: null as null | { filter: unknown; listener: Listener },
    dialogs: [] as unknown[],
    menus: 0,
    app: on(),
  };
  return state;
});

vi.mock('electron', () => {
  const app = Object.assign(recorded.app, {
    requestSingleInstanceLock: () => true,
    quit: vi.fn(),
    whenReady: () => Promise.resolve(),
    getPath: (name: string) => join(recorded.root, name),
    setAppLogsPath: () => undefined,
    getVersion: () => '0.1.0',
    removeAllListeners: () => undefined,
  });
  class BrowserWindow {
    readonly record;
    readonly webContents;
    constructor(options: Record<string, unknown>) {
      const make = () => {
        const listeners = new Map<string, ((...args: unknown[]) => unknown)[]>();
        return {
          listeners,
          on(name: string, listener: (...args: unknown[]) => unknown) {
            listeners.set(name, [...(listeners.get(name) ?? []), listener]);
            return this;
          },
          once(name: string, listener: (...args: unknown[]) => unknown) {
            return this.on(name, listener);
          },
          emit(name: string, ...args: unknown[]) {
            for (const listener of listeners.get(name) ?? []) listener(...args);
          },
        };
      };
      this.record = {
        options,
        loaded: [] as string[],
        sent: [] as [string, unknown][],
        events: make(),
        contents: make(),
        prevented: 0,
      };
      recorded.windows.push(this.record);
      const record = this.record;
      this.webContents = Object.assign(record.contents, {
        send: (channel: string, payload: unknown) => record.sent.push([channel, payload]),
      });
    }
    on(name: string, listener: (...args: unknown[]) => unknown) {
      this.record.events.on(name, listener);
      return this;
    }
    once(name: string, listener: (...args: unknown[]) => unknown) {
      return this.on(name, listener);
    }
    async loadURL(url: string) {
      this.record.loaded.push(url);
    }
    maximize() {}
    show() {}
    focus() {}
    restore() {}
    isMinimized() {
      return false;
    }
    isDestroyed() {
      return false;
    }
    isMaximized() {
      return false;
    }
    getNormalBounds() {
      return { x: 10, y: 20, width: 1200, height: 800 };
    }
    setDocumentEdited() {}
    close() {}
  }
  return {
    app,
    BrowserWindow,
    dialog: {
      showMessageBox: async (_window: unknown, options: unknown) => {
        recorded.dialogs.push(options);
        return { response: 2 };
      },
      showOpenDialog: async () => ({ canceled: true, filePaths: [] }),
      showSaveDialog: async () => ({ canceled: true }),
    },
    Menu: { buildFromTemplate: (template: unknown) => template, setApplicationMenu: () => recorded.menus++ },
    protocol: {
      registerSchemesAsPrivileged: (schemes: unknown[]) => recorded.schemes.push(...schemes),
      handle: (scheme: string, handler: (request: Request) => Promise<Response>) =>
        recorded.protocolHandlers.set(scheme, handler),
    },
    screen: { getAllDisplays: () => [{ workArea: { x: 0, y: 0, width: 1920, height: 1080 } }] },
    session: {
      defaultSession: {
        setPermissionRequestHandler: (handler: (...args: unknown[]) => unknown) =>
          (recorded.permissionRequest = handler),
        setPermissionCheckHandler: (handler: (...args: unknown[]) => unknown) =>
          (recorded.permissionCheck = handler),
        webRequest: {
          onBeforeRequest: (filter: unknown, listener: (...args: unknown[]) => unknown) =>
            (recorded.beforeRequest = { filter, listener }),
        },
      },
    },
    shell: { openPath: async () => '' },
    ipcMain: {
      handle: (channel: string, handler: (...args: unknown[]) => unknown) =>
        recorded.ipcHandlers.set(channel, handler),
      on: (channel: string, listener: (...args: unknown[]) => unknown) =>
        recorded.ipcListeners.set(channel, listener),
      removeHandler: () => undefined,
      off: () => undefined,
    },
  };
});

describe('the Electron main process, against a stand-in for Electron', () => {
  beforeAll(async () => {
    recorded.root = await mkdtemp(join(tmpdir(), 'll-electron-'));
    await import('../../src-main/electron/main.js');
    // start() continues after whenReady; let its awaits run.
    for (let i = 0; i < 50 && recorded.windows[0]?.loaded.length !== 1; i++)
      await new Promise((resolve) => setTimeout(resolve, 10));
  });
  afterAll(async () => {
    await rm(recorded.root, { recursive: true, force: true });
  });

  it('registers the app scheme as secure and standard before the app is ready', () => {
    expect(recorded.schemes).toEqual([
      expect.objectContaining({
        scheme: 'app',
        privileges: expect.objectContaining({ standard: true, secure: true }),
      }),
    ]);
  });

  it('opens one hardened window on the app’s own page', () => {
    expect(recorded.windows).toHaveLength(1);
    const [window] = recorded.windows;
    expect(window.options.webPreferences).toMatchObject({
      contextIsolation: true,
      sandbox: true,
      nodeIntegration: false,
      webSecurity: true,
    });
    expect(String((window.options.webPreferences as { preload: string }).preload)).toMatch(/preload\.cjs$/);
    expect(window.loaded).toEqual(['app://renderer/index.html']);
    expect(recorded.menus).toBeGreaterThan(0);
  });

  it('registers exactly the table’s channels, and they refuse a foreign sender', async () => {
    expect([...recorded.ipcHandlers.keys()].sort()).toEqual(channelNames.map(ipcChannelOf).sort());
    const handler = recorded.ipcHandlers.get(ipcChannelOf('hostInfo'))!;
    expect(await handler({ senderFrame: { url: 'https://example.com/' } }, {})).toMatchObject({
      ok: false,
      error: { code: 'untrusted-sender' },
    });
    expect(await handler({ senderFrame: { url: 'app://renderer/index.html' } }, {})).toEqual({
      ok: true,
      value: { host: 'electron', version: '0.1.0' },
    });
  });

  it('refuses navigation away from the app and every new window, in every web contents', () => {
    const created = recorded.app.listeners.get('web-contents-created')![0];
    const listeners = new Map<string, (...args: unknown[]) => unknown>();
    let openHandler: (() => unknown) | null = null;
    created(
      {},
      {
        on: (name: string, listener: (...args: unknown[]) => unknown) => listeners.set(name, listener),
        setWindowOpenHandler: (handler: () => unknown) => (openHandler = handler),
      },
    );
    let prevented = 0;
    const event = { preventDefault: () => prevented++ };
    listeners.get('will-navigate')!(event, 'https://example.com/');
    listeners.get('will-navigate')!(event, 'file:///etc/passwd');
    listeners.get('will-navigate')!(event, 'app://renderer/index.html');
    listeners.get('will-redirect')!(event, 'http://127.0.0.1:1/');
    listeners.get('will-attach-webview')!(event);
    expect(prevented).toBe(4);
    expect(openHandler!()).toEqual({ action: 'deny' });
  });

  it('refuses permissions and any request to the network', () => {
    let granted: boolean | null = null;
    recorded.permissionRequest!({}, 'media', (answer: boolean) => (granted = answer));
    expect(granted).toBe(false);
    expect(recorded.permissionCheck!({}, 'clipboard-read')).toBe(false);
    let cancelled: unknown = null;
    recorded.beforeRequest!.listener(
      { url: 'https://example.com/' },
      (answer: unknown) => (cancelled = answer),
    );
    expect(cancelled).toEqual({ cancel: true });
    expect(recorded.beforeRequest!.filter).toEqual({
      urls: ['http://*/*', 'https://*/*', 'ws://*/*', 'wss://*/*'],
    });
  });

  it('serves the renderer scheme with the CSP, and nothing outside the renderer folder', async () => {
    const handler = recorded.protocolHandlers.get('app')!;
    const outside = await handler(new Request('app://renderer/%2e%2e/%2e%2e/package.json'));
    expect(outside.status).toBe(404);
    expect(outside.headers.get('content-security-policy')).toContain("default-src 'none'");
  });

  it('opens a study passed to a second launch in the first window, by handle', async () => {
    const study = join(recorded.root, 'line 3.ledger');
    await writeFile(study, '{}');
    const secondInstance = recorded.app.listeners.get('second-instance')![0];
    secondInstance({}, ['/opt/limit-ledger', study], recorded.root);
    const [window] = recorded.windows;
    for (let i = 0; i < 50 && window.sent.length === 0; i++)
      await new Promise((resolve) => setTimeout(resolve, 10));
    expect(window.sent).toEqual([
      [
        hostEventChannel,
        {
          type: 'file-opened',
          file: expect.objectContaining({ fileName: 'line 3.ledger' }),
          purpose: 'study',
        },
      ],
    ]);
    expect(JSON.stringify(window.sent)).not.toContain(recorded.root);
  });

  it('asks before closing with unsaved changes, and keeps the window when the user stays', async () => {
    const setUnsaved = recorded.ipcHandlers.get(ipcChannelOf('setUnsaved'))!;
    await setUnsaved({ senderFrame: { url: 'app://renderer/index.html' } }, { unsaved: true });
    const [window] = recorded.windows;
    let prevented = 0;
    window.events.emit('close', { preventDefault: () => prevented++ });
    expect(prevented).toBe(1);
    await new Promise((resolve) => setTimeout(resolve, 10));
    expect(recorded.dialogs).toEqual([
      expect.objectContaining({
        title: 'Unsaved changes',
        buttons: ['Save…', 'Discard changes', 'Keep working'],
      }),
    ]);
  });

  it('accepts dropped files only from the app’s page', async () => {
    const dropped = recorded.ipcListeners.get('limit-ledger:dropped')!;
    const [window] = recorded.windows;
    const before = window.sent.length;
    dropped({ senderFrame: { url: 'https://example.com/' } }, [join(recorded.root, 'line 3.ledger')]);
    dropped({ senderFrame: { url: 'app://renderer/index.html' } }, 'not a list');
    await new Promise((resolve) => setTimeout(resolve, 30));
    expect(window.sent.length).toBe(before);
    dropped({ senderFrame: { url: 'app://renderer/index.html' } }, [join(recorded.root, 'line 3.ledger')]);
    for (let i = 0; i < 50 && window.sent.length === before; i++)
      await new Promise((resolve) => setTimeout(resolve, 10));
    expect(window.sent.length).toBe(before + 1);
  });
});
