// The standalone printable report: one HTML file with its styles and SVG charts inline, no
// scripts and nothing fetched, so it opens anywhere and prints as it looks. It reads as a
// report a researcher would send: a one-page summary first (what the themes are, how large,
// the clearest differences between groups with intervals, how far to trust them), then the
// detail (words in every language, every group's shares with intervals, the fit), then the
// cautions of docs/design.md §10 and how the figures were made.
import { IntervalChart, LineChart } from '../charts/index.js';
import { count, percent, when } from '../components.js';

export interface ReportProps {
  readonly study: string;
  readonly run: string;
  readonly createdAt: string;
  readonly settings: string;
  readonly css: string;
  readonly answers: number;
  /** In reading order: the study's first language first. */
  readonly languages: string[];
  readonly themes: {
    k: number;
    label: string;
    suggested: boolean;
    share: number;
    words: Record<string, string[]>;
    coherence?: number;
    alignment?: string;
  }[];
  readonly groups: { covariate: string; levels: string[]; rows: { level: string; theme: number; share: number; low: number; high: number; n: number; effectiveN: number }[]; draws: number }[];
  /** The clearest differences between two groups, largest first (share A − share B > 0). */
  readonly main: { covariate: string; theme: number; levelA: string; levelB: string; difference: number; low: number; high: number }[];
  readonly checks?: { perplexity?: number; coherence?: number; stability?: number; heldOut: number };
  /** False when nothing ties the study's languages together. */
  readonly tied: boolean;
  readonly trace: number[];
}

const pts = (v: number) => `${(100 * v).toFixed(1)}`;

