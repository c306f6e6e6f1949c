// Themes: one row per theme, and a page per theme. Words are shown in their most frequent
// written form, the study's first language first, so a reader can check that a theme means the
// same thing in every language. A theme nobody has labelled yet shows a suggested label (its
// most distinctive words), marked as a suggestion, which one click accepts.
import { IntervalChart, ShareStrip } from '../charts/index.js';
import { Cautions, percent } from '../components.js';
import { CsrfField, Layout, type PageFrame } from '../layout.js';
import { TiesNotice, type TiesFacts } from '../ties-notice.js';

export interface ThemeNameProps {
  readonly k: number;
  readonly text: string;
  readonly saved: string | null;
  readonly suggestion: string;
  readonly suggested: boolean;
  /** Most distinctive words per language, the first language first. */
  readonly words: readonly { language: string; words: readonly string[] }[];
}

export interface ThemeRow {
  readonly k: number;
  readonly name: ThemeNameProps;
  readonly share: number;
  readonly words: Record<string, string[]>;
  readonly balance: { language: string; share: number }[];
  readonly coherence?: number;
  readonly stability?: number;
  readonly alignment?: { status: 'aligned' | 'not aligned' | 'too few pairs'; source: 'translations' | 'glossary' };
}

/** Languages shown in the row itself; the rest open on request, so the table fits the window. */
const LANGUAGES_SHOWN = 3;

/** A theme's name as text, with "(suggested)" while nobody has accepted it. */
export function themeTitle(name: Pick<ThemeNameProps, 'k' | 'text' | 'suggested'>): string {
  if (name.text === `Theme ${name.k + 1}`) return name.text;
  return `Theme ${name.k + 1}: ${name.text}${name.suggested ? ' (suggested)' : ''}`;
}

export function LabelForm(props: { base: string; k: number; value: string; placeholder: string; csrf: string; saved?: boolean }) {
  const action = `${props.base}/themes/${props.k}/label`;
  return (
    <form method="post" action={action} class="label-form" hx-post={action} hx-target={`#label-${props.k}`} hx-swap="outerHTML">
      <CsrfField csrf={props.csrf} />
      <input name="label" value={props.value} placeholder={props.placeholder} maxlength={80} aria-label={`Label of theme ${props.k + 1}`} />
      <button type="submit" class="small">Save</button>
      {props.saved && <span class="saved" role="status">Saved</span>}
    </form>
  );
}

/** The label of one theme: the form to save it, and the suggestion with its one-click accept. */
export function LabelCell(props: { base: string; name: ThemeNameProps; csrf: string; saved?: boolean; canEdit: boolean }) {
  const { name } = props;
  const action = `${props.base}/themes/${name.k}/label`;
  const others = name.words.slice(1).filter((w) => w.words.length > 0);
  return (
    <div class="label-cell" id={`label-${name.k}`}>
      {props.canEdit ? (
        <LabelForm base={props.base} k={name.k} value={name.saved ?? ''} placeholder={name.suggestion} csrf={props.csrf} saved={props.saved} />
      ) : (
        <span class={name.suggested ? 'label suggested' : 'label'}>{name.text}</span>
      )}
      {name.suggested && (
        <div class="suggestion">
          <span class="tag">suggested</span> <strong dir="auto">{name.suggestion}</strong>
          {others.length > 0 && <span class="hint" dir="auto"> · {others.map((w) => `${w.language}: ${w.words.slice(0, 3).join(', ')}`).join(' · ')}</span>}
          {props.canEdit && (
            <form method="post" action={action} class="accept-form" hx-post={action} hx-target={`#label-${name.k}`} hx-swap="outerHTML">
              <CsrfField csrf={props.csrf} />
              <input type="hidden" name="label" value={name.suggestion} />
              <button type="submit" class="small secondary">Accept</button>
            </form>
          )}
        </div>
      )}
    </div>
  );
}

