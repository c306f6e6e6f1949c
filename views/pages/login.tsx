import { IconLinks } from '../layout.js';

export function LoginPage(props: { error?: string; next?: string; name?: string }) {
  return (
    <html lang="en">
      <head>
        <meta charset="utf-8" />
        <meta name="viewport" content="width=device-width, initial-scale=1" />
        <title>Sign in · Themata</title>
        <IconLinks />
        <link rel="stylesheet" href="/assets/app.css" />
        <script src="/assets/app.js" defer></script>
      </head>
      <body class="login">
        <main id="main">
          <h1>Themata</h1>
          <p>Sign in to see the studies shared with you.</p>
          {props.error && <div class="notice error" role="alert">{props.error}</div>}
          <form method="post" action="/login" class="stack">
            <input type="hidden" name="next" value={props.next ?? '/'} />
            <label>Account name <input name="name" autocomplete="username" required value={props.name ?? ''} /></label>
            <label>Password <input id="password" name="password" type="password" autocomplete="current-password" required /></label>
            {/* Shown by app.js, so it appears only where it works (OWASP ASVS 4.0.3 V2.1.12). */}
            <label class="show-password" hidden data-show-password>
              <input type="checkbox" aria-controls="password" /> Show password
            </label>
            <button type="submit">Sign in</button>
          </form>
          <p class="hint">Accounts are added on the server with <code>themata users add NAME</code>.</p>
        </main>
      </body>
    </html>
  );
}

export function ErrorPage(props: { status: number; message: string }) {
  return (
    <html lang="en">
      <head>
        <meta charset="utf-8" />
        <title>{props.status === 404 ? 'Not found' : 'Something went wrong'} · Themata</title>
        <IconLinks />
        <link rel="stylesheet" href="/assets/app.css" />
      </head>
      <body>
        <main id="main">
          <h1>{props.status === 404 ? 'Not found' : props.status === 403 ? 'Not allowed' : 'That did not work'}</h1>
          <div class="notice error" role="alert">{props.message}</div>
          <p><a href="/">Back to your studies</a></p>
        </main>
      </body>
    </html>
  );
}
