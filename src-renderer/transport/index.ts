/**
 * `api`: the renderer's one way to reach its host. Under Electron the preload has put the bridge
 * on `window.limitLedger`; otherwise the page was served by the loopback host.
 */
import type { BridgeApi } from '../../shared-core/api.js';
import { createApi } from './client.js';
import { electronTransport } from './electron-transport.js';
import { webTransport } from './web-transport.js';

export { ApiError, type Api, type JobOptions } from './client.js';

const bridge = (globalThis as { limitLedger?: BridgeApi }).limitLedger;

export const hostKind: 'electron' | 'web' = bridge ? 'electron' : 'web';

export const api = createApi(
  bridge
    ? electronTransport(bridge)
    : webTransport(
        (url, init) => fetch(url, init),
        (url) => new EventSource(url),
      ),
);
