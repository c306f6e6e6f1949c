// Deleting for good: a deletion overwrites what it removes and leaves no copy in the write-ahead
// log. SQLite keeps the pages a DELETE frees (in the file's free list, or as unused space inside
// a page) with their old bytes until they are reused or the file is vacuumed; with
// `PRAGMA secure_delete = ON` it writes zeros over deleted content instead (SQLite documentation,
// "PRAGMA secure_delete"). The pragma belongs to the connection, so it is turned on for the
// deletion only and put back afterwards; the WAL is then checkpointed and truncated so the old
// page images in it do not outlive the deletion (SQLite documentation, "PRAGMA wal_checkpoint").
import { inTransaction, type Store } from './database.js';

export interface EraseOutcome<T> {
  readonly value: T;
  /** False when another connection was reading, so the WAL could not be emptied yet (it is at the next checkpoint). */
  readonly walTruncated: boolean;
}

/** Run `fn` (deletions) in one transaction with secure_delete on, then truncate the WAL. */
export function eraseInTransaction<T>(store: Store, fn: () => T): EraseOutcome<T> {
  const db = store.db;
  const before = Number(db.pragma('secure_delete', { simple: true }));
  db.pragma('secure_delete = ON');
  let value: T;
  try {
    value = inTransaction(store, fn);
  } finally {
    db.pragma(`secure_delete = ${before === 1 ? 'ON' : before === 2 ? 'FAST' : 'OFF'}`);
  }
  let walTruncated = false;
  if (!db.inTransaction) {
    const [row] = db.pragma('wal_checkpoint(TRUNCATE)') as { busy: number; log: number; checkpointed: number }[];
    walTruncated = row !== undefined && row.busy === 0;
  }
  return { value, walTruncated };
}

/** Rewrite the whole data file from its live rows (VACUUM), so no free page keeps old bytes; then empty the WAL. */
export function vacuumStore(store: Store): void {
  // SQLite documentation, "VACUUM": the database is rebuilt into a new file with no free pages.
  store.db.exec('VACUUM');
  store.db.pragma('wal_checkpoint(TRUNCATE)');
}
