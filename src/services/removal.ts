// Deleting a study, one import or one run (OWASP ASVS 4.0.3 V8.3.2: users can remove their data).
// Each deletion is planned first (what it removes, counted, and what would stop it), so the
// workbench's confirmation page and `themata remove-* ` without --yes say exactly what goes. The
// deletion itself is one transaction with secure_delete on (store's eraseInTransaction); the
// foreign keys' ON DELETE CASCADE removes every row that hangs on what is deleted.
//
// A fit still running is stopped first when it runs in this process (the workbench's queue);
// one a live process elsewhere is fitting (`themata fit`, another workbench) is not touched, and
// the deletion is refused until it stops, so a worker never writes into a run that is gone.
//
// An import is refused while a run was fitted on its answers, rather than taking those runs with
// it: results someone relies on should only go when they are asked for by name, and each run's
// own confirmation then lists what it removes.
import {
  abandonedReason,
  deleteImport,
  deleteRun,
  deleteStudy,
  eraseInTransaction,
  getImport,
  getRun,
  getStudy,
  importDocumentIds,
  listRuns,
  loadResult,
  runContents,
  studyContents,
  type ImportRecord,
  type Run,
  type RunContents,
  type Store,
  type Study,
  type StudyContents,
} from '../store/index.js';
import { InputError } from '../text/index.js';
import { rebuildVocabulary } from './vocabulary.js';

/** What can stop fits running in this process before their runs are deleted (the job queue). */
export interface FitStopper {
  isActive(runId: number): boolean;
  release(runIds: readonly number[]): Promise<void>;
  unhold(runIds: readonly number[]): void;
}

export interface StudyRemovalPlan {
  readonly study: Study;
  readonly contents: StudyContents;
  /** Runs queued or running now: they are cancelled first. */
  readonly stopping: string[];
  /** Why the deletion cannot be done now, or null. */
  readonly refusal: string | null;
}

export interface RunRemovalPlan {
  readonly study: Study;
  readonly run: Run;
  readonly contents: RunContents;
  readonly stopping: boolean;
  readonly refusal: string | null;
}

export interface ImportRemovalPlan {
  readonly study: Study;
  readonly record: ImportRecord;
  /** Runs fitted on (or fitting, or resumable on) this import's answers. */
  readonly usedBy: string[];
  readonly refusal: string | null;
}

export interface RemovalOutcome {
  /** One plain sentence saying what was deleted. */
  readonly message: string;
  /** False when another connection was reading and the WAL keeps old pages until its next checkpoint. */
  readonly walTruncated: boolean;
}

/** 532 bytes, 12.3 kB, 4.5 MB (decimal units, as file managers show them). */
export function formatBytes(n: number): string {
  if (n < 1000) return `${n} byte${n === 1 ? '' : 's'}`;
  if (n < 1e6) return `${(n / 1e3).toFixed(1)} kB`;
  return `${(n / 1e6).toFixed(1)} MB`;
}

function plural(n: number, one: string, many = `${one}s`): string {
  return `${n.toLocaleString('en')} ${n === 1 ? one : many}`;
}

/** A run another live process is fitting: it cannot be stopped from here. */
function fittedElsewhere(run: Run, stopper: FitStopper | undefined): string | null {
  if (run.status !== 'running' || stopper?.isActive(run.id)) return null;
  if (abandonedReason(run) !== null) return null;
  const owner = run.ownerPid !== null ? ` by process ${run.ownerPid} on ${run.ownerHost}` : '';
  return `Run "${run.name}" is being fitted${owner}. Stop that fit first (Ctrl+C in its terminal, or Cancel in the workbench that runs it), then delete again.`;
}

function requireStudyById(store: Store, studyId: number): Study {
  const study = getStudy(store, studyId);
  if (!study) throw new InputError('There is no such study (it may have been deleted already).');
  return study;
}

export function planStudyRemoval(store: Store, studyId: number, stopper?: FitStopper): StudyRemovalPlan {
  const study = requireStudyById(store, studyId);
  const runs = listRuns(store, studyId);
  return {
    study,
    contents: studyContents(store, studyId),
    stopping: runs.filter((r) => r.status === 'queued' || r.status === 'running').map((r) => r.name),
    refusal: runs.map((r) => fittedElsewhere(r, stopper)).find((m) => m !== null) ?? null,
  };
}

/** "2 files (1.2 MB kept), 4,000 answers, …" */
export function describeStudyContents(c: StudyContents): string {
  return [
    `${plural(c.imports, 'imported file')} (${formatBytes(c.originalBytes)} of original files)`,
    plural(c.answers, 'answer'),
    `${plural(c.vocabularyWords, 'vocabulary word')} and ${plural(c.ownWords, 'own stop word')}`,
    `${plural(c.runs, 'run')} with ${plural(c.results, 'stored result')}, ${plural(c.checkpoints, 'checkpoint')}, ${plural(c.labels, 'theme label')} and ${plural(c.exports, 'exported file')}`,
    plural(c.members, 'membership', 'memberships'),
  ].join(', ');
}

export function describeRunContents(c: RunContents): string {
  return `${plural(c.results, 'stored result')}, ${plural(c.checkpoints, 'checkpoint')}, ${plural(c.labels, 'theme label')} and ${plural(c.exports, 'exported file')}`;
}

