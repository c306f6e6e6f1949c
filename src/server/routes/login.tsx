// Sign in and out. Failed sign-ins are throttled per account name and per client address
// (throttle.ts; OWASP ASVS 4.0.3 V2.2.1).
import { getConnInfo } from '@hono/node-server/conninfo';
import { Hono, type Context } from 'hono';
import { deleteCookie, getCookie, setCookie } from 'hono/cookie';
import { LoginPage } from '../../../views/pages/login.js';
import { checkPassword, createSession, deleteSession } from '../../store/index.js';
import { sessionCookieName } from '../auth.js';
import { renderPage } from '../render.js';
import { SignInThrottle } from '../throttle.js';
import type { AppEnv } from '../types.js';

const SESSION_HOURS = 12; // common practice for a working day

function safeNext(next: unknown): string {
  return typeof next === 'string' && next.startsWith('/') && !next.startsWith('//') && !next.startsWith('/\\') ? next : '/';
}

/** The client's address as the socket sees it (a proxy's address when behind one). */
export function clientAddress(c: Context<AppEnv>): string {
  try {
    return getConnInfo(c).remote.address ?? 'unknown';
  } catch {
    return 'unknown'; // requests made in process (tests) have no socket
  }
}

/** "a minute" or "N minutes", for the throttle's messages. */
export function waitText(seconds: number): string {
  const minutes = Math.ceil(seconds / 60);
  return minutes <= 1 ? 'a minute' : `${minutes} minutes`;
}

export function loginRoutes(): Hono<AppEnv> {
  const app = new Hono<AppEnv>();
  // createApp always provides one; a fallback keeps this router usable on its own.
  const ownThrottle = new SignInThrottle();
  const throttleOf = (c: Context<AppEnv>) => c.get('deps').signInThrottle ?? ownThrottle;
  app.get('/login', (c) => renderPage(c, <LoginPage next={safeNext(c.req.query('next'))} />));
  app.post('/login', async (c) => {
    const deps = c.get('deps');
    const body = await c.req.parseBody();
    const name = typeof body.name === 'string' ? body.name : '';
    const password = typeof body.password === 'string' ? body.password : '';
    const throttle = throttleOf(c);
    const address = clientAddress(c);
    const verdict = throttle.check(name, address);
    if (!verdict.allowed) {
      c.header('Retry-After', String(verdict.retryAfterSeconds));
      const error =
        `Too many failed sign-ins for this account or from this computer. Wait ${waitText(verdict.retryAfterSeconds)} and try again. ` +
        'If the password is lost, the person who runs this Themata server can set a new one.';
      return renderPage(c, <LoginPage error={error} name={name} next={safeNext(body.next)} />, 429);
    }
    const account = checkPassword(deps.store, name, password, { cost: deps.passwordCost });
    if (!account) {
      throttle.fail(name, address);
      return renderPage(c, <LoginPage error="That name and password do not match an account." name={name} next={safeNext(body.next)} />, 401);
    }
    throttle.succeed(name);
    const session = createSession(deps.store, account.id, SESSION_HOURS * 3600_000);
    setCookie(c, sessionCookieName(deps), session.token, {
      httpOnly: true,
      sameSite: 'Strict',
      secure: deps.secureCookies ?? false,
      path: '/',
      expires: new Date(session.expiresAt),
    });
    return c.redirect(safeNext(body.next), 303);
  });
  app.post('/logout', (c) => {
    const deps = c.get('deps');
    const cookie = sessionCookieName(deps);
    const token = getCookie(c, cookie);
    if (token) deleteSession(deps.store, token);
    deleteCookie(c, cookie, { path: '/', secure: deps.secureCookies ?? false });
    return c.redirect('/login', 303);
  });
  return app;
}
