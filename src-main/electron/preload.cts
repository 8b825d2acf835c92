/**
 * The preload: exposes `window.limitLedger` and nothing else. It is a sandboxed CommonJS script, so
 * it imports nothing but electron; the channel table's names are checked by main, which registers a
 * handler for exactly the table's channels, and every request is validated there.
 */
// A sandboxed preload is a CommonJS script: require is the only way in.
// eslint-disable-next-line @typescript-eslint/no-require-imports
import electron = require('electron');
import type { IpcRendererEvent } from 'electron';

const { contextBridge, ipcRenderer, webUtils } = electron;

const prefix = 'limit-ledger:';
const eventChannel = 'limit-ledger:event';
const droppedChannel = 'limit-ledger:dropped';
const channelName = /^[A-Za-z]{1,40}$/;

const bridge = Object.freeze({
  invoke(channel: unknown, request: unknown): Promise<unknown> {
    if (typeof channel !== 'string' || !channelName.test(channel)) {
      return Promise.resolve({
        ok: false,
        error: { code: 'unknown-channel', message: 'there is no such channel' },
      });
    }
    return ipcRenderer.invoke(prefix + channel, request);
  },
  onEvent(listener: unknown): () => void {
    if (typeof listener !== 'function') throw new TypeError('onEvent needs a function');
    // The ipc event object (with its sender) never reaches the page: only the payload does.
    const forward = (_event: IpcRendererEvent, payload: unknown): void => void listener(payload);
    ipcRenderer.on(eventChannel, forward);
    return () => {
      ipcRenderer.removeListener(eventChannel, forward);
    };
  },
});

contextBridge.exposeInMainWorld('limitLedger', bridge);

interface DropEvent {
  dataTransfer: { files: ArrayLike<unknown> } | null;
  preventDefault(): void;
  stopImmediatePropagation(): void;
}
const page = globalThis as unknown as {
  addEventListener(type: 'drop' | 'dragover', listener: (event: DropEvent) => void, capture: boolean): void;
};

// A dropped file reaches main as the path the operating system gave, never as a string the page
// wrote; main checks it and hands the page a file handle in a `file-opened` event.
page.addEventListener(
  'drop',
  (event) => {
    const files = Array.from(event.dataTransfer?.files ?? []);
    if (files.length === 0) return;
    event.preventDefault();
    event.stopImmediatePropagation();
    const paths = files
      .map((file) => webUtils.getPathForFile(file as Parameters<typeof webUtils.getPathForFile>[0]))
      .filter((path) => path !== '');
    if (paths.length > 0) ipcRenderer.send(droppedChannel, paths);
  },
  true,
);
page.addEventListener('dragover', (event) => event.preventDefault(), true);
