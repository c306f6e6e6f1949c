// Data: the files imported into a study, uploading another, and mapping its columns.
import { Cautions, count, Notice, when } from '../components.js';
import { CsrfField, Layout, type PageFrame } from '../layout.js';
import { GlossarySection, type GlossarySectionProps } from '../glossary.js';

export interface ImportRow {
  readonly id: number;
  readonly fileName: string;
  readonly format: string;
  readonly size: number;
  readonly encoding: string;
  readonly documents: number;
  readonly createdAt: string;
  readonly perLanguage: Record<string, number>;
  readonly undetermined: number;
  readonly excluded: Record<string, number>;
  readonly textColumns: string[];
  readonly encodingConfidence?: number;
  /** What the reader noticed about the encoding (mixed lines, mojibake), one sentence each. */
  readonly encodingNotes?: readonly string[];
}

/** Encoding warnings, shown before import (mapping page) and after it (Data page). */
function EncodingNotes(props: { notes?: readonly string[] }) {
  if (!props.notes || props.notes.length === 0) return null;
  return (
    <Notice>
      <strong>Check the encoding.</strong>
      <ul class="encoding-notes">{props.notes.map((n) => <li>{n}</li>)}</ul>
    </Notice>
  );
}

export interface MemberRow {
  readonly name: string;
  readonly role: string;
}

export interface DataPageProps {
  readonly frame: PageFrame;
  readonly studyId: number;
  readonly imports: readonly ImportRow[];
  readonly justImported?: number;
  readonly error?: string;
  readonly canEdit: boolean;
  readonly members?: readonly MemberRow[];
  readonly canShare: boolean;
  readonly declaredLanguages: string[];
  /** One line: whether uploads are checked for viruses. */
  readonly scanning?: string;
  readonly glossary?: GlossarySectionProps;
}

function bytes(n: number): string {
  return n < 1024 ? `${n} B` : n < 1048576 ? `${(n / 1024).toFixed(1)} KB` : `${(n / 1048576).toFixed(1)} MB`;
}

function entries(r: Record<string, number>): string {
  const e = Object.entries(r);
  return e.length ? e.map(([k, v]) => `${k} ${count(v)}`).join(', ') : '—';
}

export function DataPage(props: DataPageProps) {
  const base = `/studies/${props.studyId}`;
  const fresh = props.imports.find((i) => i.id === props.justImported);
  return (
    <Layout {...props.frame}>
      <h1>Data</h1>
      {fresh && (
        <Notice kind="ok">
          Imported {fresh.fileName}: {count(fresh.documents)} answers ({entries(fresh.perLanguage)}
          {fresh.undetermined > 0 && `, ${count(fresh.undetermined)} with undetermined language`}). Next: <a href={`${base}/languages`}>review the languages</a>.
        </Notice>
      )}
      {fresh && <EncodingNotes notes={fresh.encodingNotes} />}
      {props.error && <Notice kind="error">{props.error}</Notice>}
      <p class="lead">Declared languages: {props.declaredLanguages.length ? props.declaredLanguages.join(', ') : 'any language Themata knows'}.</p>
      {props.imports.length === 0 ? (
        <Notice>No files yet. Upload the answers below.</Notice>
      ) : (
        <table class="list" id="imports">
          <thead>
            <tr>
              <th scope="col">File</th>
              <th scope="col">Read as</th>
              <th scope="col" class="num">Size</th>
              <th scope="col">Text columns</th>
              <th scope="col" class="num">Answers</th>
              <th scope="col">By language</th>
              <th scope="col">Left out</th>
              <th scope="col">Imported</th>
              {props.canShare && <th scope="col">Actions</th>}
            </tr>
          </thead>
          <tbody>
            {props.imports.map((i) => (
              <tr>
                <td>{i.fileName}</td>
                <td>
                  {i.format.toUpperCase()}, {i.encoding}
                  {i.encodingConfidence !== undefined && i.encodingConfidence < 1 && <span class="hint"> (confidence {Math.round(100 * i.encodingConfidence)}%)</span>}
                  {i.encodingNotes && i.encodingNotes.length > 0 && (
                    <details>
                      <summary>{i.encodingNotes.length === 1 ? '1 encoding warning' : `${i.encodingNotes.length} encoding warnings`}</summary>
                      <ul>{i.encodingNotes.map((n) => <li>{n}</li>)}</ul>
                    </details>
                  )}
                </td>
                <td class="num">{bytes(i.size)}</td>
                <td>{i.textColumns.join(', ')}</td>
                <td class="num">{count(i.documents)}</td>
                <td>{entries(i.perLanguage)}</td>
                <td>{entries(i.excluded)}</td>
                <td>{when(i.createdAt)}</td>
                {props.canShare && <td><a href={`${base}/imports/${i.id}/delete`} aria-label={`Delete ${i.fileName}`}>Delete…</a></td>}
              </tr>
            ))}
          </tbody>
        </table>
      )}
      {props.canEdit && (
        <section class="panel">
          <h2>Add answers</h2>
          <form method="post" action={`${base}/data/upload`} enctype="multipart/form-data" class="stack" id="upload-form">
            <CsrfField csrf={props.frame.csrf} />
            <label>
              File <input type="file" name="file" required accept=".csv,.tsv,.txt,.jsonl,.ndjson,.xlsx,.sav" />
              <span class="hint">CSV or TSV (any delimiter, any common encoding), JSON Lines, Excel (.xlsx) or SPSS (.sav). The original file is kept with the study.</span>
            </label>
            <label>
              Sheet <input name="sheet" placeholder="first sheet" />
              <span class="hint">Excel only: the sheet to read.</span>
            </label>
            {props.scanning && <p class="hint" id="upload-scanning">{props.scanning}</p>}
            <button type="submit">Upload and choose columns</button>
          </form>
        </section>
      )}
      {props.glossary && <GlossarySection {...props.glossary} />}
      {props.members && (
        <section class="panel">
          <h2>People with access</h2>
          <ul>
            {props.members.map((m) => (
              <li>{m.name} ({m.role})</li>
            ))}
          </ul>
          {props.canShare && (
            <form method="post" action={`${base}/members`} class="row">
              <CsrfField csrf={props.frame.csrf} />
              <label>Account <input name="name" required /></label>
              <label>
                Role
                <select name="role">
                  <option value="viewer">can look</option>
                  <option value="editor">can change</option>
                  <option value="owner">owner</option>
                </select>
              </label>
              <button type="submit">Share</button>
            </form>
          )}
        </section>
      )}
      {props.canShare && (
        <section class="panel" id="delete-study">
          <h2>Delete this study</h2>
          <p class="hint">Removes every file, answer, run and result of the study from Themata; the next page lists what goes and asks you to confirm.</p>
          <a href={`${base}/delete`}>Delete this study…</a>
        </section>
      )}
      <Cautions weights={false} privacy />
    </Layout>
  );
}

