/**
 * Registers every channel of the table with ipcMain (validated in src-main/desktop/ipc-table.ts)
 * and forwards host events to the window. The only other ipc message is a drop, whose paths main
 * checks before it issues handles.
 */
import { ipcMain, type BrowserWindow } from 'electron';
import { hostEventChannel, type HostEvent } from '../../shared-core/api.js';
import type { HostEvents } from '../desktop/host-events.js';
import type { Handlers } from '../desktop/host-handlers.js';
import { ipcHandlerTable } from '../desktop/ipc-table.js';
import { isAllowedNavigation } from '../desktop/window-options.js';

export const droppedChannel = 'limit-ledger:dropped';

export function registerIpc(
  handlers: Handlers,
  events: HostEvents,
  window: () => BrowserWindow | null,
  onDropped: (paths: string[]) => void,
): () => void {
  const table = ipcHandlerTable(handlers);
  for (const [channel, handler] of table) {
    ipcMain.handle(channel, (event, request: unknown) => handler(event.senderFrame?.url, request));
  }
  const dropped = (event: Electron.IpcMainEvent, paths: unknown): void => {
    if (!isAllowedNavigation(event.senderFrame?.url ?? '')) return;
    if (
      !Array.isArray(paths) ||
      paths.length > 20 ||
      !paths.every((path) => typeof path === 'string' && path.length < 4096)
    )
      return;
    onDropped(paths as string[]);
  };
  ipcMain.on(droppedChannel, dropped);
  const unsubscribe = events.subscribe((event: HostEvent) => {
    const target = window();
    if (target && !target.isDestroyed()) target.webContents.send(hostEventChannel, event);
  });
  return () => {
    for (const channel of table.keys()) ipcMain.removeHandler(channel);
    ipcMain.off(droppedChannel, dropped);
    unsubscribe();
  };
}
