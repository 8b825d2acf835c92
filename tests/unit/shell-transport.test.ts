import { describe, expect, it } from 'vitest';
import type { HostEvent } from '../../shared-core/api.js';
import { ApiError, createApi, type Envelope, type Transport } from '../../src-renderer/transport/client.js';
import { webTransport } from '../../src-renderer/transport/web-transport.js';

/** A host in memory: answers from a table and pushes events on demand. */
function fakeTransport(answer: (channel: string, request: unknown) => Envelope) {
  const listeners = new Set<(event: HostEvent) => void>();
  const calls: [string, unknown][] = [];
  const transport: Transport = {
    async invoke(channel, request) {
      calls.push([channel, request]);
      return answer(channel, request);
    },
    onEvent(listener) {
      listeners.add(listener);
      return () => listeners.delete(listener);
    },
  };
  return {
    transport,
    calls,
    push: (event: HostEvent) => listeners.forEach((listener) => listener(event)),
    listeners,
  };
}

const jobId = 'job-abcdef123456';

describe('the renderer client', () => {
  it('offers one function per channel and returns the parsed response', async () => {
    const { transport, calls } = fakeTransport(() => ({
      ok: true,
      value: { host: 'web', version: '0.1.0' },
    }));
    const api = createApi(transport);
    expect(await api.hostInfo({})).toEqual({ host: 'web', version: '0.1.0' });
    expect(calls).toEqual([['hostInfo', {}]]);
  });

  it('turns a refusal into an ApiError with the host message and issues', async () => {
    const { transport } = fakeTransport(() => ({
      ok: false,
      error: {
        code: 'bad-request',
        message: 'openStudy: the request is malformed',
        issues: ['file: required'],
      },
    }));
    const error = await createApi(transport)
      .openStudy({ file: 'h_0123456789' })
      .catch((caught: unknown) => caught);
    expect(error).toBeInstanceOf(ApiError);
    expect(error).toMatchObject({ code: 'bad-request', channel: 'openStudy', issues: ['file: required'] });
  });

  it('refuses an answer that does not match the contract', async () => {
    const { transport } = fakeTransport(() => ({ ok: true, value: { host: 'mainframe' } }));
    await expect(createApi(transport).hostInfo({})).rejects.toMatchObject({ code: 'bad-response' });
  });

  it('runs a job: reports progress, then resolves with the validated result', async () => {
    const fake = fakeTransport((channel) =>
      channel === 'exportPacket'
        ? { ok: true, value: { jobId } }
        : { ok: true, value: { jobId, state: 'progress', fraction: 0, message: '' } },
    );
    const api = createApi(fake.transport);
    const progress: number[] = [];
    const done = api.runJob(
      'exportPacket',
      { document: {}, format: 'pdf' },
      { onProgress: (fraction) => progress.push(fraction) },
    );
    await new Promise((resolve) => setTimeout(resolve, 0));
    fake.push({ type: 'job', event: { jobId, state: 'progress', fraction: 0.5, message: 'page 1' } });
    fake.push({ type: 'job', event: { jobId: 'job-someoneelse', state: 'done', result: {} } });
    fake.push({
      type: 'job',
      event: { jobId, state: 'done', result: { file: { handle: 'h_0123456789', fileName: 'p.pdf' } } },
    });
    await expect(done).resolves.toEqual({ file: { handle: 'h_0123456789', fileName: 'p.pdf' } });
    expect(progress).toEqual([0.5]);
    expect(fake.listeners.size).toBe(0);
  });

  it('cancels a job through its AbortSignal', async () => {
    const fake = fakeTransport((channel) => {
      if (channel === 'cancelJob') {
        queueMicrotask(() => fake.push({ type: 'job', event: { jobId, state: 'cancelled' } }));
        return { ok: true, value: { cancelled: true } };
      }
      if (channel === 'jobStatus')
        return { ok: true, value: { jobId, state: 'progress', fraction: 0.1, message: '' } };
      return { ok: true, value: { jobId } };
    });
    const controller = new AbortController();
    const done = createApi(fake.transport).runJob(
      'importData',
      { file: 'h_0123456789', mapping: { count: 'n' } },
      { signal: controller.signal },
    );
    await new Promise((resolve) => setTimeout(resolve, 0));
    controller.abort();
    await expect(done).rejects.toMatchObject({ code: 'cancelled' });
    expect(fake.calls.map(([channel]) => channel)).toContain('cancelJob');
  });

  it('catches a job that finished before its events were heard', async () => {
    const fake = fakeTransport((channel) =>
      channel === 'jobStatus'
        ? { ok: true, value: { jobId, state: 'failed', findings: [{ message: 'wrong passphrase' }] } }
        : { ok: true, value: { jobId } },
    );
    const job = createApi(fake.transport).runJob('signStudy', {
      document: {},
      meaning: 'approved',
      printedName: 'A',
      role: 'B',
      key: 'h_0123456789',
      passphrase: 'p',
    });
    await expect(job).rejects.toMatchObject({ code: 'failed', message: 'wrong passphrase' });
  });
});

describe('the web transport', () => {
  it('POSTs JSON to /api/<channel> with same-origin credentials and reads the envelope', async () => {
    const seen: { url: string; init: unknown }[] = [];
    const transport = webTransport(
      async (url, init) => {
        seen.push({ url, init });
        return { status: 200, json: async () => ({ ok: true, value: 1 }) };
      },
      () => ({ addEventListener() {}, close() {} }),
    );
    expect(await transport.invoke('hostInfo', {})).toEqual({ ok: true, value: 1 });
    expect(seen).toEqual([
      {
        url: '/api/hostInfo',
        init: {
          method: 'POST',
          headers: { 'content-type': 'application/json' },
          body: '{}',
          credentials: 'same-origin',
        },
      },
    ]);
  });

  it('reports an unreachable host and a non-envelope answer as errors', async () => {
    const down = webTransport(
      async () => Promise.reject(new TypeError('fetch failed')),
      () => ({ addEventListener() {}, close() {} }),
    );
    expect(await down.invoke('hostInfo', {})).toMatchObject({ ok: false, error: { code: 'unreachable' } });
    const odd = webTransport(
      async () => ({ status: 502, json: async () => 'bad gateway' }),
      () => ({ addEventListener() {}, close() {} }),
    );
    expect(await odd.invoke('hostInfo', {})).toMatchObject({ ok: false, error: { code: 'http-502' } });
  });

  it('opens one event stream, passes only well-formed host events, and closes it with the last listener', () => {
    let onMessage: (event: { data: string }) => void = () => undefined;
    let opened = 0;
    let closed = 0;
    const transport = webTransport(
      async () => ({ status: 200, json: async () => ({}) }),
      (url) => {
        expect(url).toBe('/api/events');
        opened++;
        return { addEventListener: (_type, listener) => (onMessage = listener), close: () => closed++ };
      },
    );
    const heard: HostEvent[] = [];
    const stopA = transport.onEvent((event) => heard.push(event));
    const stopB = transport.onEvent(() => undefined);
    onMessage({ data: JSON.stringify({ type: 'menu', command: 'save' }) });
    onMessage({ data: '{not json' });
    onMessage({ data: JSON.stringify({ type: 'menu', command: 'format-disk' }) });
    expect(heard).toEqual([{ type: 'menu', command: 'save' }]);
    stopA();
    stopB();
    expect([opened, closed]).toEqual([1, 1]);
  });
});