/**
 * Columns in the preview of first rows: a screen's width; the mapping table lists every column,
 * so the page stays within about a megabyte at the 1,000-column import limit (common practice).
 */
export const PREVIEW_COLUMNS = 30;

export interface MappingColumn {
  readonly name: string;
  readonly role: string;
  readonly filled: number;
  readonly distinct: number;
  readonly examples: string[];
}

export function MappingPage(props: {
  frame: PageFrame;
  studyId: number;
  uploadKey: string;
  fileName: string;
  format: string;
  assumed: string;
  rows: number;
  /** Rows looked at for the suggestions. */
  sampled: number;
  columns: readonly MappingColumn[];
  roles: Record<string, string>;
  preview: readonly string[][];
  /** Encoding warnings about this file, before it is imported. */
  encodingNotes?: readonly string[];
  error?: string;
}) {
  return (
    <Layout {...props.frame}>
      <h1>Choose the columns</h1>
      <p class="lead">
        {props.fileName}: {props.format.toUpperCase()}, {count(props.rows)} rows. <strong>Read as:</strong> {props.assumed}. If the letters in the preview look wrong,
        save the file as UTF-8 and upload it again.
      </p>
      <EncodingNotes notes={props.encodingNotes} />
      {props.error && <Notice kind="error">{props.error}</Notice>}
      <form method="post" action={`/studies/${props.studyId}/data/import`} class="stack" id="mapping-form">
        <CsrfField csrf={props.frame.csrf} />
        <input type="hidden" name="upload" value={props.uploadKey} />
        <table class="list mapping">
          <thead>
            <tr>
              <th scope="col">Column</th>
              <th scope="col">Use as</th>
              <th scope="col" class="num">{props.sampled < props.rows ? `Filled (first ${count(props.sampled)} rows)` : 'Filled'}</th>
              <th scope="col" class="num">Distinct</th>
              <th scope="col">Examples</th>
            </tr>
          </thead>
          <tbody>
            {props.columns.map((c, j) => (
              <tr>
                <th scope="row">{c.name}</th>
                <td>
                  <select name={`role-${j}`} aria-label={`Use of column ${c.name}`}>
                    {Object.entries(props.roles).map(([value, label]) => (
                      <option value={value} selected={value === c.role}>{label}</option>
                    ))}
                  </select>
                </td>
                <td class="num">{count(c.filled)}</td>
                <td class="num">{count(c.distinct)}</td>
                <td class="examples">{c.examples.join(' · ')}</td>
              </tr>
            ))}
          </tbody>
        </table>
        <p class="hint">
          Several answer-text columns become several answers per row, told apart by a <code>question</code> group. A link key joins answers that say the same
          thing in different languages (translations, or one respondent's answers), so they share one theme mix.
        </p>
        <button type="submit">Import these answers</button>
      </form>
      <h2>First rows</h2>
      {props.columns.length > PREVIEW_COLUMNS && (
        <p class="hint" id="preview-columns">The first {PREVIEW_COLUMNS} of {count(props.columns.length)} columns; every column is listed above.</p>
      )}
      <div class="scroll">
        <table class="list preview">
          <thead>
            <tr>{props.columns.slice(0, PREVIEW_COLUMNS).map((c) => <th scope="col">{c.name}</th>)}</tr>
          </thead>
          <tbody>
            {props.preview.map((r) => (
              <tr>{r.slice(0, PREVIEW_COLUMNS).map((v) => <td>{v.length > 120 ? `${v.slice(0, 117)}…` : v}</td>)}</tr>
            ))}
          </tbody>
        </table>
      </div>
    </Layout>
  );
}
