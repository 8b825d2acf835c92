/**
 * The desktop transport: the preload exposes `window.limitLedger` (see src-main/desktop/bridge.ts),
 * which forwards each call to ipcRenderer.invoke and each host event from main.
 */
import { HostEvent, type BridgeApi, type ChannelName } from '../../shared-core/api.js';
import type { Envelope, Transport } from './client.js';

export function electronTransport(bridge: BridgeApi): Transport {
  return {
    async invoke(channel: ChannelName, request: unknown): Promise<Envelope> {
      return (await bridge.invoke(channel, request)) as Envelope;
    },
    onEvent(listener) {
      return bridge.onEvent((event) => {
        const parsed = HostEvent.safeParse(event);
        if (parsed.success) listener(parsed.data);
      });
    },
  };
}
