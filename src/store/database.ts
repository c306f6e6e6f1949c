// Opening the study database: one SQLite file per data folder, WAL journal so the workbench can
// read while a fit writes, foreign keys on, and a busy timeout so short write contention between
// the server and worker threads waits instead of failing.
import { mkdirSync } from 'node:fs';
import { join, resolve } from 'node:path';
import Database from 'better-sqlite3';
import { migrate } from './migrations.js';

export const DATABASE_FILE = 'themata.sqlite';

export interface Store {
  readonly db: Database.Database;
  /** Absolute data folder. */
  readonly dataDir: string;
  /** Absolute path of the SQLite file. */
  readonly file: string;
  close(): void;
}

export interface OpenStoreOptions {
  /** Milliseconds to wait for a lock held by another connection (default 10 s, common practice). */
  busyTimeoutMs?: number;
  readonly?: boolean;
}

/** Open (creating if missing) the data folder's database and bring its schema up to date. */
export function openStore(dataDir: string, options: OpenStoreOptions = {}): Store {
  const dir = resolve(dataDir);
  mkdirSync(dir, { recursive: true });
  const file = join(dir, DATABASE_FILE);
  const db = new Database(file, { readonly: options.readonly ?? false });
  db.pragma(`busy_timeout = ${Math.max(0, Math.floor(options.busyTimeoutMs ?? 10_000))}`);
  if (!options.readonly) db.pragma('journal_mode = WAL');
  db.pragma('foreign_keys = ON');
  // NORMAL is durable in WAL mode except for the last commits on power loss (SQLite docs, "WAL").
  db.pragma('synchronous = NORMAL');
  // Deleted answers must not linger in free pages: zeros are written over deleted and rewritten
  // content (SQLite documentation, "PRAGMA secure_delete"); imports of 20,000 answers measured no
  // slower beyond noise on two cores (see erase.ts and SECURITY.md V8.3.2).
  db.pragma('secure_delete = ON');
  // SQLite's lower() folds ASCII only; answers are multilingual, so searches use JavaScript's
  // Unicode case mapping.
  db.function('unicode_lower', { deterministic: true }, (value: unknown) => (typeof value === 'string' ? value.toLowerCase() : value));
  if (!options.readonly) migrate(db);
  let closed = false;
  return {
    db,
    dataDir: dir,
    file,
    close() {
      if (closed) return;
      closed = true;
      db.close();
    },
  };
}

/** Run `fn` in one transaction: everything or nothing is written (nested calls use savepoints). */
export function inTransaction<T>(store: Store, fn: () => T): T {
  return store.db.transaction(fn)();
}

export function now(): string {
  return new Date().toISOString();
}

/** True for SQLite's "database is locked/busy" errors (another connection holds the write lock). */
export function isBusyError(error: unknown): boolean {
  const code = (error as { code?: unknown } | null)?.code;
  return code === 'SQLITE_BUSY' || code === 'SQLITE_LOCKED' || code === 'SQLITE_BUSY_SNAPSHOT';
}

/**
 * Run `fn`, retrying while another connection keeps the database busy beyond the busy timeout
 * (a long import while a fit finishes), with doubling pauses up to `maxWaitMs` in total.
 */
export function withBusyRetry<T>(fn: () => T, maxWaitMs = 10 * 60_000): T {
  const start = Date.now();
  let pause = 100;
  for (;;) {
    try {
      return fn();
    } catch (error) {
      if (!isBusyError(error) || Date.now() - start > maxWaitMs) throw error;
      Atomics.wait(new Int32Array(new SharedArrayBuffer(4)), 0, 0, pause);
      pause = Math.min(pause * 2, 5_000);
    }
  }
}
