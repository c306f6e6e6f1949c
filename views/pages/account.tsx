// Account: who is signed in, and a form to change one's own password (OWASP ASVS 4.0.3 V2.1.5,
// V2.1.6) with a strength estimate as one types (V2.1.8, public/password-meter.js). The meter
// only advises; the server's rules decide. When the account last signed in and when its password
// last changed are shown so its owner can spot misuse (V2.2.3, V2.5.5).
import { Notice, when } from '../components.js';
import { CsrfField, Layout, PASSWORD_CHANGED_BY, type PageFrame } from '../layout.js';

export interface AccountPageProps {
  readonly frame: PageFrame;
  readonly error?: string;
  /** The confirmation after a change. */
  readonly done?: string;
  readonly minLength: number;
  readonly maxLength: number;
  /** Sign-ins and the last password change (absent in local use). */
  readonly history?: {
    readonly lastSignInAt: string | null;
    readonly thisSignInAt: string | null;
    readonly previousSignInAt: string | null;
    readonly passwordChangedAt: string | null;
    readonly passwordChangedBy: 'account' | 'operator' | null;
  };
}

function SignIns(props: { history: NonNullable<AccountPageProps['history']> }) {
  const h = props.history;
  const thisOne = h.lastSignInAt !== null && h.lastSignInAt === h.thisSignInAt;
  return (
    <ul id="sign-ins">
      <li>
        Last signed in: {when(h.lastSignInAt)}
        {thisOne ? ' (this session).' : h.thisSignInAt ? ', in another session that began after this one. If that was not you, change your password and tell the server\'s operator.' : '.'}
      </li>
      {thisOne && <li>{h.previousSignInAt ? `Signed in before that: ${when(h.previousSignInAt)}.` : 'No earlier sign-in is recorded.'}</li>}
      <li>
        {h.passwordChangedAt && h.passwordChangedBy
          ? `Password last changed: ${when(h.passwordChangedAt)} ${PASSWORD_CHANGED_BY[h.passwordChangedBy]}.`
          : 'Password last changed: no change is recorded.'}
      </li>
    </ul>
  );
}

export function AccountPage(props: AccountPageProps) {
  const user = props.frame.user;
  return (
    <Layout {...props.frame}>
      <h1>Account</h1>
      {user.local ? (
        <Notice>
          No accounts exist and this server listens on this computer only, so there is no password to change. Accounts are added on the server
          with <code>themata users add NAME</code>.
        </Notice>
      ) : (
        <>
          <p class="lead">
            Signed in as <strong>{user.name}</strong>.
          </p>
          {props.history && <SignIns history={props.history} />}
          {props.done && <Notice kind="ok">{props.done}</Notice>}
          <section class="panel">
            <h2>Change your password</h2>
            {props.error && <Notice kind="error">{props.error}</Notice>}
            <form method="post" action="/account/password" class="stack" id="change-password">
              <CsrfField csrf={props.frame.csrf} />
              {/* Hidden, for password managers: the account this password belongs to. */}
              <input type="text" name="username" autocomplete="username" value={user.name} hidden readonly />
              <label>
                Current password <input id="current-password" name="current" type="password" autocomplete="current-password" required />
              </label>
              <label>
                New password{' '}
                <input id="new-password" name="password" type="password" autocomplete="new-password" required aria-describedby="password-rules password-strength" />
              </label>
              {/* Shown by app.js, so it appears only where it works (OWASP ASVS 4.0.3 V2.1.12). */}
              <label class="show-password" hidden data-show-password>
                <input type="checkbox" aria-controls="new-password" /> Show the new password
              </label>
              <p class="hint" id="password-rules">
                {props.minLength} to {props.maxLength} characters, any you like (spaces and every script included), and not one of the common
                passwords on a public list. A few unrelated words make a long password that is easy to remember.
              </p>
              {/* Shown and filled by password-meter.js as you type; it advises only. */}
              <div class="password-meter" data-password-meter="new-password" data-min={String(props.minLength)} data-max={String(props.maxLength)} hidden>
                <meter id="password-strength-meter" min={0} max={100} low={50} high={64} optimum={100} value={0}></meter>
                <span id="password-strength" aria-live="polite"></span>
              </div>
              <label>
                Repeat the new password <input id="repeat-password" name="repeat" type="password" autocomplete="new-password" required />
              </label>
              <button type="submit">Change password</button>
            </form>
            <p class="hint">Changing your password signs this account out everywhere else: in other browsers and on other computers.</p>
          </section>
          <script type="module" src="/assets/password-meter.js"></script>
        </>
      )}
    </Layout>
  );
}
