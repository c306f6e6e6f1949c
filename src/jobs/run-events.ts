// Publish and subscribe for run events (status changes and progress), per run or for every run:
// what the live run pages (server-sent events) and the tests listen to.
import type { RunProgress, RunStatus } from '../store/index.js';

export type JobEvent =
  | { runId: number; kind: 'status'; status: RunStatus; error: string | null }
  | { runId: number; kind: 'progress'; progress: RunProgress };

export type JobListener = (event: JobEvent) => void;

export class RunEvents {
  private readonly perRun = new Map<number, Set<JobListener>>();
  private readonly all = new Set<JobListener>();

  /** Listen to one run's events (or every run's with runId = null). Returns an unsubscribe. */
  subscribe(runId: number | null, listener: JobListener): () => void {
    if (runId === null) {
      this.all.add(listener);
      return () => this.all.delete(listener);
    }
    let set = this.perRun.get(runId);
    if (!set) this.perRun.set(runId, (set = new Set()));
    set.add(listener);
    return () => {
      set!.delete(listener);
      if (set!.size === 0) this.perRun.delete(runId);
    };
  }

  emit(event: JobEvent): void {
    for (const l of this.perRun.get(event.runId) ?? []) l(event);
    for (const l of this.all) l(event);
  }
}
