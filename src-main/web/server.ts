import { createReadStream } from 'node:fs';
import { rm, stat } from 'node:fs/promises';
import { createServer, type IncomingMessage, type Server, type ServerResponse } from 'node:http';
import type { AddressInfo } from 'node:net';
import { extname, join, normalize, sep } from 'node:path';
import type { HostEvent } from '../../shared-core/api.js';
import { securityHeaders } from '../desktop/content-security-policy.js';
import { dispatch, type Envelope, type Handlers } from '../desktop/host-handlers.js';
import type { HostEvents } from '../desktop/host-events.js';
import type { DownloadStore } from './downloads.js';
import { Session } from './session.js';

export interface WebHostOptions {
  /** The built renderer (dist/renderer). */
  rendererDir: string;
  handlers: Handlers;
  events: HostEvents;
  downloads: DownloadStore;
  /** 0 picks a free port. */
  port?: number;
  /** Upper bound of a request body; uploads travel as base64 JSON. */
  maxBodyBytes?: number;
  /** Told about each refused or failed request (the host's log). */
  log?: (line: string) => void;
}

export interface WebHost {
  /** The address to open, carrying this run's token. */
  url: string;
  origin: string;
  port: number;
  session: Session;
  server: Server;
  close(): Promise<void>;
}

const mimeTypes: Record<string, string> = {
  '.html': 'text/html; charset=utf-8',
  '.js': 'text/javascript; charset=utf-8',
  '.css': 'text/css; charset=utf-8',
  '.svg': 'image/svg+xml',
  '.png': 'image/png',
  '.ico': 'image/x-icon',
  '.json': 'application/json',
  '.woff2': 'font/woff2',
  '.ttf': 'font/ttf',
  '.map': 'application/json',
};

/**
 * The loopback browser host: serves the built renderer and the channel table as POST /api/<channel>
 * on 127.0.0.1 only. Every request is checked in this order before it is routed: the Host header
 * must name this host and port (a page on a rebound DNS name is refused), a foreign Origin is
 * refused, and then the run's token (in the address, swapped for an HttpOnly SameSite=Strict cookie
 * and dropped from the address bar by a redirect) or the cookie must be present: missing is 401,
 * wrong is 403. Host events (job progress) stream as server-sent events on /api/events.
 */
