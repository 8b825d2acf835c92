import { channelNames, ipcChannelOf } from '../../shared-core/api.js';
import { dispatch, type Envelope, type Handlers } from './host-handlers.js';
import { isAllowedNavigation } from './window-options.js';

export type IpcHandler = (senderUrl: string | undefined, request: unknown) => Promise<Envelope>;

/**
 * One ipc handler per channel of the table, keyed by its ipc channel name. Each refuses a sender
 * that is not the app's own page (a frame that navigated elsewhere, a devtools extension) and then
 * validates the request with the channel's schema before any service runs.
 */
export function ipcHandlerTable(handlers: Handlers): Map<string, IpcHandler> {
  return new Map(
    channelNames.map((name) => [
      ipcChannelOf(name),
      async (senderUrl: string | undefined, request: unknown): Promise<Envelope> => {
        if (senderUrl === undefined || !isAllowedNavigation(senderUrl)) {
          return {
            ok: false,
            error: { code: 'untrusted-sender', message: 'only the app’s own page may call the host' },
          };
        }
        return dispatch(handlers, name, request);
      },
    ]),
  );
}
