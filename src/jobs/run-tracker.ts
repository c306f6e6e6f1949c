// What the run lifecycle does with a fit's messages, wherever the fit runs (a worker thread of
// the server's queue, or the command line's own process): the latest progress (merged, so a field
// a message leaves out stays shown), the likelihood trace (one point per sweep, continued after a
// resume, bounded), progress written to the run at most every `writeMs`, and the final status
// change, guarded so that a run already finished (with its results) stays finished.
import { getRun, setRunProgress, setRunStatus, type RunProgress, type RunStatus, type Store } from '../store/index.js';

const TRACE_LIMIT = 5000; // common practice: enough points for any chart, bounded memory

export class RunTracker {
  private progressNow: RunProgress = {};
  private trace: number[] = [];
  private lastWrite = 0;
  private settled = false;

  constructor(
    private readonly store: Store,
    readonly runId: number,
    private readonly writeMs: number,
  ) {}

  /** The fit started; a resumed fit continues the trace of the sweeps its checkpoint holds. */
  started(resumedFromSweep: number | null): void {
    if (resumedFromSweep !== null) this.trace = (getRun(this.store, this.runId)?.progress.trace ?? []).slice(0, resumedFromSweep);
  }

  /** A progress message; returns the progress to show (with the whole trace). */
  progress(p: RunProgress): RunProgress {
    if (Array.isArray(p.trace)) this.trace = p.trace.slice(-TRACE_LIMIT);
    // One trace point per sweep: closing or phase messages that repeat a sweep are not added.
    else if (typeof p.logLikelihoodPerToken === 'number' && Number.isFinite(p.logLikelihoodPerToken) && p.sweep === this.trace.length + 1) {
      this.trace.push(p.logLikelihoodPerToken);
      if (this.trace.length > TRACE_LIMIT) this.trace.splice(0, this.trace.length - TRACE_LIMIT);
    }
    this.progressNow = { ...this.progressNow, ...p };
    // A phase's own detail (e.g. which summary) belongs to that phase only.
    if (p.phase !== undefined && p.step === undefined) delete this.progressNow.step;
    delete this.progressNow.trace;
    const nowMs = Date.now();
    if (nowMs - this.lastWrite >= this.writeMs) {
      this.lastWrite = nowMs;
      this.write();
    }
    return this.snapshot();
  }

  snapshot(): RunProgress {
    return { ...this.progressNow, trace: this.trace.slice() };
  }

  get isSettled(): boolean {
    return this.settled;
  }

  /** Marks the tracker done without a status change (the run is being deleted or the queue closed). */
  abandon(): void {
    this.settled = true;
  }

  /**
   * The fit is over. The status changes only while the run is still 'running': the fit marks
   * its run 'finished' together with its results, so a cancel or a kill that lands afterwards
   * leaves it finished. Returns what the run really is now, or undefined when it was settled.
   */
  settle(status: RunStatus, error: string | null): { status: RunStatus; error: string | null } | undefined {
    if (this.settled) return undefined;
    this.settled = true;
    if (getRun(this.store, this.runId)?.status === 'running') this.write();
    setRunStatus(this.store, this.runId, status, error, { from: ['running'] });
    const after = getRun(this.store, this.runId);
    return after ? { status: after.status, error: after.error } : undefined;
  }

  private write(): void {
    try {
      setRunProgress(this.store, this.runId, this.snapshot());
    } catch {
      // A busy database must not stop the fit; the next progress message writes again.
    }
  }
}