export async function startWebHost(options: WebHostOptions): Promise<WebHost> {
  const session = new Session();
  const maxBody = options.maxBodyBytes ?? 210 * 1024 * 1024;
  const log = options.log ?? (() => undefined);
  const streams = new Set<ServerResponse>();
  let port = 0;

  const allowedHosts = (): string[] => [`127.0.0.1:${port}`, `localhost:${port}`];
  const allowedOrigins = (): string[] => allowedHosts().map((host) => `http://${host}`);

  const server = createServer((request, response) => {
    handle(request, response).catch((error: unknown) => {
      log(
        `error ${request.method} ${request.url}: ${error instanceof Error ? error.message : String(error)}`,
      );
      if (!response.headersSent)
        send(response, 500, { ok: false, error: { code: 'internal', message: 'the host failed' } });
      else response.destroy();
    });
  });

  async function handle(request: IncomingMessage, response: ServerResponse): Promise<void> {
    for (const [name, value] of Object.entries(securityHeaders)) response.setHeader(name, value);

    if (!allowedHosts().includes(request.headers.host ?? ''))
      return refuse(response, 403, 'wrong-host', request);
    const origin = request.headers.origin;
    if (origin !== undefined && !allowedOrigins().includes(origin))
      return refuse(response, 403, 'foreign-origin', request);
    if (request.headers['sec-fetch-site'] === 'cross-site')
      return refuse(response, 403, 'cross-site', request);

    const url = new URL(request.url ?? '/', `http://${request.headers.host}`);

    // The token swap: /?token=… sets the cookie and redirects to the same page without the token.
    const token = url.searchParams.get('token');
    if (token !== null && request.method === 'GET') {
      if (!session.tokenMatches(token)) return refuse(response, 403, 'bad-token', request);
      url.searchParams.delete('token');
      response.writeHead(303, {
        'set-cookie': session.setCookieHeader(),
        location: `${url.pathname}${url.search}`,
        'cache-control': 'no-store',
      });
      response.end();
      return;
    }

    const authorization = request.headers.authorization;
    const bearer = authorization?.startsWith('Bearer ') ? authorization.slice(7) : undefined;
    const hasCookie = request.headers.cookie?.includes('ll_session=') ?? false;
    const authenticated = session.cookieMatches(request.headers.cookie) || session.tokenMatches(bearer);
    if (!authenticated) {
      const presented = hasCookie || bearer !== undefined;
      if (url.pathname.startsWith('/api/') || presented) {
        return refuse(
          response,
          presented ? 403 : 401,
          presented ? 'bad-credentials' : 'no-credentials',
          request,
        );
      }
      response.writeHead(401, { 'content-type': 'text/plain; charset=utf-8', 'cache-control': 'no-store' });
      response.end(
        'Limit Ledger: open the address that `limit-ledger serve` printed; it carries this run’s token.\n',
      );
      return;
    }

    if (url.pathname === '/api/events') {
      if (request.method !== 'GET') return refuse(response, 405, 'method', request);
      return openEventStream(response);
    }
    if (url.pathname.startsWith('/api/')) {
      if (request.method !== 'POST') return refuse(response, 405, 'method', request);
      if (!(request.headers['content-type'] ?? '').startsWith('application/json')) {
        return refuse(response, 415, 'content-type', request);
      }
      const body = await readBody(request, maxBody);
      if (body === null) return refuse(response, 413, 'too-large', request);
      let payload: unknown;
      try {
        payload = body.length === 0 ? {} : JSON.parse(body.toString('utf8'));
      } catch {
        return send(response, 400, {
          ok: false,
          error: { code: 'bad-json', message: 'the request is not JSON' },
        });
      }
      const envelope = await dispatch(options.handlers, url.pathname.slice('/api/'.length), payload);
      const status = envelope.ok ? 200 : statusOf(envelope);
      if (!envelope.ok) log(`refused ${url.pathname}: ${envelope.error.code}`);
      return send(response, status, envelope);
    }
    if (url.pathname.startsWith('/download/')) {
      if (request.method !== 'GET') return refuse(response, 405, 'method', request);
      return serveDownload(url.pathname.slice('/download/'.length), response);
    }
    if (request.method !== 'GET' && request.method !== 'HEAD')
      return refuse(response, 405, 'method', request);
    return serveStatic(url.pathname, response);
  }

  function openEventStream(response: ServerResponse): void {
    response.writeHead(200, {
      'content-type': 'text/event-stream; charset=utf-8',
      'cache-control': 'no-store',
      connection: 'keep-alive',
    });
    response.write(': connected\n\n');
    streams.add(response);
    const unsubscribe = options.events.subscribe((event: HostEvent) => {
      response.write(`data: ${JSON.stringify(event)}\n\n`);
    });
    const heartbeat = setInterval(() => response.write(': alive\n\n'), 15_000);
    response.on('close', () => {
      clearInterval(heartbeat);
      unsubscribe();
      streams.delete(response);
    });
  }

  async function serveStatic(pathname: string, response: ServerResponse): Promise<void> {
    let relative: string;
    try {
      relative = decodeURIComponent(pathname);
    } catch {
      return refuse(response, 400, 'bad-path');
    }
    if (relative === '/' || relative === '') relative = '/index.html';
    const root = normalize(options.rendererDir);
    const path = normalize(join(root, relative));
    if (!path.startsWith(root + sep) || relative.includes('\0')) return refuse(response, 404, 'not-found');
    const info = await stat(path).catch(() => null);
    if ((info === null || !info.isFile()) && relative === '/favicon.ico') {
      // Browsers ask for this on their own; the renderer names its icon in index.html where it has one.
      response.writeHead(204, { 'cache-control': 'private, max-age=86400' });
      response.end();
      return;
    }
    if (info === null || !info.isFile()) {
      response.writeHead(404, { 'content-type': 'text/plain; charset=utf-8' });
      response.end(
        relative === '/index.html' ? 'The renderer is not built yet: run `npm run build`.\n' : 'Not found\n',
      );
      return;
    }
    response.writeHead(200, {
      'content-type': mimeTypes[extname(path).toLowerCase()] ?? 'application/octet-stream',
      'content-length': info.size,
      'cache-control': extname(path) === '.html' ? 'no-store' : 'private, max-age=3600',
    });
    createReadStream(path).pipe(response);
  }

  async function serveDownload(id: string, response: ServerResponse): Promise<void> {
    const entry = options.downloads.take(id);
    if (entry === null) return refuse(response, 404, 'no-download');
    const info = await stat(entry.path).catch(() => null);
    if (info === null) return refuse(response, 404, 'no-download');
    response.writeHead(200, {
      'content-type': mimeTypes[extname(entry.fileName).toLowerCase()] ?? 'application/octet-stream',
      'content-length': info.size,
      'content-disposition': `attachment; filename="${entry.fileName.replace(/[^\w .-]/g, '_')}"; filename*=UTF-8''${encodeURIComponent(entry.fileName)}`,
      'cache-control': 'no-store',
    });
    const stream = createReadStream(entry.path);
    stream.pipe(response);
    response.on('close', () => void rm(entry.path, { force: true }));
  }

  function refuse(response: ServerResponse, status: number, code: string, request?: IncomingMessage): void {
    if (request) log(`refused ${request.method} ${request.url?.split('?')[0]} with ${status} (${code})`);
    send(response, status, { ok: false, error: { code, message: messages[code] ?? code } });
  }

  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(options.port ?? 0, '127.0.0.1', () => resolve());
  });
  port = (server.address() as AddressInfo).port;
  const origin = `http://127.0.0.1:${port}`;

  return {
    url: `${origin}/?token=${session.token}`,
    origin,
    port,
    session,
    server,
    close: () =>
      new Promise<void>((resolve) => {
        for (const stream of streams) stream.end();
        server.closeAllConnections();
        server.close(() => resolve());
      }),
  };
}

