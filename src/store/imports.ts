// Imports keep the uploaded file exactly as it came (bytes + SHA-256) with the mapping used, so
// nothing a user uploaded is lost or needs uploading again (docs/design.md §3).
import { createHash } from 'node:crypto';
import type { ColumnMapping, TableFormat } from '../text/index.js';
import { inTransaction, now, type Store } from './database.js';

/** What an import holds: answers, or a glossary (its rows are link groups of tiny documents, never answers). */
export type ImportKind = 'answers' | 'glossary';

export interface ImportRecord {
  readonly id: number;
  readonly kind: ImportKind;
  readonly studyId: number;
  readonly fileName: string;
  readonly format: TableFormat;
  readonly size: number;
  readonly sha256: string;
  readonly encoding: string;
  readonly mapping: ColumnMapping;
  /** The import summary as shown after importing (services' ImportSummary). */
  readonly summary: Record<string, unknown>;
  readonly createdAt: string;
  readonly documents: number;
}

interface ImportRow {
  id: number;
  kind: ImportKind;
  study_id: number;
  file_name: string;
  format: TableFormat;
  size: number;
  sha256: string;
  encoding: string;
  mapping: string;
  summary: string;
  created_at: string;
  documents: number;
}

function toImport(row: ImportRow): ImportRecord {
  return {
    id: row.id,
    kind: row.kind,
    studyId: row.study_id,
    fileName: row.file_name,
    format: row.format,
    size: row.size,
    sha256: row.sha256,
    encoding: row.encoding,
    mapping: JSON.parse(row.mapping) as ColumnMapping,
    summary: JSON.parse(row.summary) as Record<string, unknown>,
    createdAt: row.created_at,
    documents: row.documents,
  };
}

export function sha256Hex(bytes: Uint8Array): string {
  return createHash('sha256').update(bytes).digest('hex');
}

export function insertImport(
  store: Store,
  input: { studyId: number; fileName: string; format: TableFormat; bytes: Uint8Array; encoding: string; mapping: ColumnMapping; kind?: ImportKind },
): number {
  const info = store.db
    .prepare('INSERT INTO imports (study_id, kind, file_name, format, size, sha256, original, encoding, mapping, created_at) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?)')
    .run(input.studyId, input.kind ?? 'answers', input.fileName, input.format, input.bytes.byteLength, sha256Hex(input.bytes), Buffer.from(input.bytes), input.encoding, JSON.stringify(input.mapping), now());
  return Number(info.lastInsertRowid);
}

export function setImportSummary(store: Store, importId: number, summary: object): void {
  store.db.prepare('UPDATE imports SET summary = ? WHERE id = ?').run(JSON.stringify(summary), importId);
}

const SELECT = `SELECT i.id, i.kind, i.study_id, i.file_name, i.format, i.size, i.sha256, i.encoding, i.mapping, i.summary, i.created_at,
  (SELECT COUNT(*) FROM documents d WHERE d.import_id = i.id) AS documents FROM imports i`;

/** Every import of a study (answers and glossaries; see `kind`), in import order. */
export function listImports(store: Store, studyId: number, kind?: ImportKind): ImportRecord[] {
  const rows = kind === undefined
    ? store.db.prepare(`${SELECT} WHERE i.study_id = ? ORDER BY i.id`).all(studyId)
    : store.db.prepare(`${SELECT} WHERE i.study_id = ? AND i.kind = ? ORDER BY i.id`).all(studyId, kind);
  return (rows as ImportRow[]).map(toImport);
}

export function getImport(store: Store, importId: number): ImportRecord | undefined {
  const row = store.db.prepare(`${SELECT} WHERE i.id = ?`).get(importId) as ImportRow | undefined;
  return row ? toImport(row) : undefined;
}

/** The original uploaded bytes. */
export function getImportBytes(store: Store, importId: number): Uint8Array | undefined {
  const row = store.db.prepare('SELECT original FROM imports WHERE id = ?').get(importId) as { original: Buffer } | undefined;
  return row ? new Uint8Array(row.original) : undefined;
}

/** Delete an import with its answers (ON DELETE CASCADE) in one transaction. */
export function deleteImport(store: Store, importId: number): void {
  inTransaction(store, () => {
    store.db.prepare('DELETE FROM imports WHERE id = ?').run(importId);
  });
}

/** Ids of an import's answers, in id order. */
export function importDocumentIds(store: Store, importId: number): number[] {
  return (store.db.prepare('SELECT id FROM documents WHERE import_id = ? ORDER BY id').all(importId) as { id: number }[]).map((r) => r.id);
}
