import { extname, join, normalize, sep } from 'node:path';
import { contentSecurityPolicy } from './content-security-policy.js';
import { appOrigin } from './window-options.js';

const types: Record<string, string> = {
  '.html': 'text/html; charset=utf-8',
  '.js': 'text/javascript; charset=utf-8',
  '.css': 'text/css; charset=utf-8',
  '.svg': 'image/svg+xml',
  '.png': 'image/png',
  '.woff2': 'font/woff2',
  '.ttf': 'font/ttf',
  '.json': 'application/json',
};

/**
 * Maps an app://renderer/… request to a file of the built renderer; anything else (another host,
 * a path that climbs out of the folder) maps to nothing.
 */
export function rendererFileFor(
  url: string,
  rendererDir: string,
): { path: string; headers: Record<string, string> } | null {
  let parsed: URL;
  try {
    parsed = new URL(url);
  } catch {
    return null;
  }
  if (`${parsed.protocol}//${parsed.host}` !== appOrigin) return null;
  let relative: string;
  try {
    relative = decodeURIComponent(parsed.pathname);
  } catch {
    return null;
  }
  if (relative === '/' || relative === '') relative = '/index.html';
  if (relative.includes('\0')) return null;
  const root = normalize(rendererDir);
  const path = normalize(join(root, relative));
  if (!path.startsWith(root + sep)) return null;
  return {
    path,
    headers: {
      'content-type': types[extname(path).toLowerCase()] ?? 'application/octet-stream',
      'content-security-policy': contentSecurityPolicy,
      'x-content-type-options': 'nosniff',
    },
  };
}
