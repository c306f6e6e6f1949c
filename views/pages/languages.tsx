// Languages: which language each answer was taken to be written in, how sure Themata is, and
// where to correct it — one answer at a time or many at once.
import { Histogram } from '../charts/index.js';
import { count, Notice, Pager, percent } from '../components.js';
import { CsrfField, Layout, type PageFrame } from '../layout.js';
import { GlossaryTerms, type GlossaryTermsProps } from '../glossary.js';

export interface LanguageRow {
  readonly language: string | null;
  readonly documents: number;
  readonly included: number;
  readonly bySource: Partial<Record<string, number>>;
  readonly meanConfidence: number;
  readonly disagreements: number;
}

export interface AnswerRow {
  readonly id: number;
  readonly rowId: string;
  readonly text: string;
  readonly language: string | null;
  readonly declared: string | null;
  readonly source: string;
  readonly confidence: number;
  readonly excluded: string | null;
  /** The language the text is written in, by the text alone (null: too little evidence). */
  readonly written?: string | null;
  /** What the text said about the declared language: confirmed, kept, overruled. */
  readonly check?: string | null;
  /** The second language of an answer written in two, with its share of the words. */
  readonly mixed?: { readonly language: string; readonly share: number } | null;
}

/** Answers to review beside the counts. */
export interface ReviewCounts {
  /** Decided language differs from the language written: what "accept written" would change. */
  readonly writtenDiffers: number;
  /** Answers written in two languages. */
  readonly mixed: number;
  /** Answers whose text overruled their declared language. */
  readonly overruled: number;
}

export interface LanguagesPageProps {
  readonly frame: PageFrame;
  readonly studyId: number;
  readonly rows: readonly LanguageRow[];
  readonly bins: readonly number[];
  readonly show: string;
  readonly filterLanguage: string;
  readonly answers: readonly AnswerRow[];
  readonly total: number;
  readonly offset: number;
  readonly limit: number;
  readonly choices: readonly string[];
  readonly canEdit: boolean;
  readonly message?: string;
  readonly review?: ReviewCounts;
  readonly glossaryTerms?: GlossaryTermsProps;
}

const SOURCES = ['declared', 'detected', 'adapted', 'overridden', 'undetermined'] as const;
const SOURCE_HELP: Record<string, string> = {
  declared: 'from the language column of the file',
  detected: 'recognised from the text',
  adapted: 're-decided using words typical of this study',
  overridden: 'set by hand',
  undetermined: 'too little evidence to decide',
};
const CHECK_HELP: Record<string, string> = {
  confirmed: 'the text is written in the declared language',
  kept: 'too little text to say otherwise: the declared language stands',
  overruled: 'the text is clearly written in another language, which was taken',
};

