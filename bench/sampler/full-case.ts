// The end-to-end million-answers case of issue #5 (`--full`): the demo generator's one million
// answers (demo/), imported into a fresh study (src/services import, SQLite store in a temporary
// folder), then fitted with K = 50 and 500 sweeps on every core through the same services call as
// `themata fit`. Reports wall time per phase and peak RSS. Targets: under 15 minutes, under 4 GB.
import { mkdtemp, rm } from 'node:fs/promises';
import { availableParallelism, tmpdir } from 'node:os';
import { join } from 'node:path';
import { performance } from 'node:perf_hooks';

export async function runFullCase(log: (line: string) => void, answers = 1_000_000): Promise<Record<string, unknown>> {
  const { generateDemo, demoCsv, DEMO_COLUMNS } = await import('../../demo/index.js');
  const { importFile, createFitRun, runFitJob } = await import('../../src/services/index.js');
  const { openStore } = await import('../../src/store/index.js');
  const dir = await mkdtemp(join(tmpdir(), 'themata-bench-'));
  const store = openStore(dir);
  const threads = availableParallelism();
  try {
    let t = performance.now();
    const { rows } = generateDemo({ answers, seed: 2025 });
    const bytes = new TextEncoder().encode(demoCsv(rows));
    const generateSeconds = (performance.now() - t) / 1000;
    log(`full: generated ${answers} answers (${(bytes.length / 1e6).toFixed(0)} MB CSV) in ${generateSeconds.toFixed(1)} s`);
    t = performance.now();
    const summary = await importFile(store, { study: 'bench million', bytes, fileName: 'million.csv', mapping: DEMO_COLUMNS });
    const importSeconds = (performance.now() - t) / 1000;
    log(`full: imported ${summary.documents} documents in ${importSeconds.toFixed(1)} s`);
    t = performance.now();
    const run = createFitRun(store, summary.studyId, { themes: 50, sweeps: 500, seed: 1, threads, holdout: 0 });
    let last = 0;
    const outcome = await runFitJob({
      store,
      runId: run.id,
      onProgress: (p) => {
        const sweep = (p as { sweep?: number }).sweep ?? 0;
        if (sweep >= last + 50) {
          last = sweep;
          log(`full: sweep ${sweep}/500, ${((performance.now() - t) / 1000).toFixed(0)} s`);
        }
      },
    });
    const fitSeconds = (performance.now() - t) / 1000;
    const total = generateSeconds + importSeconds + fitSeconds;
    const peakRssMB = process.resourceUsage().maxRSS / 1024;
    log(`full: fit K=50, 500 sweeps, ${threads} threads in ${fitSeconds.toFixed(1)} s; import + fit ${(importSeconds + fitSeconds).toFixed(1)} s; peak RSS ${peakRssMB.toFixed(0)} MB`);
    return {
      answers,
      documents: summary.documents,
      threads,
      generateSeconds,
      importSeconds,
      fitSeconds,
      importPlusFitSeconds: importSeconds + fitSeconds,
      totalSeconds: total,
      tokensPerSecond: outcome.diagnostics?.tokensPerSecond ?? null,
      peakRssMB,
    };
  } finally {
    store.close();
    await rm(dir, { recursive: true, force: true });
  }
}
