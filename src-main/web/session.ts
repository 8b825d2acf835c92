import { randomBytes, timingSafeEqual } from 'node:crypto';

export const sessionCookieName = 'll_session';

/**
 * The browser host's credentials for one run: the token printed in the URL, and the session value
 * the page receives in exchange as an HttpOnly, SameSite=Strict cookie (so no script, and no other
 * site's page, can read or send it).
 */
export class Session {
  readonly token = randomBytes(24).toString('base64url');
  private readonly cookieValue = randomBytes(32).toString('base64url');

  tokenMatches(candidate: string | null | undefined): boolean {
    return typeof candidate === 'string' && sameSecret(candidate, this.token);
  }

  cookieMatches(cookieHeader: string | undefined): boolean {
    const value = readCookie(cookieHeader, sessionCookieName);
    return value !== null && sameSecret(value, this.cookieValue);
  }

  setCookieHeader(): string {
    return `${sessionCookieName}=${this.cookieValue}; HttpOnly; SameSite=Strict; Path=/`;
  }
}

export function readCookie(header: string | undefined, name: string): string | null {
  if (!header) return null;
  for (const part of header.split(';')) {
    const [key, ...rest] = part.trim().split('=');
    if (key === name) return rest.join('=');
  }
  return null;
}

function sameSecret(a: string, b: string): boolean {
  const left = Buffer.from(a);
  const right = Buffer.from(b);
  return left.length === right.length && timingSafeEqual(left, right);
}
