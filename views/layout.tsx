// The page frame: header with where-am-I links, the study and run tabs, and the scripts (all
// served by Themata itself; no inline script, so the content security policy can forbid it).
import type { Child } from 'hono/jsx';
import { Notice, when } from './components.js';

/** A password change the signed-in session has not been told of (OWASP ASVS 4.0.3 V2.2.3, V2.5.5). */
export interface PasswordChangeNotice {
  readonly changedAt: string;
  readonly by: 'account' | 'operator';
  readonly changes: number;
}

export interface PageFrame {
  readonly title: string;
  readonly user: { readonly name: string; readonly local: boolean };
  readonly csrf: string;
  readonly study?: { readonly id: number; readonly name: string };
  readonly run?: { readonly id: number; readonly name: string; readonly status: string };
  /** Which tab is current: 'data' | 'languages' | … | 'themes' | … */
  readonly active?: string;
  /** Shown once at the top of the page, then never again for this session. */
  readonly passwordNotice?: PasswordChangeNotice;
}

const STUDY_TABS = [
  ['data', 'Data'],
  ['languages', 'Languages'],
  ['vocabulary', 'Vocabulary'],
  ['runs', 'Runs'],
] as const;

const RUN_TABS = [
  ['themes', 'Themes'],
  ['contrasts', 'Contrasts'],
  ['answers', 'Answers'],
  ['checks', 'Checks'],
  ['export', 'Export'],
  ['apply', 'Apply'],
] as const;

/** How a password was changed, as the notice and the Account page say it. */
export const PASSWORD_CHANGED_BY = {
  account: 'on the Account page',
  operator: "by the server's operator with the command line",
} as const;

/** "Your password was changed on DATE (how). If this was not you, …" */
export function passwordNoticeText(notice: PasswordChangeNotice): string {
  const times = notice.changes > 1 ? ` ${notice.changes} times, most recently` : '';
  return `Your password was changed${times} on ${when(notice.changedAt)} ${PASSWORD_CHANGED_BY[notice.by]}. If this was not you, tell the server's operator at once.`;
}

/** Hidden CSRF field for ordinary (non-htmx) forms. */
export function CsrfField(props: { csrf: string }) {
  return <input type="hidden" name="_csrf" value={props.csrf} />;
}

/** The icon in both forms, so the browser's own request for /favicon.ico is also answered. */
export function IconLinks() {
  return (
    <>
      <link rel="icon" href="/assets/favicon.svg" type="image/svg+xml" />
      <link rel="icon" href="/favicon.ico" sizes="16x16" />
    </>
  );
}

export function Layout(props: PageFrame & { children: Child }) {
  const s = props.study;
  const r = props.run;
  return (
    <html lang="en">
      <head>
        <meta charset="utf-8" />
        <meta name="viewport" content="width=device-width, initial-scale=1" />
        <meta name="htmx-config" content='{"includeIndicatorStyles":false,"allowEval":false,"allowScriptTags":false}' />
        <title>{props.title} · Themata</title>
        <IconLinks />
        <link rel="stylesheet" href="/assets/app.css" />
        <script src="/assets/htmx.min.js" defer></script>
        <script src="/assets/htmx-sse.js" defer></script>
        <script src="/assets/app.js" defer></script>
      </head>
      <body hx-headers={JSON.stringify({ 'X-CSRF-Token': props.csrf })}>
        <header class="top">
          <nav class="crumbs" aria-label="Where you are">
            <a href="/" class="brand">Themata</a>
            {s && (
              <>
                <span aria-hidden="true">›</span>
                <a href={`/studies/${s.id}/data`}>{s.name}</a>
              </>
            )}
            {s && r && (
              <>
                <span aria-hidden="true">›</span>
                <a href={`/studies/${s.id}/runs/${r.id}`}>{r.name}</a>
              </>
            )}
          </nav>
          <div class="who">
            {props.user.local ? (
              <span title="No accounts exist and the server only listens on this computer">Local use</span>
            ) : (
              <form method="post" action="/logout" class="inline">
                <CsrfField csrf={props.csrf} />
                <span>{props.user.name}</span> <a href="/account">Account</a> <button type="submit" class="link">Sign out</button>
              </form>
            )}
          </div>
        </header>
        {s && (
          <nav class="tabs" aria-label="Study">
            {STUDY_TABS.map(([key, label]) => (
              <a href={`/studies/${s.id}/${key}`} aria-current={props.active === key && !r ? 'page' : undefined}>{label}</a>
            ))}
          </nav>
        )}
        {s && r && r.status === 'finished' && (
          <nav class="tabs run-tabs" aria-label="Run">
            {RUN_TABS.map(([key, label]) => (
              <a href={`/studies/${s.id}/runs/${r.id}/${key}`} aria-current={props.active === key ? 'page' : undefined}>{label}</a>
            ))}
          </nav>
        )}
        <main id="main">
          {props.passwordNotice && (
            <div id="password-notice">
              <Notice kind="error">{passwordNoticeText(props.passwordNotice)}</Notice>
            </div>
          )}
          {props.children}
        </main>
        <footer class="foot">Themata · themes across languages and groups</footer>
      </body>
    </html>
  );
}
