// Runs: start a fit, follow it live, stop or resume it, and compare runs with different numbers
// of themes.
import { LineChart } from '../charts/index.js';
import { count, duration, Notice, when } from '../components.js';
import { CsrfField, Layout, type PageFrame } from '../layout.js';
import { TiesNoticeSlot } from '../ties-notice.js';

export interface RunRow {
  readonly id: number;
  readonly name: string;
  readonly themes: number;
  readonly sweeps: number;
  readonly seed: number;
  readonly covariates: string[];
  readonly status: string;
  readonly sweep?: number;
  readonly createdAt: string;
  readonly finishedAt: string | null;
  readonly logLikelihoodPerToken?: number;
  readonly perplexity?: number;
  readonly coherence?: number;
  readonly stability?: number;
  readonly error: string | null;
}

export interface NewRunDefaults {
  readonly themes: number;
  readonly sweeps: number;
  readonly burnIn: number;
  readonly seed: number;
  readonly threads: number;
  readonly maxThreads: number;
  readonly holdout: number;
}

const STATUS_TEXT: Record<string, string> = {
  queued: 'waiting to start',
  running: 'running',
  interrupted: 'interrupted (server stopped)',
  cancelled: 'stopped',
  failed: 'failed',
  finished: 'finished',
};

export function statusText(status: string): string {
  return STATUS_TEXT[status] ?? status;
}

function fmt(v: number | undefined, digits = 3): string {
  return v === undefined || !Number.isFinite(v) ? '—' : v.toFixed(digits);
}

