/**
 * The browser host's transport: each channel is POSTed as JSON to /api/<channel> on the same
 * origin (the session cookie rides along), and host events arrive as server-sent events on
 * /api/events.
 */
import { HostEvent, type ChannelName } from '../../shared-core/api.js';
import type { Envelope, Transport } from './client.js';

interface FetchResponse {
  status: number;
  json(): Promise<unknown>;
}
type FetchLike = (
  url: string,
  init: { method: string; headers: Record<string, string>; body: string; credentials: 'same-origin' },
) => Promise<FetchResponse>;
interface EventSourceLike {
  addEventListener(type: 'message', listener: (event: { data: string }) => void): void;
  close(): void;
}
type EventSourceFactory = (url: string) => EventSourceLike;

export function webTransport(fetchImpl: FetchLike, openEvents: EventSourceFactory): Transport {
  const listeners = new Set<(event: HostEvent) => void>();
  let source: EventSourceLike | null = null;

  return {
    async invoke(channel: ChannelName, request: unknown): Promise<Envelope> {
      let response: FetchResponse;
      try {
        response = await fetchImpl(`/api/${channel}`, {
          method: 'POST',
          headers: { 'content-type': 'application/json' },
          body: JSON.stringify(request ?? {}),
          credentials: 'same-origin',
        });
      } catch {
        return {
          ok: false,
          error: {
            code: 'unreachable',
            message: 'the Limit Ledger host is not running; start it again with npm run serve',
          },
        };
      }
      const body = (await response.json().catch(() => null)) as Envelope | null;
      if (body && typeof body === 'object' && 'ok' in body) return body;
      return {
        ok: false,
        error: { code: `http-${response.status}`, message: `the host answered ${response.status}` },
      };
    },
    onEvent(listener) {
      listeners.add(listener);
      if (source === null) {
        source = openEvents('/api/events');
        source.addEventListener('message', (message) => {
          let data: unknown;
          try {
            data = JSON.parse(message.data);
          } catch {
            return;
          }
          const parsed = HostEvent.safeParse(data);
          if (parsed.success) for (const each of [...listeners]) each(parsed.data);
        });
      }
      return () => {
        listeners.delete(listener);
        if (listeners.size === 0 && source !== null) {
          source.close();
          source = null;
        }
      };
    },
  };
}
