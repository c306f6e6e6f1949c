// Themes: one row per theme, and a page per theme. Words are shown in their most frequent
// written form, side by side per language, so a reader can check that a theme means the same
// thing in every language.
import { IntervalChart, ShareStrip } from '../charts/index.js';
import { Cautions, percent } from '../components.js';
import { CsrfField, Layout, type PageFrame } from '../layout.js';

export interface ThemeRow {
  readonly k: number;
  readonly label: string;
  readonly share: number;
  readonly words: Record<string, string[]>;
  readonly balance: { language: string; share: number }[];
  readonly coherence?: number;
  readonly stability?: number;
}

export function LabelForm(props: { base: string; k: number; label: string; csrf: string; saved?: boolean; canEdit: boolean }) {
  if (!props.canEdit) return <span class="label">{props.label}</span>;
  return (
    <form method="post" action={`${props.base}/themes/${props.k}/label`} class="label-form" hx-post={`${props.base}/themes/${props.k}/label`} hx-swap="outerHTML">
      <CsrfField csrf={props.csrf} />
      <input name="label" value={props.label} maxlength={80} aria-label={`Label of theme ${props.k + 1}`} />
      <button type="submit" class="small">Save</button>
      {props.saved && <span class="saved" role="status">Saved</span>}
    </form>
  );
}

export function ThemesPage(props: {
  frame: PageFrame;
  base: string;
  languages: string[];
  rows: readonly ThemeRow[];
  canEdit: boolean;
  stabilityNote: string;
  sort: string;
}) {
  const rows = [...props.rows];
  if (props.sort === 'share') rows.sort((a, b) => b.share - a.share);
  return (
    <Layout {...props.frame}>
      <h1>Themes</h1>
      <Cautions />
      <p class="hint">
        Give each theme a short label that a colleague would understand. Shares are survey-weighted averages over all answers. Language balance shows which
        languages a theme's answers come from; a theme found in one language only may be a translation issue rather than a topic. {props.stabilityNote}
      </p>
      <p class="row">
        Order by: <a href={`${props.base}/themes`} aria-current={props.sort !== 'share' ? 'true' : undefined}>theme number</a>
        <a href={`${props.base}/themes?sort=share`} aria-current={props.sort === 'share' ? 'true' : undefined}>share</a>
      </p>
      <div class="scroll">
        <table class="list themes" id="themes">
          <thead>
            <tr>
              <th scope="col">#</th>
              <th scope="col">Label</th>
              <th scope="col" class="num">Share</th>
              {props.languages.map((l) => <th scope="col">Words · {l}</th>)}
              <th scope="col">Language balance</th>
              <th scope="col" class="num" title="Normalised pointwise mutual information of the top words (−1 to 1; higher = words really occur together)">Coherence</th>
              <th scope="col" class="num" title="Similarity to the best-matching theme of a run with another seed (0 to 1)">Stability</th>
            </tr>
          </thead>
          <tbody>
            {rows.map((r) => (
              <tr>
                <td><a href={`${props.base}/themes/${r.k}`}>{r.k + 1}</a></td>
                <td><LabelForm base={props.base} k={r.k} label={r.label} csrf={props.frame.csrf} canEdit={props.canEdit} /> <a href={`${props.base}/themes/${r.k}`} class="small">open</a></td>
                <td class="num">{percent(r.share)}</td>
                {props.languages.map((l) => <td class="words" dir="auto">{(r.words[l] ?? []).join(', ')}</td>)}
                <td><ShareStrip label={`Language balance of theme ${r.k + 1}`} parts={r.balance.map((b) => ({ label: b.language, share: b.share, colour: props.languages.indexOf(b.language) }))} /></td>
                <td class="num">{r.coherence === undefined ? '—' : r.coherence.toFixed(2)}</td>
                <td class="num">{r.stability === undefined ? '—' : r.stability.toFixed(2)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      <IntervalChart caption="Share of all answers per theme (survey-weighted)." valueLabel="Share of answers" percent rows={props.rows.map((r) => ({ label: `${r.k + 1}. ${r.label}`, value: r.share }))} />
    </Layout>
  );
}

export interface MarkedText {
  readonly parts: { text: string; marked: boolean }[];
}

export interface ThemePageProps {
  readonly frame: PageFrame;
  readonly base: string;
  readonly k: number;
  readonly K: number;
  readonly label: string;
  readonly share: number;
  readonly canEdit: boolean;
  readonly words: { language: string; rows: { word: string; stem: string; probability: number; exclusivity: number }[] }[];
  readonly examples: { language: string; answers: { rowId: string; share: number; text: MarkedText }[] }[];
  readonly groups: { covariate: string; rows: { level: string; share: number; low: number; high: number; n: number; effectiveN: number }[] }[];
}

export function ThemePage(props: ThemePageProps) {
  return (
    <Layout {...props.frame}>
      <nav class="row" aria-label="Other themes">
        {props.k > 0 && <a href={`${props.base}/themes/${props.k - 1}`}>← Theme {props.k}</a>}
        <a href={`${props.base}/themes`}>All themes</a>
        {props.k < props.K - 1 && <a href={`${props.base}/themes/${props.k + 1}`}>Theme {props.k + 2} →</a>}
      </nav>
      <h1>Theme {props.k + 1}: {props.label}</h1>
      <p class="lead">{percent(props.share)} of all answers (survey-weighted).</p>
      <LabelForm base={props.base} k={props.k} label={props.label} csrf={props.frame.csrf} canEdit={props.canEdit} />
      <Cautions />
      <h2>Words in each language</h2>
      <p class="hint">Weight: how likely the theme is to use the word. Exclusivity: how much of the word's use belongs to this theme rather than others.</p>
      <div class="columns">
        {props.words.map((w) => (
          <section>
            <h3>{w.language}</h3>
            <IntervalChart
              caption={`Top words of theme ${props.k + 1} in ${w.language}`}
              valueLabel="Weight"
              percent
              width={420}
              colour={1}
              rows={w.rows.map((r) => ({ label: r.word, value: r.probability, extra: [r.stem, r.exclusivity.toFixed(2)] }))}
              extraColumns={['Stem', 'Exclusivity']}
            />
          </section>
        ))}
      </div>
      <h2>Answers that speak most of this theme</h2>
      <p class="hint">Highlighted: words of the theme. Share: how much of the answer the theme accounts for.</p>
      <div class="columns">
        {props.examples.map((e) => (
          <section>
            <h3>{e.language}</h3>
            <ol class="examples">
              {e.answers.map((a) => (
                <li>
                  <blockquote dir="auto">
                    {a.text.parts.map((p) => (p.marked ? <mark>{p.text}</mark> : p.text))}
                  </blockquote>
                  <span class="hint">Row {a.rowId} · {percent(a.share, 0)} this theme</span>
                </li>
              ))}
            </ol>
          </section>
        ))}
      </div>
      <h2>Share by group</h2>
      {props.groups.length === 0 && <p class="hint">The study has no group columns.</p>}
      {props.groups.map((g) => (
        <IntervalChart
          caption={`Share of theme ${props.k + 1} by ${g.covariate}, with 95% intervals (posterior samples × bootstrap of answers).`}
          valueLabel="Share of answers"
          percent
          rows={g.rows.map((r) => ({ label: r.level, value: r.share, low: r.low, high: r.high, extra: [r.n, Math.round(r.effectiveN)] }))}
          extraColumns={['Answers (n)', 'Effective n']}
        />
      ))}
    </Layout>
  );
}
