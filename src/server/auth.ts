// Who is asking, and may they change things. Sessions are random tokens in an HttpOnly,
// SameSite=Strict cookie that expires; only the token's hash is stored. Every state-changing
// request must carry the session's CSRF token (form field `_csrf` or header `X-CSRF-Token`, which
// htmx sends from hx-headers), and a cross-origin Origin header is refused outright
// (OWASP ASVS 4.0.3, V3 "Session Management" and V4.2.2 "anti-CSRF").
// With no accounts and a loopback-only server, Themata runs as one local user (docs/design.md §9).
import { timingSafeEqual } from 'node:crypto';
import type { Context, MiddlewareHandler } from 'hono';
import { deleteCookie, getCookie } from 'hono/cookie';
import { countAccounts, getSession, takePasswordNotice, type PasswordNotice } from '../store/index.js';
import type { AppDeps, AppEnv } from './types.js';

export const SESSION_COOKIE = 'themata_session';
/** Behind HTTPS the cookie carries the `__Host-` prefix: browsers then accept it only with
 * `Secure`, `Path=/` and no `Domain`, so a sibling host cannot plant or shadow it
 * (RFC 6265bis "Cookie Name Prefixes"; OWASP ASVS 4.0.3 V3.4.4). */
export const SECURE_SESSION_COOKIE = `__Host-${SESSION_COOKIE}`;

/** The session cookie's name for this server. */
export function sessionCookieName(deps: Pick<AppDeps, 'secureCookies'>): string {
  return deps.secureCookies ? SECURE_SESSION_COOKIE : SESSION_COOKIE;
}

const SAFE = new Set(['GET', 'HEAD', 'OPTIONS']);

/** Paths reachable without a session. */
function isPublic(path: string): boolean {
  return path === '/login' || path.startsWith('/assets/');
}

function sameToken(a: string, b: string): boolean {
  const x = Buffer.from(a);
  const y = Buffer.from(b);
  return x.length === y.length && timingSafeEqual(x, y);
}

/** Resolve the user (session or local mode); refuse anyone else. */
export function sessionMiddleware(): MiddlewareHandler<AppEnv> {
  return async (c, next) => {
    const deps = c.get('deps');
    if (isPublic(c.req.path)) return next();
    if (deps.loopbackOnly && countAccounts(deps.store) === 0) {
      c.set('user', { id: null, name: 'local user', local: true });
      c.set('csrf', deps.localCsrf ?? '');
      return next();
    }
    const cookie = sessionCookieName(deps);
    const token = getCookie(c, cookie);
    const session = token ? getSession(deps.store, token) : undefined;
    if (!session) {
      if (token) deleteCookie(c, cookie, { path: '/', secure: deps.secureCookies ?? false });
      return refuse(c);
    }
    c.set('user', { id: session.accountId, name: session.accountName, local: false });
    c.set('csrf', session.csrf);
    return next();
  };
}

/**
 * The password change this session has not been told of, taken (marked as told) so that it is
 * shown once, on the page being built (OWASP ASVS 4.0.3 V2.2.3, V2.5.5). Full pages only: frame()
 * calls it, fragments and downloads do not.
 */
export function takePasswordNoticeFor(c: Context<AppEnv>): PasswordNotice | undefined {
  if (c.get('user').local) return undefined;
  const deps = c.get('deps');
  const token = getCookie(c, sessionCookieName(deps));
  return token ? takePasswordNotice(deps.store, token) : undefined;
}

function refuse(c: Context<AppEnv>): Response {
  if (c.req.method === 'GET' && c.req.header('HX-Request') !== 'true' && c.req.header('Accept')?.includes('text/html')) {
    return c.redirect(`/login?next=${encodeURIComponent(c.req.path)}`, 303);
  }
  if (c.req.header('HX-Request') === 'true') c.header('HX-Redirect', '/login');
  return c.text('Please sign in.', 401);
}

/** Reject cross-origin requests and unsafe requests without the right CSRF token. */
export function csrfMiddleware(): MiddlewareHandler<AppEnv> {
  return async (c, next) => {
    if (SAFE.has(c.req.method)) return next();
    const origin = c.req.header('Origin');
    if (origin && origin !== 'null') {
      const host = c.req.header('Host');
      let originHost: string | undefined;
      try {
        originHost = new URL(origin).host;
      } catch {
        originHost = undefined;
      }
      if (!host || originHost !== host) return c.text('This request came from another site and was refused.', 403);
    }
    if (isPublic(c.req.path)) return next();
    const expected = c.get('csrf');
    let sent = c.req.header('X-CSRF-Token');
    if (!sent) {
      const type = c.req.header('Content-Type') ?? '';
      if (type.startsWith('application/x-www-form-urlencoded') || type.startsWith('multipart/form-data')) {
        const body = await c.req.parseBody();
        const field = body['_csrf'];
        if (typeof field === 'string') sent = field;
      }
    }
    if (!expected || !sent || !sameToken(sent, expected)) {
      return c.text('This form has expired or did not come from Themata. Reload the page and try again.', 403);
    }
    return next();
  };
}