const messages: Record<string, string> = {
  'wrong-host': 'this host answers only to 127.0.0.1 and localhost',
  'foreign-origin': 'requests from other sites are refused',
  'cross-site': 'requests from other sites are refused',
  'bad-token': 'that token is not this run’s; open the address the host printed',
  'bad-credentials': 'the session is not this run’s; open the address the host printed',
  'no-credentials': 'open the address the host printed; it carries this run’s token',
  method: 'method not allowed',
  'content-type': 'send JSON',
  'too-large': 'the request is too large',
  'bad-path': 'bad path',
  'not-found': 'not found',
  'no-download': 'that download is gone; export again',
};

function statusOf(envelope: Extract<Envelope, { ok: false }>): number {
  switch (envelope.error.code) {
    case 'unknown-channel':
      return 404;
    case 'bad-request':
      return 400;
    case 'internal':
      return 500;
    default:
      return 422;
  }
}

function send(response: ServerResponse, status: number, body: Envelope): void {
  const text = JSON.stringify(body);
  response.writeHead(status, {
    'content-type': 'application/json; charset=utf-8',
    'content-length': Buffer.byteLength(text),
    'cache-control': 'no-store',
  });
  response.end(text);
}

function readBody(request: IncomingMessage, limit: number): Promise<Buffer | null> {
  return new Promise((resolve, reject) => {
    const declared = Number(request.headers['content-length'] ?? 0);
    if (declared > limit) {
      request.resume();
      resolve(null);
      return;
    }
    const chunks: Buffer[] = [];
    let size = 0;
    request.on('data', (chunk: Buffer) => {
      size += chunk.length;
      if (size > limit) {
        chunks.length = 0;
        request.removeAllListeners('data');
        request.resume();
        resolve(null);
      } else chunks.push(chunk);
    });
    request.on('end', () => resolve(Buffer.concat(chunks)));
    request.on('error', reject);
  });
}
