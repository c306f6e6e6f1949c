// Runs: one fit each, with settings, status, live progress and error; plus checkpoints.
// A running run records which process runs it (process id and host name) and a heartbeat, so a
// run left 'running' by a process that was killed can be told from one still being fitted.
import { hostname } from 'node:os';
import { inTransaction, now, type Store } from './database.js';

export type RunStatus = 'queued' | 'running' | 'interrupted' | 'cancelled' | 'failed' | 'finished';

/** Settings of a fit as the user chose them (docs/design.md §3). */
export interface RunSettings {
  themes: number;
  sweeps: number;
  burnIn: number;
  seed: number;
  threads: number;
  covariates: string[];
  holdout: number;
  /** Anything else (optimizer intervals, prior variances, sampler choice). */
  [key: string]: unknown;
}

/** Progress as reported during a fit. */
export interface RunProgress {
  sweep?: number;
  sweeps?: number;
  tokensPerSecond?: number;
  logLikelihoodPerToken?: number;
  secondsLeft?: number;
  /** Per-sweep trace of log-likelihood per token (kept short by the writer). */
  trace?: number[];
  phase?: string;
  [key: string]: unknown;
}

export interface Run {
  readonly id: number;
  readonly studyId: number;
  readonly name: string;
  readonly settings: RunSettings;
  readonly status: RunStatus;
  readonly progress: RunProgress;
  readonly error: string | null;
  readonly createdAt: string;
  readonly startedAt: string | null;
  readonly finishedAt: string | null;
  /** Process running the fit (set when it turned 'running'); null for runs never started. */
  readonly ownerPid: number | null;
  readonly ownerHost: string | null;
  /** Last sign of life of the fitting process (status change or progress write). */
  readonly heartbeatAt: string | null;
}

interface RunRow {
  id: number;
  study_id: number;
  name: string;
  settings: string;
  status: RunStatus;
  progress: string;
  error: string | null;
  created_at: string;
  started_at: string | null;
  finished_at: string | null;
  owner_pid: number | null;
  owner_host: string | null;
  heartbeat_at: string | null;
}

function toRun(r: RunRow): Run {
  return {
    id: r.id,
    studyId: r.study_id,
    name: r.name,
    settings: JSON.parse(r.settings) as RunSettings,
    status: r.status,
    progress: JSON.parse(r.progress) as RunProgress,
    error: r.error,
    createdAt: r.created_at,
    startedAt: r.started_at,
    finishedAt: r.finished_at,
    ownerPid: r.owner_pid,
    ownerHost: r.owner_host,
    heartbeatAt: r.heartbeat_at,
  };
}

export function createRun(store: Store, input: { studyId: number; name: string; settings: RunSettings; status?: RunStatus }): Run {
  const info = store.db
    .prepare('INSERT INTO runs (study_id, name, settings, status, created_at) VALUES (?, ?, ?, ?, ?)')
    .run(input.studyId, input.name, JSON.stringify(input.settings), input.status ?? 'queued', now());
  return getRun(store, Number(info.lastInsertRowid))!;
}

export function getRun(store: Store, id: number): Run | undefined {
  const row = store.db.prepare('SELECT * FROM runs WHERE id = ?').get(id) as RunRow | undefined;
  return row ? toRun(row) : undefined;
}

export function getRunByName(store: Store, studyId: number, name: string): Run | undefined {
  const row = store.db.prepare('SELECT * FROM runs WHERE study_id = ? AND name = ?').get(studyId, name) as RunRow | undefined;
  return row ? toRun(row) : undefined;
}

export function listRuns(store: Store, studyId: number): Run[] {
  return (store.db.prepare('SELECT * FROM runs WHERE study_id = ? ORDER BY id DESC').all(studyId) as RunRow[]).map(toRun);
}

/** Runs in any of `statuses`, across studies, oldest first (the job queue's view). */
export function listRunsByStatus(store: Store, statuses: readonly RunStatus[]): Run[] {
  return (store.db.prepare('SELECT * FROM runs WHERE status IN (SELECT value FROM json_each(?)) ORDER BY id').all(JSON.stringify(statuses)) as RunRow[]).map(toRun);
}

/** A run name not yet used in the study: `base`, `base-2`, `base-3`… */
export function uniqueRunName(store: Store, studyId: number, base: string): string {
  let name = base;
  for (let i = 2; getRunByName(store, studyId, name); i++) name = `${base}-${i}`;
  return name;
}

/**
 * Change status; sets started_at on 'running' (first time) and finished_at on terminal states.
 * Turning 'running' records this process (id and host name) as the run's owner and beats its heart.
 * With `from`, the change is made only while the run is in one of those statuses (one guarded
 * UPDATE, so a late "cancelled" cannot overwrite a run that has just finished). Returns whether
 * the run changed.
 */
