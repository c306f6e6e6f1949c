// Export (the files of docs/design.md §8 and a printable report) and Apply (code a new file with this run).
import { Cautions, count, Notice, when } from '../components.js';
import { CsrfField, Layout, type PageFrame } from '../layout.js';

export interface ExportFileRow {
  readonly id: number;
  readonly fileName: string;
  readonly size: number;
  readonly createdAt: string;
}

const DESCRIPTIONS: Record<string, string> = {
  'answers-by-theme.csv': 'Every answer with its id, text (unless left out), metadata, language, weight, one share column per theme, its main theme, and why an answer has no shares (non-answer, too short, language undetermined…).',
  'theme-words.csv': 'Top words of each theme in each language, with stem, weight and exclusivity.',
  'theme-shares-by-group.csv': 'Share of each theme in each group, with 95% intervals, n and effective n.',
  'theme-tables.xlsx': 'The same tables as one spreadsheet workbook, one sheet each: themes, answers by theme, theme words, shares by group.',
  'codebook.json': 'Theme labels, words and the settings of the run.',
  'report.html': 'A printable report with the charts, to open in any browser.',
};

const BUNDLE_DESCRIPTION =
  'The saved run, signed by this installation: load it with `themata apply` to code new answers without this database (on another installation, add `--trust-bundle` if you trust where the file came from).';

function describe(name: string): string {
  if (DESCRIPTIONS[name]) return DESCRIPTIONS[name];
  if (name.endsWith('.themata-run')) return BUNDLE_DESCRIPTION;
  if (name.startsWith('coded-')) return 'New answers coded with this run (Apply).';
  return '';
}

/** The files "Prepare the files" makes, in the order they are listed. */
export function plannedFiles(bundleName: string, workbook: boolean): string[] {
  return ['answers-by-theme.csv', 'theme-words.csv', 'theme-shares-by-group.csv', ...(workbook ? ['theme-tables.xlsx'] : []), 'codebook.json', 'report.html', bundleName];
}

