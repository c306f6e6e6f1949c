// Sign in and out.
import { Hono } from 'hono';
import { deleteCookie, getCookie, setCookie } from 'hono/cookie';
import { LoginPage } from '../../../views/pages/login.js';
import { checkPassword, createSession, deleteSession } from '../../store/index.js';
import { SESSION_COOKIE } from '../auth.js';
import { renderPage } from '../render.js';
import type { AppEnv } from '../types.js';

const SESSION_HOURS = 12; // common practice for a working day

function safeNext(next: unknown): string {
  return typeof next === 'string' && next.startsWith('/') && !next.startsWith('//') && !next.startsWith('/\\') ? next : '/';
}

export function loginRoutes(): Hono<AppEnv> {
  const app = new Hono<AppEnv>();
  app.get('/login', (c) => renderPage(c, <LoginPage next={safeNext(c.req.query('next'))} />));
  app.post('/login', async (c) => {
    const deps = c.get('deps');
    const body = await c.req.parseBody();
    const name = typeof body.name === 'string' ? body.name : '';
    const password = typeof body.password === 'string' ? body.password : '';
    const account = checkPassword(deps.store, name, password);
    if (!account) return renderPage(c, <LoginPage error="That name and password do not match an account." name={name} next={safeNext(body.next)} />, 401);
    const session = createSession(deps.store, account.id, SESSION_HOURS * 3600_000);
    setCookie(c, SESSION_COOKIE, session.token, {
      httpOnly: true,
      sameSite: 'Strict',
      secure: deps.secureCookies ?? false,
      path: '/',
      expires: new Date(session.expiresAt),
    });
    return c.redirect(safeNext(body.next), 303);
  });
  app.post('/logout', (c) => {
    const token = getCookie(c, SESSION_COOKIE);
    if (token) deleteSession(c.get('deps').store, token);
    deleteCookie(c, SESSION_COOKIE, { path: '/' });
    return c.redirect('/login', 303);
  });
  return app;
}