export function ReportDocument(props: ReportProps) {
  const name = (k: number) => {
    const t = props.themes[k];
    return t ? `${k + 1}. ${t.label}` : `Theme ${k + 1}`;
  };
  const [first, second] = props.languages;
  const anySuggested = props.themes.some((t) => t.suggested);
  const byShare = [...props.themes].sort((a, b) => b.share - a.share);
  return (
    <html lang="en">
      <head>
        <meta charset="utf-8" />
        <title>{`${props.study} · ${props.run} · Themata report`}</title>
        <style>{props.css}</style>
      </head>
      <body class="report">
        <main>
          <header class="report-head">
            <h1>{props.study}</h1>
            <p class="lead">
              Themes in {count(props.answers)} answers in {props.languages.join(', ')} · run {props.run} · prepared {when(props.createdAt)} by Themata. {props.settings}
            </p>
          </header>

          <section id="summary">
            <h2>Summary</h2>
            <p>
              The answers fall into {props.themes.length} themes. The largest are{' '}
              {byShare.slice(0, 3).map((t, i) => (
                <>
                  {i > 0 && (i === Math.min(3, byShare.length) - 1 ? ' and ' : ', ')}
                  <strong>{t.label}</strong> ({percent(t.share, 0)})
                </>
              ))}
              .
            </p>
            {anySuggested && <p class="hint">Labels marked * are suggested from each theme's most distinctive words and have not been checked by the researcher.</p>}
            {!props.tied && (
              <p class="notice error">
                The languages of this study were not tied together (no translations or glossary): a theme may not mean the same thing in each language. Compare its words
                across languages before reading its shares.
              </p>
            )}
            <table class="list report-themes">
              <thead>
                <tr>
                  <th scope="col">Theme</th>
                  <th scope="col" class="num">Share of answers</th>
                  <th scope="col">Top words · {first}</th>
                  {second && <th scope="col">Top words · {second}</th>}
                </tr>
              </thead>
              <tbody>
                {props.themes.map((t) => (
                  <tr>
                    <td>{name(t.k)}{t.suggested ? ' *' : ''}</td>
                    <td class="num">{percent(t.share)}</td>
                    <td class="words" dir="auto">{(t.words[first] ?? []).slice(0, 5).join(', ')}</td>
                    {second && <td class="words" dir="auto">{(t.words[second] ?? []).slice(0, 5).join(', ')}</td>}
                  </tr>
                ))}
              </tbody>
            </table>
            <h3>Clearest differences between groups</h3>
            {props.main.length === 0 ? (
              <p>No difference between groups is clear at the 95% level: every interval of a difference in share includes zero.</p>
            ) : (
              <>
                <table class="list" id="main-differences">
                  <thead>
                    <tr><th scope="col">Theme</th><th scope="col">Groups</th><th scope="col" class="num">Difference (percentage points)</th><th scope="col" class="num">95% interval</th></tr>
                  </thead>
                  <tbody>
                    {props.main.map((d) => (
                      <tr>
                        <td>{name(d.theme)}</td>
                        <td>{`${d.covariate}: ${d.levelA} rather than ${d.levelB}`}</td>
                        <td class="num">+{pts(d.difference)}</td>
                        <td class="num">{`${pts(d.low)} to ${pts(d.high)}`}</td>
                      </tr>
                    ))}
                  </tbody>
                </table>
                <p class="hint">
                  Each line: how many percentage points more of one group's answers go to the theme than of the other group's. Shown: differences whose 95% interval
                  leaves out zero and that hold under false-discovery control (Benjamini &amp; Hochberg 1995), largest first.
                </p>
              </>
            )}
            {props.checks && (
              <p class="hint">
                How far to trust the themes: mean coherence {Number.isFinite(props.checks.coherence ?? NaN) ? props.checks.coherence!.toFixed(2) : '—'} (NPMI of each theme's
                top words, −1 to 1, 0 = together as often as chance)
                {props.checks.stability !== undefined && `; stability across seeds ${props.checks.stability.toFixed(2)} (0 to 1)`}
                {props.checks.perplexity !== undefined && `; held-out perplexity ${props.checks.perplexity.toFixed(1)} on ${count(props.checks.heldOut)} answers kept aside (lower is better, comparable only between runs of this study)`}.
              </p>
            )}
            <aside class="caution" aria-label="How to read these results">
              <p>
                <strong>Read with care.</strong> Themes describe which words occur together; they are not causes, and a difference between groups is an association in this
                sample, not an effect. Weighted shares are only as good as the survey weights; the intervals assume answers are independent of each other.
              </p>
              <p>Answers can identify people. This report and the exported files may carry personal data: keep them under your organisation's data-protection rules and ethics approval.</p>
            </aside>
          </section>

          <section class="page-break" id="themes-detail">
            <h2>The themes in every language</h2>
            <table class="list themes report-words">
              <thead>
                <tr>
                  <th scope="col">Theme</th>
                  <th scope="col" class="num">Share</th>
                  <th scope="col">Top words</th>
                  {props.checks && <th scope="col" class="num">Coherence</th>}
                </tr>
              </thead>
              <tbody>
                {props.themes.map((t) => (
                  <tr>
                    <td>{name(t.k)}{t.suggested ? ' *' : ''}{t.alignment === 'not aligned' && <span class="flag">not aligned across languages</span>}</td>
                    <td class="num">{percent(t.share)}</td>
                    <td class="words">
                      {props.languages.map((l) => (
                        <div class="lang-words"><span class="lang">{l}</span> <span dir="auto">{(t.words[l] ?? []).join(', ')}</span></div>
                      ))}
                    </td>
                    {props.checks && <td class="num">{t.coherence === undefined ? '—' : t.coherence.toFixed(2)}{t.coherence !== undefined && t.coherence < 0 && <span class="flag">negative</span>}</td>}
                  </tr>
                ))}
              </tbody>
            </table>
            <IntervalChart caption="Share of all answers per theme (survey-weighted)." valueLabel="Share" percent rows={props.themes.map((t) => ({ label: name(t.k), value: t.share }))} />
          </section>

          {props.groups.map((g) => (
            <section class="page-break group">
              <h2>By {g.covariate}</h2>
              <p class="hint">Share of each group's answers given to each theme, with its 95% interval ({count(g.draws)} draws: posterior samples × resampled answers). n: answers; effective n: what the survey weights leave of them.</p>
              <table class="list shares">
                <thead>
                  <tr>
                    <th scope="col">Theme</th>
                    {g.levels.map((level) => {
                      const r = g.rows.find((x) => x.level === level);
                      return <th scope="col" class="num">{level}<span class="hint"><br />n {count(r?.n ?? 0)} · eff. {count(Math.round(r?.effectiveN ?? 0))}</span></th>;
                    })}
                  </tr>
                </thead>
                <tbody>
                  {props.themes.map((t) => (
                    <tr>
                      <td>{name(t.k)}</td>
                      {g.levels.map((level) => {
                        const r = g.rows.find((x) => x.level === level && x.theme === t.k);
                        return <td class="num">{r ? <>{percent(r.share)}<span class="interval"> {`${percent(r.low)}–${percent(r.high)}`}</span></> : '—'}</td>;
                      })}
                    </tr>
                  ))}
                </tbody>
              </table>
            </section>
          ))}

          <section class="page-break" id="method">
            <h2>How these figures were made</h2>
            <p>
              One topic model was fitted across all languages at once (a polylingual topic model, EMNLP 2009, whose theme prior depends on each answer's metadata:
              Dirichlet-multinomial regression, UAI 2008). Translations and other linked answers share one theme mix, which is what makes a theme mean the same thing in
              each language. Shares are survey-weighted means of each answer's theme mix; intervals combine posterior samples of the mixes with resampling of answers. {props.settings}
            </p>
            {props.trace.length > 1 && (
              <LineChart caption="Log-likelihood per word after each sweep: a flat end means the sampler had settled." xLabel="Sweep" yLabel="Log-likelihood per word" series={[{ name: 'log-likelihood', points: props.trace.map((v, i) => [i + 1, v] as const) }]} />
            )}
          </section>
        </main>
      </body>
    </html>
  );
}
