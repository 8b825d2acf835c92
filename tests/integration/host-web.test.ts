import { request as httpRequest } from 'node:http';
import { rm, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { channelNames } from '../../shared-core/api.js';
import type { BrowserHost } from '../../src-main/web/browser-host.js';
import { startTestHost, type fakeServices } from './host-helpers.js';

interface Reply {
  status: number;
  headers: Record<string, string | string[] | undefined>;
  body: string;
}

/** A raw HTTP request, so that Host and Origin can be set the way a hostile page's browser would. */
function send(
  port: number,
  method: string,
  path: string,
  headers: Record<string, string> = {},
  body?: string,
): Promise<Reply> {
  return new Promise((resolve, reject) => {
    const request = httpRequest(
      { host: '127.0.0.1', port, method, path, headers: { host: `127.0.0.1:${port}`, ...headers } },
      (response) => {
        let text = '';
        response.setEncoding('utf8');
        response.on('data', (chunk) => (text += chunk));
        response.on('end', () =>
          resolve({ status: response.statusCode ?? 0, headers: response.headers, body: text }),
        );
      },
    );
    request.on('error', reject);
    if (body !== undefined) request.write(body);
    request.end();
  });
}

describe('the browser host', () => {
  let host: BrowserHost;
  let services: ReturnType<typeof fakeServices>;
  let root: string;
  let cookie: string;
  const json = { 'content-type': 'application/json' };

  beforeAll(async () => {
    ({ host, services, root } = await startTestHost());
  });
  afterAll(async () => {
    await host.close();
    await rm(root, { recursive: true, force: true });
  });

  const api = (channel: string, payload: unknown, headers: Record<string, string> = { cookie }) =>
    send(host.port, 'POST', `/api/${channel}`, { ...json, ...headers }, JSON.stringify(payload));

  it('listens on 127.0.0.1 with a per-run token in the URL', () => {
    expect(host.url).toMatch(/^http:\/\/127\.0\.0\.1:\d+\/\?token=[A-Za-z0-9_-]{32}$/);
    expect((host.server.address() as { address: string }).address).toBe('127.0.0.1');
  });

  it('swaps the token for an HttpOnly SameSite=Strict cookie and drops it from the address', async () => {
    const reply = await send(host.port, 'GET', `/?token=${host.session.token}`);
    expect(reply.status).toBe(303);
    expect(reply.headers.location).toBe('/');
    const setCookie = String(reply.headers['set-cookie']);
    expect(setCookie).toMatch(/^ll_session=[A-Za-z0-9_-]+; HttpOnly; SameSite=Strict; Path=\/$/);
    expect(setCookie).not.toContain(host.session.token);
    cookie = setCookie.split(';')[0];
    const page = await send(host.port, 'GET', '/', { cookie });
    expect(page.status).toBe(200);
    expect(page.body).toContain('<div id="app">');
    expect(page.headers['content-security-policy']).toContain("script-src 'self'");
    expect(page.headers['x-frame-options']).toBe('DENY');
  });

  it('refuses a wrong token with 403 and shows no page without a session', async () => {
    expect((await send(host.port, 'GET', '/?token=not-the-token')).status).toBe(403);
    expect((await send(host.port, 'GET', '/')).status).toBe(401);
    expect((await send(host.port, 'GET', '/assets/app.js')).status).toBe(401);
  });

  it('refuses /api/ calls without credentials (401) or with wrong ones (403), before any service runs', async () => {
    const before = services.calls.length;
    expect((await api('demoStudy', {}, {})).status).toBe(401);
    expect((await api('demoStudy', {}, { cookie: 'll_session=forged' })).status).toBe(403);
    expect((await api('demoStudy', {}, { authorization: 'Bearer forged' })).status).toBe(403);
    expect((await send(host.port, 'GET', '/api/events')).status).toBe(401);
    expect(services.calls.length).toBe(before);
  });

  it('accepts the token as a bearer credential for automation', async () => {
    const reply = await api('hostInfo', {}, { authorization: `Bearer ${host.session.token}` });
    expect(reply.status).toBe(200);
    expect(JSON.parse(reply.body)).toEqual({
      ok: true,
      value: { host: 'web', version: '0.1.0', workspace: 'workspace' },
    });
  });

  it('refuses a foreign Host header even with a valid session (DNS rebinding)', async () => {
    for (const hostHeader of [
      `evil.example:${host.port}`,
      'localhost:1',
      `127.0.0.1.nip.io:${host.port}`,
      `[::1]:${host.port}`,
    ]) {
      const reply = await send(
        host.port,
        'POST',
        '/api/hostInfo',
        { ...json, cookie, host: hostHeader },
        '{}',
      );
      expect(reply.status, hostHeader).toBe(403);
      expect(JSON.parse(reply.body).error.code).toBe('wrong-host');
    }
    expect((await send(host.port, 'GET', '/', { cookie, host: `localhost:${host.port}` })).status).toBe(200);
  });

  it('refuses a foreign Origin and cross-site fetches', async () => {
    const foreign = await api('hostInfo', {}, { cookie, origin: 'http://evil.example' });
    expect(foreign.status).toBe(403);
    expect(JSON.parse(foreign.body).error.code).toBe('foreign-origin');
    expect((await api('hostInfo', {}, { cookie, origin: `http://127.0.0.1:${host.port + 1}` })).status).toBe(
      403,
    );
    expect((await api('hostInfo', {}, { cookie, 'sec-fetch-site': 'cross-site' })).status).toBe(403);
    expect((await api('hostInfo', {}, { cookie, origin: host.origin })).status).toBe(200);
  });

  it('refuses a malformed payload on every channel, before its handler runs', async () => {
    const before = services.calls.length;
    for (const channel of channelNames) {
      for (const payload of ['not an object', [1, 2], { unexpected: { deeply: true }, file: 42, jobId: 7 }]) {
        const reply = await api(channel, payload);
        expect(reply.status, `${channel} ${JSON.stringify(payload)}`).toBe(400);
        expect(JSON.parse(reply.body).error.code).toBe('bad-request');
      }
    }
    expect(services.calls.length).toBe(before);
  });

  it('answers an unknown channel with 404, a non-JSON body with 400 or 415, and GET on a channel with 405', async () => {
    expect((await api('deleteEverything', {})).status).toBe(404);
    expect((await api('__proto__', {})).status).toBe(404);
    expect((await send(host.port, 'POST', '/api/hostInfo', { ...json, cookie }, '{oops')).status).toBe(400);
    expect(
      (await send(host.port, 'POST', '/api/hostInfo', { cookie, 'content-type': 'text/plain' }, '{}')).status,
    ).toBe(415);
    expect((await send(host.port, 'GET', '/api/hostInfo', { cookie })).status).toBe(405);
  });

  it('serves nothing outside the renderer folder', async () => {
    for (const path of ['/../secret.txt', '/%2e%2e/secret.txt', '/assets/..%2f..%2fsecret.txt', '/%00']) {
      const reply = await send(host.port, 'GET', path, { cookie });
      expect(reply.status, path).not.toBe(200);
      expect(reply.body).not.toContain('outside the renderer');
    }
  });

  it('uploads a file, opens it as a study, and saves it only into the workspace', async () => {
    const bytes = Buffer.from(JSON.stringify({ schemaVersion: 1, marker: 'uploaded' })).toString('base64');
    const uploaded = JSON.parse(
      (await api('uploadFile', { purpose: 'study', fileName: 'line 3.ledger', bytes })).body,
    );
    expect(uploaded.ok).toBe(true);
    expect(uploaded.value.fileName).toBe('line 3.ledger');
    expect(uploaded.value).not.toHaveProperty('path');
    const opened = JSON.parse((await api('openStudy', { file: uploaded.value.handle })).body);
    expect(opened.value.ok).toBe(true);
    expect(opened.value.value.document).toEqual({ schemaVersion: 1, marker: 'uploaded' });
    // An upload is not a save target; a workspace name is.
    const refused = JSON.parse(
      (await api('saveStudy', { target: uploaded.value.handle, document: {} })).body,
    );
    expect(refused.error.code).toBe('not-writable');
    const escape = await api('chooseSaveTarget', { purpose: 'study', suggestedName: '../outside.ledger' });
    expect(escape.status).toBe(400);
    const target = JSON.parse(
      (await api('chooseSaveTarget', { purpose: 'study', suggestedName: 'line 3' })).body,
    );
    expect(target.value.fileName).toBe('line 3.ledger');
    const saved = JSON.parse((await api('saveStudy', { target: target.value.handle, document: {} })).body);
    expect(saved.value.saved).toBe(true);
    expect(services.calls.at(-1)).toBe(`saveStudy ${join(host.workspace, 'line 3.ledger')}`);
  });

  it('lists the workspace studies by handle, never by path', async () => {
    await writeFile(join(host.workspace, 'kept.ledger'), '{}');
    const listed = JSON.parse((await api('listWorkspace', {})).body);
    expect(listed.value.files.map((file: { fileName: string }) => file.fileName)).toContain('kept.ledger');
    expect(JSON.stringify(listed)).not.toContain(host.workspace);
  });

  it('streams job progress as server-sent events', async () => {
    const received: string[] = [];
    const stream = await new Promise<import('node:http').IncomingMessage>((resolve, reject) => {
      const request = httpRequest(
        {
          host: '127.0.0.1',
          port: host.port,
          path: '/api/events',
          headers: { host: `127.0.0.1:${host.port}`, cookie },
        },
        resolve,
      );
      request.on('error', reject);
      request.end();
    });
    expect(stream.headers['content-type']).toContain('text/event-stream');
    stream.setEncoding('utf8');
    stream.on('data', (chunk: string) => received.push(chunk));
    const jobId = host.parts.jobs.start(
      'write',
      { chunks: 3, delayMs: 60 },
      { outputTarget: join(host.workspace, 'x.txt') },
    );
    await host.parts.jobs.settled(jobId);
    await new Promise((resolve) => setTimeout(resolve, 50));
    stream.destroy();
    const events = received
      .join('')
      .split('\n\n')
      .filter((block) => block.startsWith('data: '))
      .map((block) => JSON.parse(block.slice(6)));
    const mine = events
      .filter((event) => event.type === 'job' && event.event.jobId === jobId)
      .map((event) => event.event.state);
    expect(mine).toContain('progress');
    expect(mine.at(-1)).toBe('done');
    const status = JSON.parse((await api('jobStatus', { jobId })).body);
    expect(status.value).toEqual({ jobId, state: 'done', result: { lines: 3 } });
  });

  it('keeps site settings valid: a bad one is refused, a good one saved', async () => {
    const current = JSON.parse((await api('siteSettings', {})).body).value;
    expect((await api('saveSiteSettings', { ...current, paperSize: 'A3' })).status).toBe(400);
    const next = { ...current, paperSize: 'Letter' };
    expect(JSON.parse((await api('saveSiteSettings', next)).body).value.paperSize).toBe('Letter');
  });
});
