// Glossaries (docs/design.md §3): a researcher's term lists, each row a concept in several languages,
// shown on the Data page (what was imported, with an upload form) and on the Languages page
// (how many terms tie each language to the others).
import { count, Notice, when } from './components.js';
import { CsrfField } from './layout.js';

export interface GlossaryView {
  readonly importId: number;
  readonly fileName: string;
  readonly format: string;
  readonly createdAt: string;
  readonly rows: number;
  readonly linkGroups: number;
  readonly linkingRows: number;
  readonly columns: readonly { column: string; language: string }[];
  readonly termsPerLanguage: Record<string, number>;
  readonly withWordsPerLanguage: Record<string, number>;
}

export interface GlossarySectionProps {
  readonly base: string;
  readonly csrf: string;
  readonly glossaries: readonly GlossaryView[];
  readonly languages: readonly string[];
  readonly canEdit: boolean;
  readonly canDelete: boolean;
  readonly justImported?: number;
}

function perLanguage(g: GlossaryView): string {
  return g.columns.map((c) => `${c.language} ${count(g.termsPerLanguage[c.language] ?? 0)}`).join(', ');
}

export function GlossarySection(props: GlossarySectionProps) {
  const fresh = props.glossaries.find((g) => g.importId === props.justImported);
  return (
    <section class="panel" id="glossaries">
      <h2>Glossaries</h2>
      <p class="hint">
        A glossary is a list of terms, one row per concept and one column per language. Each row becomes a group of tiny texts that share one theme mix, so the
        fit learns that these words mean the same thing. Glossary terms are never counted or shown as answers.
      </p>
      {fresh && (
        <Notice kind="ok">
          Imported glossary {fresh.fileName}: {count(fresh.linkGroups)} rows linking {fresh.columns.map((c) => c.language).join(', ')}; {count(fresh.linkingRows)} of them
          have words in at least two languages of the study's vocabulary.
        </Notice>
      )}
      {props.glossaries.length === 0 ? (
        <p>No glossary yet.</p>
      ) : (
        <table class="list" id="glossary-list">
          <thead>
            <tr>
              <th scope="col">File</th>
              <th scope="col" class="num">Rows</th>
              <th scope="col" class="num">Rows that link</th>
              <th scope="col">Terms by language</th>
              <th scope="col">Imported</th>
              {props.canDelete && <th scope="col">Actions</th>}
            </tr>
          </thead>
          <tbody>
            {props.glossaries.map((g) => (
              <tr>
                <td>{g.fileName}</td>
                <td class="num">{count(g.rows)}</td>
                <td class="num" title="rows with words in at least two languages of the vocabulary">{count(g.linkingRows)}</td>
                <td>{perLanguage(g)}</td>
                <td>{when(g.createdAt)}</td>
                {props.canDelete && <td><a href={`${props.base}/imports/${g.importId}/delete`} aria-label={`Delete ${g.fileName}`}>Delete…</a></td>}
              </tr>
            ))}
          </tbody>
        </table>
      )}
      {props.canEdit && (
        <form method="post" action={`${props.base}/glossary`} enctype="multipart/form-data" class="stack" id="glossary-form">
          <CsrfField csrf={props.csrf} />
          <label>
            Glossary file <input type="file" name="file" required accept=".csv,.tsv,.txt,.xlsx" />
            <span class="hint">
              CSV, TSV or Excel (.xlsx). The header names each column's language by its tag or name ({props.languages.join(', ') || 'the study\'s languages'}, or e.g.
              English, Español). Separate synonyms in one cell with ";" or "/". The original file is kept with the study.
            </span>
          </label>
          <label>
            Sheet <input name="sheet" placeholder="first sheet" />
            <span class="hint">Excel only: the sheet to read.</span>
          </label>
          <button type="submit">Import glossary</button>
        </form>
      )}
    </section>
  );
}

export interface GlossaryTermsProps {
  /** Per language: terms, tiny documents (cells), and cells with words in the vocabulary. */
  readonly byLanguage: Record<string, { terms: number; documents: number; withWords: number }>;
  readonly dataHref: string;
}

/** Languages page: how many glossary terms each language has (none: a pointer to the Data page). */
export function GlossaryTerms(props: GlossaryTermsProps) {
  const languages = Object.keys(props.byLanguage).sort();
  return (
    <section class="panel" id="glossary-terms">
      <h2>Glossary terms</h2>
      {languages.length === 0 ? (
        <p>
          No glossary yet. A glossary ties the languages together with terms you know mean the same; <a href={`${props.dataHref}#glossaries`}>import one on the Data page</a>.
        </p>
      ) : (
        <table class="list">
          <thead>
            <tr>
              <th scope="col">Language</th>
              <th scope="col" class="num">Terms</th>
              <th scope="col" class="num">Rows with this language</th>
              <th scope="col" class="num">Of those, with words in the vocabulary</th>
            </tr>
          </thead>
          <tbody>
            {languages.map((l) => (
              <tr>
                <th scope="row">{l}</th>
                <td class="num">{count(props.byLanguage[l].terms)}</td>
                <td class="num">{count(props.byLanguage[l].documents)}</td>
                <td class="num">{count(props.byLanguage[l].withWords)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
    </section>
  );
}
