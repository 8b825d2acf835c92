/**
 * The renderer's api, derived from the one channel table: `api.<channel>(request)` for every
 * channel, `api.onEvent` for what the host pushes, and `api.runJob` for long work with progress and
 * cancel. The transport underneath is Electron's preload bridge or the loopback web host; both carry
 * the same envelopes, so the screens never know which one they run on.
 */
import {
  channelNames,
  channels,
  type ChannelName,
  type HostEvent,
  type JobChannelName,
  type JobEvent,
  type JobResultOf,
  type RequestOf,
  type ResponseOf,
} from '../../shared-core/api.js';

/** A failure the host reported (a refused request, a service error) or the transport hit. */
export class ApiError extends Error {
  constructor(
    readonly channel: string,
    readonly code: string,
    message: string,
    readonly issues: readonly string[] = [],
  ) {
    super(message);
    this.name = 'ApiError';
  }
}

/** What a host answers to every call. */
export type Envelope =
  { ok: true; value: unknown } | { ok: false; error: { code: string; message: string; issues?: string[] } };

export interface Transport {
  /** Sends one request; resolves with the host's envelope. */
  invoke(channel: ChannelName, request: unknown): Promise<Envelope>;
  /** Subscribes to host events; returns the unsubscribe function. */
  onEvent(listener: (event: HostEvent) => void): () => void;
}

export interface JobOptions {
  onProgress?: (fraction: number, message: string) => void;
  /** Aborting asks the host to cancel; the promise then rejects with code "cancelled". */
  signal?: AbortSignal;
}

export type ChannelCalls = { [C in ChannelName]: (request: RequestOf<C>) => Promise<ResponseOf<C>> };

export interface Api extends ChannelCalls {
  onEvent(listener: (event: HostEvent) => void): () => void;
  runJob<C extends JobChannelName>(
    channel: C,
    request: RequestOf<C>,
    options?: JobOptions,
  ): Promise<JobResultOf<C>>;
}

export function createApi(transport: Transport): Api {
  async function call(channel: ChannelName, request: unknown): Promise<unknown> {
    const envelope = await transport.invoke(channel, request);
    if (!envelope.ok)
      throw new ApiError(channel, envelope.error.code, envelope.error.message, envelope.error.issues);
    // The host is trusted, but a mismatch here is a version skew worth catching loudly.
    const parsed = channels[channel].response.safeParse(envelope.value);
    if (!parsed.success)
      throw new ApiError(
        channel,
        'bad-response',
        `the host's answer to ${channel} did not match the contract`,
      );
    return parsed.data;
  }

  const calls = Object.fromEntries(
    channelNames.map((name) => [name, (request: unknown) => call(name, request)]),
  ) as unknown as ChannelCalls;

  function runJob<C extends JobChannelName>(
    channel: C,
    request: RequestOf<C>,
    options: JobOptions = {},
  ): Promise<JobResultOf<C>> {
    return new Promise((resolve, reject) => {
      let jobId: string | null = null;
      let settled = false;
      const early: JobEvent[] = [];

      const finish = (event: JobEvent): void => {
        if (settled) return;
        if (event.state === 'progress') {
          options.onProgress?.(event.fraction, event.message);
          return;
        }
        settled = true;
        unsubscribe();
        options.signal?.removeEventListener('abort', onAbort);
        if (event.state === 'done') {
          const parsed = channels[channel].result.safeParse(event.result);
          if (parsed.success) resolve(parsed.data as JobResultOf<C>);
          else
            reject(
              new ApiError(channel, 'bad-response', `the result of ${channel} did not match the contract`),
            );
        } else if (event.state === 'cancelled') {
          reject(new ApiError(channel, 'cancelled', 'cancelled'));
        } else {
          const message = event.findings.map((finding) => finding.message).join('; ') || `${channel} failed`;
          reject(
            new ApiError(
              channel,
              'failed',
              message,
              event.findings.map((finding) => finding.message),
            ),
          );
        }
      };

      const unsubscribe = transport.onEvent((hostEvent) => {
        if (hostEvent.type !== 'job') return;
        if (jobId === null) early.push(hostEvent.event);
        else if (hostEvent.event.jobId === jobId) finish(hostEvent.event);
      });

      const onAbort = (): void => {
        if (jobId !== null) void calls.cancelJob({ jobId }).catch(() => undefined);
      };
      options.signal?.addEventListener('abort', onAbort);

      call(channel, request).then(
        async (started) => {
          jobId = (started as { jobId: string }).jobId;
          for (const event of early.splice(0)) if (event.jobId === jobId) finish(event);
          if (options.signal?.aborted) onAbort();
          // The job may have ended before the subscription saw it (a fast job, a reconnect).
          if (!settled) {
            const status = await calls.jobStatus({ jobId }).catch(() => null);
            if (status && status.state !== 'progress') finish(status);
          }
        },
        (error: unknown) => {
          settled = true;
          unsubscribe();
          reject(error);
        },
      );
    });
  }

  return { ...calls, onEvent: (listener) => transport.onEvent(listener), runJob };
}
