// Runs: start a fit, follow it live, stop or resume it, and compare runs with different numbers
// of themes.
import { LineChart } from '../charts/index.js';
import { count, duration, Notice, when } from '../components.js';
import { CsrfField, Layout, type PageFrame } from '../layout.js';
import { TiesNoticeSlot } from '../ties-notice.js';
import { FitEstimatePanel, type EstimateView } from '../fit-estimate.js';

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

/** One field of the new-run form, as the settings schema describes it (src/services/run-settings-schema.ts). */
export interface SettingField {
  readonly name: string;
  readonly label: string;
  readonly hint: string;
  readonly min: number;
  readonly max: number;
  readonly step?: number;
  readonly value?: number;
  readonly placeholder?: string;
  readonly required: boolean;
}

function SettingInput(props: { f: SettingField | undefined; hint?: string }) {
  const f = props.f;
  if (!f) return null;
  return (
    <label>
      {f.label}{' '}
      <input
        name={f.name}
        type="number"
        min={String(f.min)}
        max={String(f.max)}
        {...(f.step !== undefined ? { step: String(f.step) } : {})}
        {...(f.value !== undefined ? { value: String(f.value) } : {})}
        {...(f.placeholder !== undefined ? { placeholder: f.placeholder } : {})}
        required={f.required}
      />
      <span class="hint">{props.hint ?? f.hint}</span>
    </label>
  );
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
  /** The form's numeric fields by setting name (themes, sweeps, burnIn, seed, threads, holdout). */
  fields: Readonly<Record<string, SettingField>>;
  /** This server's cores. */
  maxThreads: number;
  covariates: readonly { name: string; levels: number; numeric: boolean }[];
  answers: number;
  /** Time and memory of a fit with the form's default settings. */
  estimate?: EstimateView | null;
  canEdit: boolean;
  /** The study's owner may delete runs. */
  canDelete?: boolean;
  error?: string;
}) {
  const base = `/studies/${props.studyId}/runs`;
  const f = props.fields;
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
            <SettingInput f={f.themes} />
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
              <SettingInput f={f.sweeps} />
              <SettingInput f={f.burnIn} />
              <SettingInput f={f.seed} />
              <SettingInput f={f.threads} hint={`${f.threads?.hint ?? ''} This server has ${props.maxThreads}.`} />
              <SettingInput f={f.holdout} />
              <label>Name <input name="name" maxlength={100} placeholder="chosen for you" /></label>
            </details>
            {props.answers === 0 ? (
              <Notice kind="error">This study has no answers to fit yet. Import a file with answers on the Data page first, or check the Languages and Vocabulary pages for answers left out.</Notice>
            ) : (
              <FitEstimatePanel studyId={props.studyId} estimate={props.estimate ?? null} />
            )}
            <button type="submit" disabled={props.answers === 0}>Start run</button>
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
  /** Detail of the phase (e.g. which summary is being computed). */
  readonly step?: string;
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
        <div><dt>Status</dt><dd id="run-status">{statusText(p.status)}{p.phase && p.status === 'running' ? ` · ${p.phase}${p.step ? `: ${p.step}` : ''}` : ''}</dd></div>
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
