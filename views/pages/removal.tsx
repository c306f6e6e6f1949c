// Deleting a study, a file or a run: a page that says exactly what will be removed before a
// second, deliberate step does it, and a page that says what was removed afterwards.
import { Notice } from '../components.js';
import { CsrfField, Layout, type PageFrame } from '../layout.js';

export interface RemovalPageProps {
  readonly frame: PageFrame;
  /** "study", "file" or "run": what is deleted. */
  readonly what: string;
  readonly name: string;
  /** What goes with it, one line each. */
  readonly removes: readonly string[];
  /** Fits that are stopped first. */
  readonly stopping?: readonly string[];
  /** Why it cannot be deleted now; the form is not shown. */
  readonly refusal?: string | null;
  /** For a study: the name must be typed again. */
  readonly typeName?: boolean;
  readonly action: string;
  readonly back: string;
  readonly error?: string;
}

export function RemovalPage(props: RemovalPageProps) {
  return (
    <Layout {...props.frame}>
      <h1>Delete {props.what} “{props.name}”?</h1>
      {props.error && <Notice kind="error">{props.error}</Notice>}
      {props.refusal ? (
        <>
          <Notice kind="error">{props.refusal}</Notice>
          <p><a href={props.back}>Back</a></p>
        </>
      ) : (
        <section class="panel" id="removal">
          <p>Deleting cannot be undone. This removes:</p>
          <ul id="removal-contents">
            {props.removes.map((line) => <li>{line}</li>)}
          </ul>
          {props.stopping && props.stopping.length > 0 && (
            <Notice kind="info">Stopped first, without waiting for the end of the sweep: {props.stopping.join(', ')}.</Notice>
          )}
          <p class="hint">Files you exported or downloaded earlier are not touched: delete them where you saved them.</p>
          <form method="post" action={props.action} class="stack">
            <CsrfField csrf={props.frame.csrf} />
            {props.typeName && (
              <label>
                Type the study's name to confirm <input name="confirmName" required autocomplete="off" />
              </label>
            )}
            <div class="row">
              <button type="submit" class="danger">Delete {props.what}</button>
              <a href={props.back}>Keep it</a>
            </div>
          </form>
        </section>
      )}
    </Layout>
  );
}

export function RemovedPage(props: { frame: PageFrame; message: string; next: string; nextLabel: string; walNote?: boolean }) {
  return (
    <Layout {...props.frame}>
      <h1>Deleted</h1>
      <Notice kind="ok">{props.message}</Notice>
      {props.walNote && <p class="hint">Another reader had the data file open; its journal is emptied at the next checkpoint.</p>}
      <p><a href={props.next}>{props.nextLabel}</a></p>
    </Layout>
  );
}