export function LanguagesPage(props: LanguagesPageProps) {
  const base = `/studies/${props.studyId}/languages`;
  const views: [string, string][] = [
    ['undetermined', 'Undetermined'],
    ['disagreements', 'Declared ≠ written'],
    ['mixed', 'Two languages'],
    ['all', 'All answers'],
  ];
  return (
    <Layout {...props.frame}>
      <h1>Languages</h1>
      {props.message && <Notice kind="ok">{props.message}</Notice>}
      <table class="list" id="language-counts">
        <thead>
          <tr>
            <th scope="col">Language</th>
            <th scope="col" class="num">Answers</th>
            <th scope="col" class="num">Used in runs</th>
            {SOURCES.map((s) => <th scope="col" class="num" title={SOURCE_HELP[s]}>{s[0].toUpperCase() + s.slice(1)}</th>)}
            <th scope="col" class="num">Mean confidence</th>
            <th scope="col" class="num">Declared differently</th>
          </tr>
        </thead>
        <tbody>
          {props.rows.map((r) => (
            <tr>
              <th scope="row">{r.language ?? 'undetermined'}</th>
              <td class="num">{count(r.documents)}</td>
              <td class="num">{count(r.included)}</td>
              {SOURCES.map((s) => <td class="num">{count(r.bySource[s] ?? 0)}</td>)}
              <td class="num">{percent(r.meanConfidence, 0)}</td>
              <td class="num">{count(r.disagreements)}</td>
            </tr>
          ))}
        </tbody>
      </table>
      <p class="hint">Sources: {SOURCES.map((s) => `${s} = ${SOURCE_HELP[s]}`).join('; ')}. Declared language: {Object.entries(CHECK_HELP).map(([k, v]) => `${k} = ${v}`).join('; ')}.</p>
      <Histogram
        caption="How sure the language decision is, over all answers (1 = certain). Answers at the low end are worth a look."
        xLabel="Confidence"
        bins={props.bins.map((n, i) => ({ x0: i / 10, x1: (i + 1) / 10, count: n }))}
      />
      {props.review && (
        <section id="language-review">
          <p>
            The language column of a file is taken as a strong prior, not as the truth: an answer whose text is clearly in another
            language gets the language it is written in ({count(props.review.overruled)} answer{props.review.overruled === 1 ? '' : 's'} so far), and the declared
            language stays beside it. {count(props.review.mixed)} answer{props.review.mixed === 1 ? ' is' : 's are'} written in two languages and go by the language of most of their words.
          </p>
          {props.review.writtenDiffers > 0 && props.canEdit && (
            <form method="post" action={`${base}/accept-written`} class="row">
              <CsrfField csrf={props.frame.csrf} />
              <input type="hidden" name="all" value="1" />
              <input type="hidden" name="back" value={`${base}?show=${props.show}&language=${props.filterLanguage}&offset=${props.offset}`} />
              <span>{count(props.review.writtenDiffers)} answer{props.review.writtenDiffers === 1 ? ' keeps a language' : 's keep a language'} other than the one {props.review.writtenDiffers === 1 ? 'it is' : 'they are'} written in.</span>
              <button type="submit">Accept the written language for all {count(props.review.writtenDiffers)}</button>
            </form>
          )}
        </section>
      )}
      <h2>Review answers</h2>
      <nav class="subtabs" aria-label="Which answers">
        {views.map(([key, label]) => (
          <a href={`${base}?show=${key}`} aria-current={props.show === key ? 'page' : undefined}>{label}</a>
        ))}
      </nav>
      <form method="get" action={base} class="row">
        <input type="hidden" name="show" value={props.show} />
        <label>
          Language
          <select name="language">
            <option value="">any</option>
            {props.choices.map((l) => <option value={l} selected={props.filterLanguage === l}>{l}</option>)}
          </select>
        </label>
        <button type="submit">Show</button>
      </form>
      <form method="post" action={`${base}/override`} id="override-form">
        <CsrfField csrf={props.frame.csrf} />
        <input type="hidden" name="back" value={`${base}?show=${props.show}&language=${props.filterLanguage}&offset=${props.offset}`} />
        <table class="list answers">
          <thead>
            <tr>
              {props.canEdit && <th scope="col"><span class="sr">Tick</span></th>}
              <th scope="col">Row</th>
              <th scope="col">Answer</th>
              <th scope="col">Declared</th>
              <th scope="col" title="judged from the text alone">Written</th>
              <th scope="col">Decided</th>
              <th scope="col" class="num">Confidence</th>
              {props.canEdit && <th scope="col">Change to</th>}
            </tr>
          </thead>
          <tbody>
            {props.answers.map((a) => (
              <tr>
                {props.canEdit && <td><input type="checkbox" name="ids" value={String(a.id)} aria-label={`Tick answer ${a.rowId}`} /></td>}
                <td>{a.rowId}</td>
                <td class="answer" dir="auto">{a.text}{a.excluded && <span class="tag">{a.excluded}</span>}</td>
                <td>{a.declared ?? '—'}</td>
                <td>
                  {a.written ?? '—'}
                  {a.mixed && <span class="tag" title={`${percent(a.mixed.share, 0)} of the words are in ${a.mixed.language}`}>mixed with {a.mixed.language} ({percent(a.mixed.share, 0)})</span>}
                </td>
                <td>
                  {a.language ?? 'undetermined'} <span class="hint">({a.source}{a.check ? `; declared ${a.check}` : ''})</span>
                  {a.check && <span class="sr">: {CHECK_HELP[a.check]}</span>}
                </td>
                <td class="num">{percent(a.confidence, 0)}</td>
                {props.canEdit && (
                  <td class="row">
                    <select name={`lang-${a.id}`} aria-label={`New language for answer ${a.rowId}`}>
                      {props.choices.map((l) => <option value={l} selected={l === a.language}>{l}</option>)}
                      <option value="-">undetermined</option>
                    </select>
                    <button type="submit" name="one" value={String(a.id)} class="small">Set</button>
                    {a.written && a.written !== a.language && (
                      <button type="submit" name="one" value={String(a.id)} formaction={`${base}/accept-written`} class="small">
                        Accept written ({a.written})
                      </button>
                    )}
                  </td>
                )}
              </tr>
            ))}
          </tbody>
        </table>
        {props.answers.length === 0 && <Notice>No answers in this list.</Notice>}
        {props.canEdit && props.answers.length > 0 && (
          <p class="row">
            <label>
              Set every ticked answer to
              <select name="bulk">
                {props.choices.map((l) => <option value={l}>{l}</option>)}
                <option value="-">undetermined</option>
              </select>
            </label>
            <button type="submit" name="many" value="1">Apply to ticked answers</button>
          </p>
        )}
      </form>
      <Pager base={base} query={{ show: props.show, language: props.filterLanguage }} offset={props.offset} limit={props.limit} total={props.total} />
      {props.glossaryTerms && <GlossaryTerms {...props.glossaryTerms} />}
    </Layout>
  );
}
