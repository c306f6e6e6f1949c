// Vocabulary: per language, the words the themes will be built from, the study's own stop
// words, and the settings that decide which words are kept.
import { count, Notice, Pager } from '../components.js';
import { CsrfField, Layout, type PageFrame } from '../layout.js';
import { PostPager } from '../post-pager.js';

export interface VocabularyPageProps {
  readonly frame: PageFrame;
  readonly studyId: number;
  readonly sizes: readonly { language: string; words: number; tokens: number }[];
  readonly language: string;
  readonly words: readonly { stem: string; surface: string; count: number; docCount: number }[];
  readonly search: string;
  readonly offset: number;
  readonly limit: number;
  readonly totalWords: number;
  readonly collocations: readonly { surface: string; count: number }[];
  readonly ownWords: string[];
  readonly ownWordsAll: string[];
  readonly settings: {
    stemming: boolean;
    foldDiacritics: boolean;
    minCount: number;
    maxDocShare: number;
    minTokens: number;
    collocationNpmi: number | null;
    collocationMinCount: number;
  };
  readonly excluded: Record<string, number>;
  /** The standard lists applied to this language, shown so a researcher knows what is dropped. */
  readonly standard: { stemmer: string | null; stopWords: readonly string[]; fillers: readonly string[]; nonAnswers: readonly string[]; kept: readonly string[] };
  readonly canEdit: boolean;
  readonly message?: string;
}