export function ExportPage(props: { frame: PageFrame; base: string; files: readonly ExportFileRow[]; canEdit: boolean; bundleName: string; message?: string }) {
  return (
    <Layout {...props.frame}>
      <h1>Export</h1>
      <Cautions privacy />
      {props.message && <Notice kind="ok">{props.message}</Notice>}
      <section class="panel" id="export-plan">
        <h2>{props.files.length ? 'Preparing again makes these files' : 'Preparing makes these files'}</h2>
        <ul>
          {plannedFiles(props.bundleName, true).map((name) => (
            <li>
              <code>{name}</code>
              {name === 'theme-tables.xlsx' && ' (optional)'}: {describe(name)}
            </li>
          ))}
        </ul>
        {props.canEdit && (
          <form method="post" action={`${props.base}/export`} class="stack" id="export-form">
            <CsrfField csrf={props.frame.csrf} />
            <input type="hidden" name="choices" value="1" />
            <label>
              <input type="checkbox" name="answerText" value="1" checked /> Include each answer's text in answers-by-theme.csv and the workbook
              <span class="hint">Answers can identify people: leave the text out when the files go to someone who should see only the shares.</span>
            </label>
            <label>
              <input type="checkbox" name="workbook" value="1" checked /> Also make the spreadsheet workbook (theme-tables.xlsx)
            </label>
            <button type="submit">Prepare the files{props.files.length ? ' again (with the current labels)' : ''}</button>
          </form>
        )}
      </section>
      {props.files.length === 0 ? (
        <Notice>No files prepared yet.</Notice>
      ) : (
        <table class="list" id="export-files">
          <thead><tr><th scope="col">File</th><th scope="col">What it holds</th><th scope="col" class="num">Size</th><th scope="col">Prepared</th></tr></thead>
          <tbody>
            {props.files.map((f) => (
              <tr>
                <td><a href={`${props.base}/export/files/${f.id}`} download={f.fileName}>{f.fileName}</a></td>
                <td>{describe(f.fileName)}</td>
                <td class="num">{count(f.size)} bytes</td>
                <td>{when(f.createdAt)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
      <p class="hint">CSV files are UTF-8 with a byte-order mark so spreadsheet programs read every language correctly; in the CSV files and the workbook, text that would start a formula is prefixed with a quote.</p>
    </Layout>
  );
}

export interface ApplyResult {
  readonly fileId: number;
  readonly fileName: string;
  readonly rows: number;
  readonly answers: number;
  readonly coded: number;
  readonly otherLanguage: number;
  readonly noKnownWords: number;
  readonly unknownWordShare: number;
  /** Answers left out, per reason (non-answer, too short…). */
  readonly excluded: Record<string, number>;
  /** Mapped columns the file lacks, e.g. '"lang" (language)'. */
  readonly missingColumns: string[];
  /** One line per covariate the file lacks or whose levels the fit never saw. */
  readonly covariateNotes: string[];
}

export function ApplyPage(props: { frame: PageFrame; base: string; textColumns: string[]; canEdit: boolean; error?: string; result?: ApplyResult }) {
  const r = props.result;
  const left = r ? Object.entries(r.excluded).filter(([, n]) => n > 0) : [];
  return (
    <Layout {...props.frame}>
      <h1>Apply</h1>
      <p class="lead">
        Code new answers (e.g. the next wave) with the themes of this run. Only the answer text is needed, in a column named as in the original file (
        {props.textColumns.join(', ') || 'the text columns'}); the id, language, link key, weight and group columns are used when the file has them. Nothing is
        added to the study.
      </p>
      <Cautions privacy />
      {props.error && <Notice kind="error">{props.error}</Notice>}
      {r && (
        <div id="apply-result">
          <Notice kind="ok">
            Coded {count(r.coded)} of {count(r.answers)} answers from {count(r.rows)} rows.{' '}
            {r.otherLanguage > 0 && `${count(r.otherLanguage)} were in a language this run does not have, or one that could not be determined. `}
            {left.length > 0 && `Left out: ${left.map(([reason, n]) => `${count(n)} ${reason}`).join(', ')}. `}
            {r.noKnownWords > 0 && `${count(r.noKnownWords)} had no word the run knows. `}
            {`${Math.round(100 * r.unknownWordShare)}% of their words were new to the run. `}
            Each answer without shares says why in the file's “left out because” column.{' '}
            <a href={`${props.base}/export/files/${r.fileId}`} id="applied-download" download={r.fileName}>Download {r.fileName}</a>
          </Notice>
          {r.missingColumns.length > 0 && (
            <Notice>
              <span id="apply-missing">Not in the file, so not used: {r.missingColumns.join(', ')}.</span>
            </Notice>
          )}
          {r.covariateNotes.length > 0 && (
            <section class="panel" id="apply-covariates">
              <h2>Groups the run has not seen</h2>
              <p class="hint">
                The run's prior for an answer depends on its groups. Where a group column is missing or holds a level the fit never saw, the answer was coded with
                the prior said below; the file's “coding note” column says so on each answer concerned.
              </p>
              <ul>
                {r.covariateNotes.map((line) => (
                  <li>{line}</li>
                ))}
              </ul>
            </section>
          )}
        </div>
      )}
      {props.canEdit && (
        <form method="post" action={`${props.base}/apply`} enctype="multipart/form-data" class="stack" id="apply-form">
          <CsrfField csrf={props.frame.csrf} />
          <label>New answers <input type="file" name="file" required accept=".csv,.tsv,.txt,.jsonl,.ndjson,.xlsx,.sav" /></label>
          <label>Sheet <input name="sheet" placeholder="first sheet" /></label>
          <input type="hidden" name="choices" value="1" />
          <label>
            <input type="checkbox" name="answerText" value="1" checked /> Include each answer's text in the coded file
          </label>
          <button type="submit">Code these answers</button>
        </form>
      )}
    </Layout>
  );
}
