// A fixed set of worker threads driven through shared control slots (protocol.ts). The calling
// thread blocks on Atomics.wait while workers run (allowed on Node's main thread), which keeps
// Sampler.sweep synchronous as the contract in types.ts requires.
import { MessageChannel, receiveMessageOnPort, type MessagePort, type Worker } from 'node:worker_threads';
import { spawnTsWorker } from './spawn.js';
import { CMD, CMD_EXIT, ARG, CTRL_SLOTS, DONE, GEN, PARITY, STATUS, STATUS_ERROR } from './protocol.js';

/** Longest wait for one command before giving up (common practice: generous, a stuck worker is a bug). */
const WAIT_LIMIT_MS = 15 * 60 * 1000;

export class WorkerPool {
  /** Control slots of every partition; partition 0 is the calling thread and has no worker. */
  readonly ctrlAll: Int32Array;
  private readonly workers: Worker[] = [];
  private readonly ports: MessagePort[] = [];
  private closed = false;
  busy = false;

  constructor(readonly partitions: number) {
    this.ctrlAll = new Int32Array(new SharedArrayBuffer(partitions * CTRL_SLOTS * 4));
    // Run from source (tsx, vitest) the sibling is worker.ts; compiled, it is worker.js.
    const entry = new URL(import.meta.url.endsWith('.ts') ? './worker.ts' : './worker.js', import.meta.url);
    for (let p = 1; p < partitions; p++) {
      const channel = new MessageChannel();
      const ctrl = this.ctrlAll.subarray(p * CTRL_SLOTS, (p + 1) * CTRL_SLOTS);
      const worker = spawnTsWorker(entry, { workerData: { index: p, ctrl, port: channel.port2 }, transferList: [channel.port2] });
      worker.unref();
      this.workers.push(worker);
      this.ports.push(channel.port1);
    }
  }

  /**
   * Starts `cmd` on every worker; `message` (if any) is posted first for the worker to read;
   * `parity` is the sweep parity of a sweep command (protocol.ts).
   */
  post(cmd: number, arg = 0, message?: unknown, parity = 0): void {
    if (this.closed) throw new Error('The parallel sampler has been disposed.');
    for (let w = 0; w < this.workers.length; w++) {
      const ctrl = this.ctrl(w);
      if (message !== undefined) this.ports[w].postMessage(message);
      Atomics.store(ctrl, CMD, cmd);
      Atomics.store(ctrl, ARG, arg);
      Atomics.store(ctrl, PARITY, parity);
      Atomics.add(ctrl, GEN, 1);
      Atomics.notify(ctrl, GEN);
    }
  }

  /** Blocks until every worker has finished the last posted command; throws a worker's error. */
  wait(): void {
    const started = Date.now();
    for (let w = 0; w < this.workers.length; w++) {
      const ctrl = this.ctrl(w);
      const gen = Atomics.load(ctrl, GEN);
      for (;;) {
        const done = Atomics.load(ctrl, DONE);
        if (done === gen) break;
        if (done === -1) throw new Error(`Parallel sampler: worker ${w + 1} failed to start. ${this.errorText(w)}`);
        if (Date.now() - started > WAIT_LIMIT_MS) throw new Error(`Parallel sampler: worker ${w + 1} did not answer within ${WAIT_LIMIT_MS / 60000} minutes.`);
        Atomics.wait(ctrl, DONE, done, 1000);
      }
      if (Atomics.load(ctrl, STATUS) === STATUS_ERROR) throw new Error(`Parallel sampler: worker ${w + 1} failed. ${this.errorText(w)}`);
    }
  }

  async terminate(): Promise<void> {
    if (this.closed) return;
    this.post(CMD_EXIT);
    this.closed = true;
    for (const port of this.ports) port.close();
    await Promise.all(this.workers.map((w) => w.terminate()));
  }

  private ctrl(w: number): Int32Array {
    return this.ctrlAll.subarray((w + 1) * CTRL_SLOTS, (w + 2) * CTRL_SLOTS);
  }

  private errorText(w: number): string {
    const received = receiveMessageOnPort(this.ports[w]);
    const message = received?.message as { error?: string } | undefined;
    return message?.error ?? '';
  }
}