export function RunsPage(props: {
  frame: PageFrame;
  studyId: number;
  runs: readonly RunRow[];
  defaults: NewRunDefaults;
  covariates: readonly { name: string; levels: number; numeric: boolean }[];
  answers: number;
  canEdit: boolean;
  /** The study's owner may delete runs. */
  canDelete?: boolean;
  error?: string;
}) {
  const base = `/studies/${props.studyId}/runs`;
  const d = props.defaults;
  const finished = props.runs.filter((r) => r.status === 'finished');
  return (
    <Layout {...props.frame}>
      <h1>Runs</h1>
      <TiesNoticeSlot studyId={props.studyId} />
      <p class="lead">A run finds themes in every answer of the study at once, across languages. Runs with different numbers of themes or seeds can be compared below.</p>
      {props.error && <Notice kind="error">{props.error}</Notice>}
      {props.runs.length === 0 ? (
        <Notice>No runs yet.</Notice>
      ) : (
        <table class="list" id="runs">
          <thead>
            <tr>
              <th scope="col">Run</th>
              <th scope="col" class="num">Themes</th>
              <th scope="col">Groups compared</th>
              <th scope="col">Status</th>
              <th scope="col">Started</th>
              <th scope="col">Finished</th>
              <th scope="col">Actions</th>
            </tr>
          </thead>
          <tbody>
            {props.runs.map((r) => (
              <tr>
                <td><a href={`${base}/${r.id}`}>{r.name}</a></td>
                <td class="num">{r.themes}</td>
                <td>{r.covariates.join(', ') || '—'}</td>
                <td>
                  {statusText(r.status)}
                  {r.status === 'running' && r.sweep !== undefined && ` (sweep ${r.sweep} of ${r.sweeps})`}
                  {r.error && <div class="hint">{r.error}</div>}
                </td>
                <td>{when(r.createdAt)}</td>
                <td>{when(r.finishedAt)}</td>
                <td>
                  {props.canEdit && <RunActions studyId={props.studyId} runId={r.id} status={r.status} csrf={props.frame.csrf} />}
                  {props.canDelete && <> <a href={`${base}/${r.id}/delete`} aria-label={`Delete run ${r.name}`}>Delete…</a></>}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
      {finished.length > 1 && (
        <section>
          <h2>Compare runs</h2>
          <p class="hint">Fewer themes are broader, more themes are finer. Prefer the number where coherence and stability stay high and held-out perplexity stops improving much.</p>
          <table class="list" id="k-comparison">
            <thead>
              <tr>
                <th scope="col">Run</th>
                <th scope="col" class="num">Themes</th>
                <th scope="col" class="num">Seed</th>
                <th scope="col" class="num">Log-likelihood per word</th>
                <th scope="col" class="num">Held-out perplexity (lower is better)</th>
                <th scope="col" class="num">Mean coherence (higher is better)</th>
                <th scope="col" class="num">Stability (higher is better)</th>
              </tr>
            </thead>
            <tbody>
              {[...finished].sort((a, b) => a.themes - b.themes || a.seed - b.seed).map((r) => (
                <tr>
                  <td><a href={`${base}/${r.id}/themes`}>{r.name}</a></td>
                  <td class="num">{r.themes}</td>
                  <td class="num">{r.seed}</td>
                  <td class="num">{fmt(r.logLikelihoodPerToken)}</td>
                  <td class="num">{fmt(r.perplexity, 1)}</td>
                  <td class="num">{fmt(r.coherence)}</td>
                  <td class="num">{fmt(r.stability)}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </section>
      )}
      {props.canEdit && (
        <section class="panel">
          <h2>New run</h2>
          <form method="post" action={base} class="stack" id="new-run-form">
            <CsrfField csrf={props.frame.csrf} />
            <label>
              Number of themes <input name="themes" type="number" min="2" max="200" value={String(d.themes)} required />
              <span class="hint">How many themes to look for. 10–30 suits most surveys of a few thousand answers; try two or three values and compare.</span>
            </label>
            <fieldset>
              <legend>Compare groups by</legend>
              {props.covariates.length === 0 && <p class="hint">No group columns were imported.</p>}
              {props.covariates.map((cv) => (
                <label class="check">
                  <input type="checkbox" name="covariates" value={cv.name} /> {cv.name} <span class="hint">({cv.numeric ? 'number' : `${cv.levels} groups`})</span>
                </label>
              ))}
              <p class="hint">The model lets these columns shift how often each theme appears, which sharpens differences between groups.</p>
            </fieldset>
            <details>
              <summary>More settings</summary>
              <label>Sweeps <input name="sweeps" type="number" min="10" max="100000" value={String(d.sweeps)} /><span class="hint">Passes over all words. More is slower and more settled.</span></label>
              <label>Burn-in sweeps <input name="burnIn" type="number" min="0" max="100000" value={String(d.burnIn)} /><span class="hint">Early sweeps not used for the results.</span></label>
              <label>Seed <input name="seed" type="number" min="0" max="4294967295" value={String(d.seed)} /><span class="hint">Same seed and settings give the same result. Change it to check stability.</span></label>
              <label>Threads <input name="threads" type="number" min="1" max={String(d.maxThreads)} value={String(d.threads)} /><span class="hint">Processor cores used by this run (this server has {d.maxThreads}).</span></label>
              <label>Held-out share <input name="holdout" type="number" min="0" max="0.5" step="0.05" value={String(d.holdout)} /><span class="hint">Answers kept aside to check the model on text it has not seen.</span></label>
              <label>Name <input name="name" maxlength={100} placeholder="chosen for you" /></label>
            </details>
            <p class="hint">{count(props.answers)} answers will be used.</p>
            <button type="submit">Start run</button>
          </form>
        </section>
      )}
    </Layout>
  );
}

export function RunActions(props: { studyId: number; runId: number; status: string; csrf: string }) {
  const base = `/studies/${props.studyId}/runs/${props.runId}`;
  if (props.status === 'queued' || props.status === 'running') {
    return (
      <form method="post" action={`${base}/cancel`} class="inline">
        <CsrfField csrf={props.csrf} />
        <button type="submit" class="small">Stop</button>
      </form>
    );
  }
  if (props.status === 'interrupted' || props.status === 'cancelled' || props.status === 'failed') {
    return (
      <form method="post" action={`${base}/resume`} class="inline">
        <CsrfField csrf={props.csrf} />
        <button type="submit" class="small">Resume</button>
      </form>
    );
  }
  return <a href={`${base}/themes`}>Themes</a>;
}

export interface ProgressView {
  readonly studyId: number;
  readonly runId: number;
  readonly status: string;
  readonly error: string | null;
  readonly phase?: string;
  readonly sweep?: number;
  readonly sweeps: number;
  readonly tokensPerSecond?: number;
  readonly logLikelihoodPerToken?: number;
  readonly secondsLeft?: number;
  readonly trace: readonly number[];
}

/** The live part of a run page; re-sent over server-sent events as the fit moves. */
export function RunProgressPanel(props: { p: ProgressView; csrf: string }) {
  const p = props.p;
  const base = `/studies/${p.studyId}/runs/${p.runId}`;
  const sweep = p.sweep ?? 0;
  return (
    <div id="run-progress" data-status={p.status}>
      <dl class="facts">
        <div><dt>Status</dt><dd id="run-status">{statusText(p.status)}{p.phase && p.status === 'running' ? ` · ${p.phase}` : ''}</dd></div>
        <div><dt>Sweep</dt><dd id="run-sweep">{count(sweep)} of {count(p.sweeps)}</dd></div>
        <div><dt>Words per second</dt><dd>{p.tokensPerSecond === undefined ? '—' : count(Math.round(p.tokensPerSecond))}</dd></div>
        <div><dt>Log-likelihood per word</dt><dd>{fmt(p.logLikelihoodPerToken)}</dd></div>
        <div><dt>Time left</dt><dd>{p.status === 'running' ? duration(p.secondsLeft) : '—'}</dd></div>
      </dl>
      <progress max={String(p.sweeps)} value={String(sweep)} aria-label="Sweeps done">{sweep} of {p.sweeps}</progress>
      {p.error && <Notice kind="error">{p.error}</Notice>}
      {p.status === 'finished' && (
        <Notice kind="ok">
          The run has finished. <a href={`${base}/themes`} id="open-themes">Open the themes</a>.
        </Notice>
      )}
      {p.trace.length > 1 && (
        <LineChart
          caption="Log-likelihood per word after each sweep. It rises quickly, then levels off when the sampler has settled."
          xLabel="Sweep"
          yLabel="Log-likelihood per word"
          series={[{ name: 'log-likelihood', points: p.trace.map((v, i) => [i + 1, v] as const) }]}
          height={200}
        />
      )}
      <p><RunActions studyId={p.studyId} runId={p.runId} status={p.status} csrf={props.csrf} /></p>
    </div>
  );
}

export function RunPage(props: { frame: PageFrame; p: ProgressView; settings: string }) {
  const live = props.p.status === 'running' || props.p.status === 'queued';
  const url = `/studies/${props.p.studyId}/runs/${props.p.runId}/events`;
  return (
    <Layout {...props.frame}>
      <h1>Run {props.frame.run?.name}</h1>
      <p class="hint">{props.settings}</p>
      {live ? (
        <div hx-ext="sse" sse-connect={url} sse-swap="progress" sse-close="done" hx-swap="innerHTML" id="run-live">
          <RunProgressPanel p={props.p} csrf={props.frame.csrf} />
        </div>
      ) : (
        <RunProgressPanel p={props.p} csrf={props.frame.csrf} />
      )}
    </Layout>
  );
}
