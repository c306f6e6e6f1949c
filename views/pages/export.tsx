// Export (the files of DESIGN §8 and a printable report) and Apply (code a new file with this run).
import { Cautions, count, Notice, when } from '../components.js';
import { CsrfField, Layout, type PageFrame } from '../layout.js';

export interface ExportFileRow {
  readonly id: number;
  readonly fileName: string;
  readonly size: number;
  readonly createdAt: string;
}

const DESCRIPTIONS: Record<string, string> = {
  'answers-by-theme.csv': 'Every answer with its id, metadata, language, weight, one share column per theme and its main theme.',
  'theme-words.csv': 'Top words of each theme in each language, with stem, weight and exclusivity.',
  'theme-shares-by-group.csv': 'Share of each theme in each group, with 95% intervals, n and effective n.',
  'codebook.json': 'Theme labels, words and the settings of the run.',
  'report.html': 'A printable report with the charts, to open in any browser.',
};

function describe(name: string): string {
  if (DESCRIPTIONS[name]) return DESCRIPTIONS[name];
  if (name.endsWith('.themata-run')) return 'The saved run, signed by this installation: load it with `themata apply` to code new answers without this database (on another installation, add `--trust-bundle` if you trust where the file came from).';
  if (name.startsWith('coded-')) return 'New answers coded with this run (Apply).';
  return '';
}

export function ExportPage(props: { frame: PageFrame; base: string; files: readonly ExportFileRow[]; canEdit: boolean; message?: string }) {
  return (
    <Layout {...props.frame}>
      <h1>Export</h1>
      <Cautions privacy />
      {props.message && <Notice kind="ok">{props.message}</Notice>}
      {props.canEdit && (
        <form method="post" action={`${props.base}/export`} class="row" id="export-form">
          <CsrfField csrf={props.frame.csrf} />
          <button type="submit">Prepare the files{props.files.length ? ' again (with the current labels)' : ''}</button>
        </form>
      )}
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
      <p class="hint">CSV files are UTF-8 with a byte-order mark so spreadsheet programs read every language correctly; cells that would start a formula are prefixed with a quote.</p>
    </Layout>
  );
}

export function ApplyPage(props: {
  frame: PageFrame;
  base: string;
  textColumns: string[];
  canEdit: boolean;
  error?: string;
  result?: { fileId: number; fileName: string; rows: number; answers: number; coded: number; otherLanguage: number; noKnownWords: number; unknownWordShare: number };
}) {
  const r = props.result;
  return (
    <Layout {...props.frame}>
      <h1>Apply</h1>
      <p class="lead">Code new answers (e.g. the next wave) with the themes of this run. The new file needs the same column names as the original ({props.textColumns.join(', ') || 'text columns'}); nothing is added to the study.</p>
      <Cautions privacy />
      {props.error && <Notice kind="error">{props.error}</Notice>}
      {r && (
        <Notice kind="ok">
          Coded {count(r.coded)} of {count(r.answers)} answers from {count(r.rows)} rows.{' '}
          {r.otherLanguage > 0 && `${count(r.otherLanguage)} were in a language this run does not have. `}
          {r.noKnownWords > 0 && `${count(r.noKnownWords)} had no word the run knows. `}
          {`${Math.round(100 * r.unknownWordShare)}% of their words were new to the run. `}
          <a href={`${props.base}/export/files/${r.fileId}`} id="applied-download" download={r.fileName}>Download {r.fileName}</a>
        </Notice>
      )}
      {props.canEdit && (
        <form method="post" action={`${props.base}/apply`} enctype="multipart/form-data" class="stack" id="apply-form">
          <CsrfField csrf={props.frame.csrf} />
          <label>New answers <input type="file" name="file" required accept=".csv,.tsv,.txt,.jsonl,.ndjson,.xlsx,.sav" /></label>
          <label>Sheet <input name="sheet" placeholder="first sheet" /></label>
          <button type="submit">Code these answers</button>
        </form>
      )}
    </Layout>
  );
}
