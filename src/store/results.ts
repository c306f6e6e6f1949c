// Results of a finished run: named typed arrays (topic-word counts, group mixtures, α, λ…) and
// JSON values (diagnostics, corpus layout), stored one row per key so a page reads only what it
// shows. Theme labels and exported files live beside them.
import { float32FromBlob, float64FromBlob, int32FromBlob, toBlob, uint16FromBlob, uint8FromBlob } from './blobs.js';
import { inTransaction, now, type Store } from './database.js';

export type ResultValue = Float64Array | Float32Array | Int32Array | Uint16Array | Uint8Array | { json: unknown };

export interface StoredResult {
  readonly value: ResultValue;
  /** Dimensions, e.g. [K, V] for a row-major matrix; [] when not given. */
  readonly shape: number[];
}

type Kind = 'f64' | 'f32' | 'i32' | 'u16' | 'u8' | 'json';

function kindOf(v: ResultValue): Kind {
  if (v instanceof Float64Array) return 'f64';
  if (v instanceof Float32Array) return 'f32';
  if (v instanceof Int32Array) return 'i32';
  if (v instanceof Uint16Array) return 'u16';
  if (v instanceof Uint8Array) return 'u8';
  return 'json';
}

function decode(kind: Kind, bytes: Buffer): ResultValue {
  switch (kind) {
    case 'f64': return float64FromBlob(bytes);
    case 'f32': return float32FromBlob(bytes);
    case 'i32': return int32FromBlob(bytes);
    case 'u16': return uint16FromBlob(bytes);
    case 'u8': return uint8FromBlob(bytes);
    default: return { json: JSON.parse(bytes.toString('utf8')) };
  }
}

/** Write several results of a run (replacing keys that exist) in one transaction. */
export function saveResults(store: Store, runId: number, entries: Record<string, ResultValue | StoredResult>): void {
  const stmt = store.db.prepare('INSERT OR REPLACE INTO run_results (run_id, key, kind, shape, bytes) VALUES (?, ?, ?, ?, ?)');
  inTransaction(store, () => {
    for (const [key, entry] of Object.entries(entries)) {
      const { value, shape } = 'value' in entry && 'shape' in entry ? (entry as StoredResult) : { value: entry as ResultValue, shape: [] as number[] };
      const kind = kindOf(value);
      const bytes = kind === 'json' ? Buffer.from(JSON.stringify((value as { json: unknown }).json), 'utf8') : toBlob(value as ArrayBufferView);
      stmt.run(runId, key, kind, JSON.stringify(shape), bytes);
    }
  });
}

/** One result, or undefined. */
export function loadResult(store: Store, runId: number, key: string): StoredResult | undefined {
  const row = store.db.prepare('SELECT kind, shape, bytes FROM run_results WHERE run_id = ? AND key = ?').get(runId, key) as { kind: Kind; shape: string; bytes: Buffer } | undefined;
  return row ? { value: decode(row.kind, row.bytes), shape: JSON.parse(row.shape) as number[] } : undefined;
}

/** A JSON result's value, or undefined. */
export function loadJsonResult<T>(store: Store, runId: number, key: string): T | undefined {
  const r = loadResult(store, runId, key);
  return r && 'json' in r.value ? (r.value.json as T) : undefined;
}

/** Every result of a run, keyed. */
export function loadResults(store: Store, runId: number): Record<string, StoredResult> {
  const rows = store.db.prepare('SELECT key, kind, shape, bytes FROM run_results WHERE run_id = ?').all(runId) as { key: string; kind: Kind; shape: string; bytes: Buffer }[];
  return Object.fromEntries(rows.map((r) => [r.key, { value: decode(r.kind, r.bytes), shape: JSON.parse(r.shape) as number[] }]));
}

export function listResultKeys(store: Store, runId: number): string[] {
  return (store.db.prepare('SELECT key FROM run_results WHERE run_id = ? ORDER BY key').all(runId) as { key: string }[]).map((r) => r.key);
}

/** Theme labels of a run (theme index → label); unlabelled themes are absent. */
export function getThemeLabels(store: Store, runId: number): Map<number, string> {
  const rows = store.db.prepare('SELECT theme, label FROM theme_labels WHERE run_id = ?').all(runId) as { theme: number; label: string }[];
  return new Map(rows.map((r) => [r.theme, r.label]));
}

/** Set (or with an empty label, clear) one theme's label. */
export function setThemeLabel(store: Store, runId: number, theme: number, label: string): void {
  const trimmed = label.trim();
  if (!trimmed) store.db.prepare('DELETE FROM theme_labels WHERE run_id = ? AND theme = ?').run(runId, theme);
  else store.db.prepare('INSERT OR REPLACE INTO theme_labels (run_id, theme, label) VALUES (?, ?, ?)').run(runId, theme, trimmed);
}

/** Set many labels in one transaction. */
export function setThemeLabels(store: Store, runId: number, labels: ReadonlyMap<number, string> | Record<number, string>): void {
  const entries = labels instanceof Map ? [...labels.entries()] : Object.entries(labels).map(([k, v]) => [Number(k), v] as [number, string]);
  inTransaction(store, () => {
    for (const [theme, label] of entries) setThemeLabel(store, runId, theme, label);
  });
}

export interface RunExport {
  readonly id: number;
  readonly runId: number;
  readonly fileName: string;
  readonly mediaType: string;
  readonly size: number;
  readonly createdAt: string;
}

export function saveRunExport(store: Store, runId: number, fileName: string, mediaType: string, bytes: Uint8Array): number {
  return Number(
    store.db.prepare('INSERT INTO run_exports (run_id, file_name, media_type, bytes, created_at) VALUES (?, ?, ?, ?, ?)').run(runId, fileName, mediaType, Buffer.from(bytes), now()).lastInsertRowid,
  );
}

export function listRunExports(store: Store, runId: number): RunExport[] {
  return store.db
    .prepare('SELECT id, run_id AS runId, file_name AS fileName, media_type AS mediaType, length(bytes) AS size, created_at AS createdAt FROM run_exports WHERE run_id = ? ORDER BY id DESC')
    .all(runId) as RunExport[];
}

export function getRunExportBytes(store: Store, exportId: number): { fileName: string; mediaType: string; bytes: Uint8Array } | undefined {
  const row = store.db.prepare('SELECT file_name, media_type, bytes FROM run_exports WHERE id = ?').get(exportId) as { file_name: string; media_type: string; bytes: Buffer } | undefined;
  return row ? { fileName: row.file_name, mediaType: row.media_type, bytes: new Uint8Array(row.bytes) } : undefined;
}
