// Account: a signed-in person changes their own password (OWASP ASVS 4.0.3 V2.1.5, V2.1.6). The
// current password is required; wrong ones count in the sign-in throttle like failed sign-ins
// (V2.2.1), so a borrowed session cannot be used to guess it; on success every other session of
// the account ends, and this one stays signed in. The page also says when the account last signed
// in and when its password last changed, so its owner can spot misuse (V2.2.3, V2.5.5).
import { Hono, type Context } from 'hono';
import { getCookie } from 'hono/cookie';
import type { ContentfulStatusCode } from 'hono/utils/http-status';
import { AccountPage } from '../../../views/pages/account.js';
import { changePassword, MAX_PASSWORD_LENGTH, MIN_PASSWORD_LENGTH, PasswordRuleError, signInHistory } from '../../store/index.js';
import { frame } from '../access.js';
import { sessionCookieName } from '../auth.js';
import { renderPage } from '../render.js';
import { SignInThrottle } from '../throttle.js';
import type { AppEnv } from '../types.js';
import { clientAddress, waitText } from './login.js';

function field(value: unknown): string {
  return typeof value === 'string' ? value : '';
}

function endedText(n: number): string {
  if (n === 0) return 'No other session of this account was open.';
  return n === 1 ? 'One other session of this account was signed out.' : `${n} other sessions of this account were signed out.`;
}

export function accountRoutes(): Hono<AppEnv> {
  const app = new Hono<AppEnv>();
  // createApp always provides one; a fallback keeps this router usable on its own.
  const ownThrottle = new SignInThrottle();
  const page = (c: Context<AppEnv>, message: { error?: string; done?: string } = {}, status: ContentfulStatusCode = 200) => {
    const token = c.get('user').local ? undefined : getCookie(c, sessionCookieName(c.get('deps')));
    const history = token ? signInHistory(c.get('deps').store, token) : undefined;
    return renderPage(
      c,
      <AccountPage frame={frame(c, 'Account')} {...message} history={history} minLength={MIN_PASSWORD_LENGTH} maxLength={MAX_PASSWORD_LENGTH} />,
      status,
    );
  };

  app.get('/account', (c) => page(c));
  app.post('/account/password', async (c) => {
    const deps = c.get('deps');
    const user = c.get('user');
    // Local use: no account, no password; the page says so.
    if (user.local || user.id === null) return page(c, {}, 400);
    const body = await c.req.parseBody();
    const current = field(body.current);
    const next = field(body.password);
    if (!current) return page(c, { error: 'Type your current password, then the new one twice.' }, 400);
    if (next !== field(body.repeat)) return page(c, { error: 'The new password and its repeat differ. Type the same new password twice.' }, 400);
    const throttle = deps.signInThrottle ?? ownThrottle;
    const address = clientAddress(c);
    const verdict = throttle.check(user.name, address);
    if (!verdict.allowed) {
      c.header('Retry-After', String(verdict.retryAfterSeconds));
      return page(c, { error: `Too many wrong passwords for this account or from this computer. Wait ${waitText(verdict.retryAfterSeconds)} and try again.` }, 429);
    }
    let outcome;
    try {
      outcome = changePassword(deps.store, user.id, current, next, { cost: deps.passwordCost, keepSessionToken: getCookie(c, sessionCookieName(deps)) });
    } catch (error) {
      if (error instanceof PasswordRuleError) return page(c, { error: `${error.message} Your password was not changed.` }, 400);
      throw error;
    }
    if (!outcome.changed) {
      throttle.fail(user.name, address);
      return page(c, { error: 'That is not your current password. Your password was not changed.' }, 403);
    }
    throttle.succeed(user.name);
    return page(c, { done: `Your password was changed. ${endedText(outcome.endedSessions)}` });
  });
  return app;
}