/** Delete a study and everything in it. Fits of its runs running here are stopped first. */
export async function removeStudy(store: Store, studyId: number, stopper?: FitStopper): Promise<RemovalOutcome> {
  const plan = planStudyRemoval(store, studyId, stopper);
  if (plan.refusal) throw new InputError(plan.refusal);
  const ids = listRuns(store, studyId).map((r) => r.id);
  await stopper?.release(ids);
  try {
    const { value, walTruncated } = eraseInTransaction(store, () => {
      // Checked again inside the transaction: a fit may have started elsewhere meanwhile.
      const refusal = listRuns(store, studyId).map((r) => fittedElsewhere(r, stopper)).find((m) => m !== null);
      if (refusal) throw new InputError(refusal);
      const contents = studyContents(store, studyId);
      deleteStudy(store, studyId);
      return contents;
    });
    return { message: `Deleted study "${plan.study.name}": ${describeStudyContents(value)}.`, walTruncated };
  } finally {
    stopper?.unhold(ids);
  }
}

export function planRunRemoval(store: Store, runId: number, stopper?: FitStopper): RunRemovalPlan {
  const run = getRun(store, runId);
  if (!run) throw new InputError('There is no such run (it may have been deleted already).');
  return {
    study: requireStudyById(store, run.studyId),
    run,
    contents: runContents(store, [run.id]),
    stopping: run.status === 'queued' || run.status === 'running',
    refusal: fittedElsewhere(run, stopper),
  };
}

/** Delete one run with its checkpoints, results, labels and exports; a fit running here is stopped first. */
export async function removeRun(store: Store, runId: number, stopper?: FitStopper): Promise<RemovalOutcome> {
  const plan = planRunRemoval(store, runId, stopper);
  if (plan.refusal) throw new InputError(plan.refusal);
  await stopper?.release([runId]);
  try {
    const { value, walTruncated } = eraseInTransaction(store, () => {
      const run = getRun(store, runId);
      if (!run) return null;
      const refusal = fittedElsewhere(run, stopper);
      if (refusal) throw new InputError(refusal);
      const contents = runContents(store, [runId]);
      deleteRun(store, runId);
      return contents;
    });
    const what = value ? describeRunContents(value) : 'nothing was left of it';
    return { message: `Deleted run "${plan.run.name}" of study "${plan.study.name}": ${what}.`, walTruncated };
  } finally {
    stopper?.unhold([runId]);
  }
}

/**
 * Runs that depend on an import's answers: finished runs whose stored answer ids (fitted or held
 * out) include one of them, and runs started after the import that are not finished (running, or
 * resumable from a checkpoint built on them). Queued runs have not read anything yet.
 */
function runsUsingImport(store: Store, record: ImportRecord): string[] {
  const ids = importDocumentIds(store, record.id);
  if (ids.length === 0) return [];
  const mine = new Set(ids);
  const lo = ids[0];
  const hi = ids[ids.length - 1];
  const uses = (values: ArrayLike<number> | undefined) => {
    if (!values) return false;
    for (let i = 0; i < values.length; i++) if (values[i] >= lo && values[i] <= hi && mine.has(values[i])) return true;
    return false;
  };
  return listRuns(store, record.studyId)
    .filter((run) => {
      if (run.status === 'finished') {
        const fitted = loadResult(store, run.id, 'documentIds')?.value as Int32Array | undefined;
        const heldOut = loadResult(store, run.id, 'heldOutIds')?.value as Int32Array | undefined;
        return uses(fitted) || uses(heldOut);
      }
      if (run.status === 'queued') return false;
      return (run.startedAt ?? run.createdAt) >= record.createdAt;
    })
    .map((run) => run.name)
    .reverse();
}

export function planImportRemoval(store: Store, importId: number): ImportRemovalPlan {
  const record = getImport(store, importId);
  if (!record) throw new InputError('There is no such imported file (it may have been deleted already).');
  const study = requireStudyById(store, record.studyId);
  const usedBy = runsUsingImport(store, record);
  const refusal = usedBy.length
    ? `${usedBy.length === 1 ? 'Run' : 'Runs'} ${usedBy.map((n) => `"${n}"`).join(', ')} ${usedBy.length === 1 ? 'was' : 'were'} fitted on answers of ${record.fileName}. ` +
      `Delete ${usedBy.length === 1 ? 'that run' : 'those runs'} first (Runs page, or themata remove-run), then delete the file: a run's results need the answers it was fitted on.`
    : null;
  return { study, record, usedBy, refusal };
}

/** Delete one import with its answers and rebuild the study's vocabulary without them. */
export async function removeImport(store: Store, importId: number): Promise<RemovalOutcome> {
  const plan = planImportRemoval(store, importId);
  if (plan.refusal) throw new InputError(plan.refusal);
  const { value, walTruncated } = eraseInTransaction(store, () => {
    const again = planImportRemoval(store, importId);
    if (again.refusal) throw new InputError(again.refusal);
    deleteImport(store, importId);
    rebuildVocabulary(store, plan.study.id);
    return again.record.documents;
  });
  const what = plan.record.kind === 'glossary' ? `the glossary's ${plural(value, 'term document')}` : plural(value, 'answer');
  return {
    message: `Deleted ${plan.record.fileName} from study "${plan.study.name}": the original file and ${what}; the study's vocabulary was rebuilt without them.`,
    walTruncated,
  };
}