function Words(props: { languages: string[]; words: Record<string, string[]> }) {
  const line = (l: string, first: boolean) => (
    <div class={first ? 'lang-words first' : 'lang-words'}>
      <span class="lang">{l}</span> <span dir="auto">{(props.words[l] ?? []).join(', ')}</span>
    </div>
  );
  const shown = props.languages.slice(0, LANGUAGES_SHOWN);
  const rest = props.languages.slice(LANGUAGES_SHOWN);
  return (
    <>
      {shown.map((l, i) => line(l, i === 0))}
      {rest.length > 0 && (
        <details class="more-languages">
          <summary>{rest.length} more {rest.length === 1 ? 'language' : 'languages'}</summary>
          {rest.map((l) => line(l, false))}
        </details>
      )}
    </>
  );
}

export function CoherenceHelp() {
  return (
    <details class="help" id="coherence-help">
      <summary>What coherence, stability and alignment mean</summary>
      <dl>
        <dt>Coherence</dt>
        <dd>
          How often a theme's top words appear in the same answers, compared with chance: the normalised pointwise mutual information (NPMI) of each pair of its ten top
          words, averaged, per language (Bouma 2009; Lau, Newman &amp; Baldwin, EACL 2014). It runs from −1 (the words never share an answer) through 0 (they share answers
          as often as chance) to 1 (always together). Readable themes usually score above about 0.05. A <strong>negative</strong> value is flagged: the top words rarely occur
          together, so the theme may mix unrelated answers; read its answers before trusting its label.
        </dd>
        <dt>Stability</dt>
        <dd>Cosine similarity (0 to 1) between the theme's words and its best match in a run with another seed. Near 1: the theme comes back whatever the start; low: it may be an accident of this run.</dd>
        <dt>Aligned across languages</dt>
        <dd>
          Whether answers known to say the same thing in two languages (held-out translations, or the rows of a glossary) are led by this theme in both languages more often
          than chance. Details per language pair are on the Checks page.
        </dd>
      </dl>
    </details>
  );
}