export function setRunStatus(store: Store, id: number, status: RunStatus, error: string | null = null, options: { from?: readonly RunStatus[] } = {}): boolean {
  const t = now();
  const terminal = status === 'finished' || status === 'failed' || status === 'cancelled';
  const running = status === 'running' ? 1 : 0;
  const guard = options.from ? ' AND status IN (SELECT value FROM json_each(?))' : '';
  const params: unknown[] = [status, error, running, t, terminal ? 1 : 0, t, running, process.pid, running, hostname(), t, id];
  if (options.from) params.push(JSON.stringify(options.from));
  const info = store.db
    .prepare(
      `UPDATE runs SET status = ?, error = ?, started_at = CASE WHEN ? AND started_at IS NULL THEN ? ELSE started_at END,
       finished_at = CASE WHEN ? THEN ? ELSE NULL END,
       owner_pid = CASE WHEN ? THEN ? ELSE owner_pid END, owner_host = CASE WHEN ? THEN ? ELSE owner_host END,
       heartbeat_at = ? WHERE id = ?${guard}`,
    )
    .run(...params);
  return info.changes > 0;
}

/** Store progress; also the run's heartbeat. */
export function setRunProgress(store: Store, id: number, progress: RunProgress): void {
  store.db.prepare('UPDATE runs SET progress = ?, heartbeat_at = ? WHERE id = ?').run(JSON.stringify(progress), now(), id);
}

/** A sign of life from the process fitting the run, without new progress. */
export function touchRunHeartbeat(store: Store, id: number): void {
  store.db.prepare('UPDATE runs SET heartbeat_at = ? WHERE id = ?').run(now(), id);
}

/** A heartbeat older than this means the fitting process is gone (two minutes; common practice). */
export const RUN_HEARTBEAT_STALE_MS = 2 * 60_000;

/** Why a 'running' run is taken as abandoned, or null while its process looks alive. */
export function abandonedReason(run: Run, options: { nowMs?: number; staleMs?: number; host?: string; isAlive?: (pid: number) => boolean } = {}): string | null {
  if (run.status !== 'running') return null;
  const host = options.host ?? hostname();
  const alive = options.isAlive ?? processIsAlive;
  if (run.ownerPid !== null && run.ownerHost === host && !alive(run.ownerPid)) return `its process (${run.ownerPid} on ${host}) has ended`;
  const beat = Date.parse(run.heartbeatAt ?? run.startedAt ?? run.createdAt);
  const staleMs = options.staleMs ?? RUN_HEARTBEAT_STALE_MS;
  const ageMs = (options.nowMs ?? Date.now()) - beat;
  if (!Number.isFinite(beat) || ageMs > staleMs) return `it has given no sign of life for ${Number.isFinite(ageMs) ? Math.round(ageMs / 1000) : '?'} s`;
  return null;
}

/** Whether process `pid` exists on this host (signal 0 tests without sending anything). */
export function processIsAlive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (error) {
    // EPERM: the process exists but belongs to another user.
    return (error as NodeJS.ErrnoException).code === 'EPERM';
  }
}

/**
 * Mark a 'running' run 'interrupted' when abandonedReason() says its process is gone; returns the
 * reason, or null (and changes nothing) when the run is not running or still looks alive.
 */
export function interruptIfAbandoned(store: Store, id: number, options: Parameters<typeof abandonedReason>[1] = {}): string | null {
  return inTransaction(store, () => {
    const run = getRun(store, id);
    const reason = run ? abandonedReason(run, options) : null;
    if (reason) store.db.prepare("UPDATE runs SET status = 'interrupted' WHERE id = ? AND status = 'running'").run(id);
    return reason;
  });
}

/**
 * Store a finished fit's final progress and status 'finished' (call inside the transaction that
 * stores its results, so a kill never leaves results without the status or the status without
 * results).
 */
export function markRunFinished(store: Store, id: number, progress: RunProgress): void {
  const t = now();
  store.db
    .prepare("UPDATE runs SET status = 'finished', error = NULL, progress = ?, finished_at = ?, heartbeat_at = ? WHERE id = ?")
    .run(JSON.stringify(progress), t, t, id);
}

/**
 * Every run left 'running' becomes 'interrupted', whoever runs it. Only for a data folder no
 * other process can be using; a starting server uses interruptAbandonedRuns instead.
 */
export function markRunningAsInterrupted(store: Store): number {
  return store.db.prepare("UPDATE runs SET status = 'interrupted' WHERE status = 'running'").run().changes;
}

/**
 * On start-up: runs left 'running' whose process is gone or whose heartbeat is stale become
 * 'interrupted'; a run a live `themata fit` (or another workbench) is still fitting is left alone.
 * Returns the runs interrupted, with the reason.
 */