export function VocabularyPage(props: VocabularyPageProps) {
  const base = `/studies/${props.studyId}/vocabulary`;
  const s = props.settings;
  const disabled = !props.canEdit;
  return (
    <Layout {...props.frame}>
      <h1>Vocabulary</h1>
      {props.message && <Notice kind="ok">{props.message}</Notice>}
      <table class="list" id="vocabulary-sizes">
        <thead>
          <tr>
            <th scope="col">Language</th>
            <th scope="col" class="num">Distinct words kept</th>
            <th scope="col" class="num">Word occurrences</th>
          </tr>
        </thead>
        <tbody>
          {props.sizes.map((r) => (
            <tr>
              <th scope="row"><a href={`${base}?language=${encodeURIComponent(r.language)}`} aria-current={r.language === props.language ? 'true' : undefined}>{r.language}</a></th>
              <td class="num">{count(r.words)}</td>
              <td class="num">{count(r.tokens)}</td>
            </tr>
          ))}
        </tbody>
      </table>
      {Object.keys(props.excluded).length > 0 && (
        <p class="hint">Answers left out of runs: {Object.entries(props.excluded).map(([k, v]) => `${k}: ${count(v)}`).join('; ')}.</p>
      )}
      {props.language && (
        <div class="columns">
          <section>
            <h2>Most frequent words · {props.language}</h2>
            {/* Posted, so the words searched for stay out of addresses (OWASP ASVS 4.0.3 V8.3.1). */}
            <form method="post" action={`${base}/search`} class="row" id="vocabulary-search">
              <CsrfField csrf={props.frame.csrf} />
              <input type="hidden" name="language" value={props.language} />
              <label>Find <input name="q" value={props.search} /></label>
              <button type="submit">Search</button>
            </form>
            <table class="list words">
              <thead>
                <tr>
                  <th scope="col">Word</th>
                  <th scope="col">Stem</th>
                  <th scope="col" class="num">Occurrences</th>
                  <th scope="col" class="num">Answers</th>
                </tr>
              </thead>
              <tbody>
                {props.words.map((w) => (
                  <tr>
                    <td dir="auto">{w.surface}</td>
                    <td dir="auto" class="hint">{w.stem}</td>
                    <td class="num">{count(w.count)}</td>
                    <td class="num">{count(w.docCount)}</td>
                  </tr>
                ))}
              </tbody>
            </table>
            {props.search ? (
              <PostPager action={`${base}/search`} fields={{ language: props.language, q: props.search }} csrf={props.frame.csrf} offset={props.offset} limit={props.limit} total={props.totalWords} />
            ) : (
              <Pager base={base} query={{ language: props.language }} offset={props.offset} limit={props.limit} total={props.totalWords} />
            )}
            {props.collocations.length > 0 && (
              <>
                <h3>Word pairs kept as one word</h3>
                <p>{props.collocations.map((c) => `${c.surface} (${count(c.count)})`).join(' · ')}</p>
              </>
            )}
          </section>
          <section>
            <h2>Words ignored in {props.language}</h2>
            <p class="hint">Stemmer: {props.standard.stemmer ?? 'none (words are kept as written)'}.</p>
            <details class="numbers">
              <summary>{props.standard.stopWords.length} standard stop words (open multilingual list)</summary>
              <p dir="auto">{props.standard.stopWords.join(', ')}</p>
            </details>
            {props.standard.fillers.length > 0 && (
              <details class="numbers">
                <summary>{props.standard.fillers.length} survey filler words</summary>
                <p dir="auto">{props.standard.fillers.join(', ')}</p>
              </details>
            )}
            {props.standard.nonAnswers.length > 0 && (
              <details class="numbers">
                <summary>{props.standard.nonAnswers.length} whole answers treated as non-answers</summary>
                <p dir="auto">{props.standard.nonAnswers.join(' · ')}</p>
              </details>
            )}
            {props.standard.kept.length > 0 && <p class="hint">Kept although on the standard list, because they name survey themes: {props.standard.kept.join(', ')}.</p>}
            <h2>The study's own stop words</h2>
            <p class="hint">Words to ignore on top of the standard stop-word list of each language and the survey fillers Themata already knows ("n/a", "nothing", "don't know"…). One per line.</p>
            <form method="post" action={`${base}/words`} class="stack">
              <CsrfField csrf={props.frame.csrf} />
              <input type="hidden" name="language" value={props.language} />
              <label>
                Only in {props.language}
                <textarea name="words" rows={6} disabled={disabled}>{props.ownWords.join('\n')}</textarea>
              </label>
              <label>
                In every language
                <textarea name="wordsAll" rows={4} disabled={disabled}>{props.ownWordsAll.join('\n')}</textarea>
              </label>
              {props.canEdit && <button type="submit">Save word lists and rebuild</button>}
            </form>
            <h2>Which words are kept</h2>
            <form method="post" action={`${base}/settings`} class="stack" id="pruning-form">
              <CsrfField csrf={props.frame.csrf} />
              <input type="hidden" name="language" value={props.language} />
              <label class="check"><input type="checkbox" name="stemming" value="1" checked={s.stemming} disabled={disabled} /> Reduce words to their stem (e.g. "opening", "opened" → "open")</label>
              <label class="check"><input type="checkbox" name="foldDiacritics" value="1" checked={s.foldDiacritics} disabled={disabled} /> Ignore accents after stemming</label>
              <label>Keep words seen at least <input name="minCount" type="number" min="1" max="1000" value={String(s.minCount)} disabled={disabled} /> times</label>
              <label>Drop words used in more than <input name="maxDocShare" type="number" min="0.01" max="1" step="0.01" value={String(s.maxDocShare)} disabled={disabled} /> of a language's answers (share)</label>
              <label>Leave out answers with fewer than <input name="minTokens" type="number" min="1" max="100" value={String(s.minTokens)} disabled={disabled} /> kept words</label>
              <label>Join frequent word pairs whose association (NPMI) exceeds <input name="collocationNpmi" type="number" min="0" max="1" step="0.05" value={s.collocationNpmi === null ? '' : String(s.collocationNpmi)} placeholder="off" disabled={disabled} /></label>
              <label>… seen at least <input name="collocationMinCount" type="number" min="2" max="10000" value={String(s.collocationMinCount)} disabled={disabled} /> times</label>
              {props.canEdit && <button type="submit">Save settings and rebuild</button>}
            </form>
          </section>
        </div>
      )}
    </Layout>
  );
}