export function ThemesPage(props: {
  frame: PageFrame;
  base: string;
  /** In reading order: the study's first language, then by number of answers. */
  languages: string[];
  rows: readonly ThemeRow[];
  canEdit: boolean;
  stabilityNote: string;
  sort: string;
  links: TiesFacts;
}) {
  const rows = [...props.rows];
  if (props.sort === 'share') rows.sort((a, b) => b.share - a.share);
  const unlabelled = props.rows.filter((r) => r.name.suggested).length;
  const [first, ...others] = props.languages;
  return (
    <Layout {...props.frame}>
      <h1>Themes</h1>
      <TiesNotice links={props.links} studyId={props.frame.study?.id ?? 0} when="after" />
      <Cautions />
      <p class="hint">
        Give each theme a short label that a colleague would understand. Until you do, each theme shows a suggested label: its most distinctive words in {first}
        {others.length > 0 ? `, with the other languages' words beside it` : ''} (words frequent in this theme but not everywhere; Sievert &amp; Shirley, 2014). Shares are
        survey-weighted averages over all answers. Language balance shows which languages a theme's answers come from; a theme found in one language only may be a translation
        issue rather than a topic. {props.stabilityNote}
      </p>
      {props.canEdit && unlabelled > 0 && (
        <form method="post" action={`${props.base}/themes/labels/accept`} class="row" id="accept-all">
          <CsrfField csrf={props.frame.csrf} />
          <button type="submit">Accept all {unlabelled} suggested {unlabelled === 1 ? 'label' : 'labels'}</button>
          <span class="hint">Labels you have saved stay as they are; you can edit any label afterwards.</span>
        </form>
      )}
      <p class="row">
        Order by: <a href={`${props.base}/themes`} aria-current={props.sort !== 'share' ? 'true' : undefined}>theme number</a>
        <a href={`${props.base}/themes?sort=share`} aria-current={props.sort === 'share' ? 'true' : undefined}>share</a>
      </p>
      <table class="list themes fit" id="themes">
        <colgroup>
          <col class="c-num" />
          <col class="c-label" />
          <col class="c-share" />
          <col class="c-words" />
          <col class="c-balance" />
          <col class="c-score" />
          <col class="c-score" />
        </colgroup>
        <thead>
          <tr>
            <th scope="col">#</th>
            <th scope="col">Label</th>
            <th scope="col" class="num">Share</th>
            <th scope="col">Top words · {props.languages.join(', ')}</th>
            <th scope="col">Language balance</th>
            <th scope="col" class="num" title="NPMI of the top words: −1 to 1; 0 = together as often as chance; higher = the words really occur together">Coherence</th>
            <th scope="col" class="num" title="Similarity to the best-matching theme of a run with another seed (0 to 1)">Stability</th>
          </tr>
        </thead>
        <tbody>
          {rows.map((r) => (
            <tr>
              <td><a href={`${props.base}/themes/${r.k}`}>{r.k + 1}</a></td>
              <td>
                <LabelCell base={props.base} name={r.name} csrf={props.frame.csrf} canEdit={props.canEdit} />
                <a href={`${props.base}/themes/${r.k}`} class="small">open</a>
              </td>
              <td class="num">{percent(r.share)}</td>
              <td class="words">
                <Words languages={props.languages} words={r.words} />
                {r.alignment?.status === 'not aligned' && (
                  <span class="flag" title={`Judged on ${r.alignment.source === 'translations' ? 'held-out translations' : 'glossary rows'}; see Checks`}>not aligned across languages</span>
                )}
              </td>
              <td><ShareStrip width={120} label={`Language balance of theme ${r.k + 1}`} parts={r.balance.map((b) => ({ label: b.language, share: b.share, colour: props.languages.indexOf(b.language) }))} /></td>
              <td class="num">
                {r.coherence === undefined ? '—' : r.coherence.toFixed(2)}
                {r.coherence !== undefined && r.coherence < 0 && <span class="flag" title="The top words rarely occur in the same answers: read the theme's answers before trusting it">negative</span>}
              </td>
              <td class="num">{r.stability === undefined ? '—' : r.stability.toFixed(2)}</td>
            </tr>
          ))}
        </tbody>
      </table>
      <CoherenceHelp />
      <IntervalChart caption="Share of all answers per theme (survey-weighted)." valueLabel="Share of answers" percent rows={props.rows.map((r) => ({ label: `${r.k + 1}. ${r.name.text}`, value: r.share }))} />
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
  readonly name: ThemeNameProps;
  readonly share: number;
  readonly canEdit: boolean;
  readonly words: { language: string; rows: { word: string; stem: string; probability: number; exclusivity: number }[] }[];
  readonly examples: { language: string; answers: { rowId: string; share: number; text: MarkedText }[] }[];
  readonly groups: { covariate: string; rows: { level: string; share: number; low: number; high: number; n: number; effectiveN: number }[] }[];
}

export function ThemePage(props: ThemePageProps) {
  const { name } = props;
  return (
    <Layout {...props.frame}>
      <nav class="row" aria-label="Other themes">
        {props.k > 0 && <a href={`${props.base}/themes/${props.k - 1}`}>← Theme {props.k}</a>}
        <a href={`${props.base}/themes`}>All themes</a>
        {props.k < props.K - 1 && <a href={`${props.base}/themes/${props.k + 1}`}>Theme {props.k + 2} →</a>}
      </nav>
      <h1>
        {name.text === `Theme ${props.k + 1}` ? name.text : `Theme ${props.k + 1}: ${name.text}`}
        {name.suggested && name.text !== `Theme ${props.k + 1}` && <span class="tag" title="Suggested from the theme's most distinctive words: accept or edit it below">suggested</span>}
      </h1>
      <p class="lead">{percent(props.share)} of all answers (survey-weighted).</p>
      <LabelCell base={props.base} name={name} csrf={props.frame.csrf} canEdit={props.canEdit} />
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