export function interruptAbandonedRuns(store: Store, options: Parameters<typeof abandonedReason>[1] = {}): { runId: number; reason: string }[] {
  const out: { runId: number; reason: string }[] = [];
  for (const run of listRunsByStatus(store, ['running'])) {
    const reason = interruptIfAbandoned(store, run.id, options);
    if (reason) out.push({ runId: run.id, reason });
  }
  return out;
}

export function renameRun(store: Store, id: number, name: string): void {
  store.db.prepare('UPDATE runs SET name = ? WHERE id = ?').run(name, id);
}

/** Delete a run with its checkpoints, results, theme labels and exported files (ON DELETE CASCADE), in one transaction. */
export function deleteRun(store: Store, id: number): void {
  inTransaction(store, () => store.db.prepare('DELETE FROM runs WHERE id = ?').run(id));
}

/** What deleting runs removes: the runs and the rows that hang on them. */
export interface RunContents {
  readonly runs: number;
  readonly checkpoints: number;
  readonly results: number;
  readonly labels: number;
  readonly exports: number;
}

/** Rows that deleting `runIds` would remove, counted per table. */
export function runContents(store: Store, runIds: readonly number[]): RunContents {
  const ids = JSON.stringify(runIds);
  const n = (table: string, column = 'run_id') =>
    (store.db.prepare(`SELECT COUNT(*) AS n FROM ${table} WHERE ${column} IN (SELECT value FROM json_each(?))`).get(ids) as { n: number }).n;
  return { runs: n('runs', 'id'), checkpoints: n('run_checkpoints'), results: n('run_results'), labels: n('theme_labels'), exports: n('run_exports') };
}

/** Bytes per stored part of a checkpoint: well under the ~512 MB better-sqlite3 binds in one value. */
export const CHECKPOINT_PART_BYTES = 128 * 1024 * 1024;

/**
 * Save a checkpoint; keeps only the newest `keep` checkpoints of the run (two by default, so a
 * crash while writing one leaves the previous; common practice). One transaction. Checkpoints
 * larger than CHECKPOINT_PART_BYTES are stored in parts (migration 4).
 */
export function saveCheckpoint(store: Store, runId: number, sweep: number, bytes: Uint8Array, keep = 2, partBytes = CHECKPOINT_PART_BYTES): void {
  const part = (i: number) => {
    const start = i * partBytes;
    const view = bytes.subarray(start, Math.min(bytes.byteLength, start + partBytes));
    return Buffer.from(view.buffer, view.byteOffset, view.byteLength);
  };
  const parts = Math.max(1, Math.ceil(bytes.byteLength / partBytes));
  inTransaction(store, () => {
    // A checkpoint of the same sweep (a resumed run repeating it) goes, with its parts (ON DELETE CASCADE).
    store.db.prepare('DELETE FROM run_checkpoints WHERE run_id = ? AND sweep = ?').run(runId, sweep);
    store.db.prepare('INSERT INTO run_checkpoints (run_id, sweep, bytes, created_at) VALUES (?, ?, ?, ?)').run(runId, sweep, part(0), now());
    const insertPart = store.db.prepare('INSERT INTO run_checkpoint_parts (run_id, sweep, part, bytes) VALUES (?, ?, ?, ?)');
    for (let i = 1; i < parts; i++) insertPart.run(runId, sweep, i, part(i));
    store.db
      .prepare('DELETE FROM run_checkpoints WHERE run_id = ? AND sweep NOT IN (SELECT sweep FROM run_checkpoints WHERE run_id = ? ORDER BY sweep DESC LIMIT ?)')
      .run(runId, runId, Math.max(1, keep));
  });
}

export function latestCheckpoint(store: Store, runId: number): { sweep: number; bytes: Uint8Array } | undefined {
  return inTransaction(store, () => {
    const row = store.db.prepare('SELECT sweep, bytes FROM run_checkpoints WHERE run_id = ? ORDER BY sweep DESC LIMIT 1').get(runId) as { sweep: number; bytes: Buffer } | undefined;
    if (!row) return undefined;
    const rest = store.db.prepare('SELECT bytes FROM run_checkpoint_parts WHERE run_id = ? AND sweep = ? ORDER BY part').all(runId, row.sweep) as { bytes: Buffer }[];
    if (rest.length === 0) return { sweep: row.sweep, bytes: new Uint8Array(row.bytes) };
    const all = Buffer.concat([row.bytes, ...rest.map((r) => r.bytes)]);
    return { sweep: row.sweep, bytes: new Uint8Array(all.buffer, all.byteOffset, all.byteLength) };
  });
}

export function clearCheckpoints(store: Store, runId: number): void {
  store.db.prepare('DELETE FROM run_checkpoints WHERE run_id = ?').run(runId);
}
