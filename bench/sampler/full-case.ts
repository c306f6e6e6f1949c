// The end-to-end million-answers case of issue #5 (`--full`): the demo generator's one million
// answers (demo/), imported into a fresh study (src/services import, SQLite store in a temporary
// folder), then fitted with K = 50 and 500 sweeps on every core through the same services call as
// `themata fit`. Reports wall time per phase and peak RSS. Targets: under 15 minutes, under 4 GB.
import { mkdtemp, rm } from 'node:fs/promises';
import { availableParallelism, tmpdir } from 'node:os';
import { join } from 'node:path';
import { performance } from 'node:perf_hooks';

/** Answers per imported file: about 75 MB of demo CSV, under the 100 MB limit of one import. */
const PART_ANSWERS = 500_000;

export async function runFullCase(log: (line: string) => void, answers = 1_000_000): Promise<Record<string, unknown>> {
  const { generateDemo, demoCsv, DEMO_COLUMNS } = await import('../../demo/index.js');
  const { importFile, createFitRun, runFitJob, estimateFit, describeEstimate, loadRunModel, exportTables, buildBundle, applyRun } = await import('../../src/services/index.js');
  const { machineSize } = await import('../../src/platform/index.js');
  const { serveInChild, measurePages } = await import('../web.js');
  const { openStore } = await import('../../src/store/index.js');
  const dir = await mkdtemp(join(tmpdir(), 'themata-bench-'));
  const store = openStore(dir);
  const threads = availableParallelism();
  try {
    let t = performance.now();
    const { rows } = generateDemo({ answers, seed: 2025 });
    // One import is capped at 100 MB (READ_TABLE_DEFAULTS); a million answers are about 150 MB of
    // CSV, so they arrive as a user would bring them: several files into one study.
    const parts = Math.max(1, Math.ceil(answers / PART_ANSWERS));
    const files: Uint8Array[] = [];
    for (let p = 0; p < parts; p++) {
      files.push(new TextEncoder().encode(demoCsv(rows.slice(p * PART_ANSWERS, (p + 1) * PART_ANSWERS))));
    }
    const csvBytes = files.reduce((s, f) => s + f.length, 0);
    const generateSeconds = (performance.now() - t) / 1000;
    log(`full: generated ${answers} answers (${(csvBytes / 1e6).toFixed(0)} MB CSV in ${parts} files) in ${generateSeconds.toFixed(1)} s`);
    t = performance.now();
    let studyId = 0;
    let documents = 0;
    for (let p = 0; p < parts; p++) {
      const summary = await importFile(store, { study: 'bench million', bytes: files[p], fileName: `million-${p + 1}.csv`, mapping: DEMO_COLUMNS });
      files[p] = new Uint8Array(0);
      studyId = summary.studyId;
      documents += summary.documents;
      log(`full: imported file ${p + 1}/${parts} (${summary.documents} documents), ${((performance.now() - t) / 1000).toFixed(0)} s`);
    }
    const importSeconds = (performance.now() - t) / 1000;
    log(`full: imported ${documents} documents in ${importSeconds.toFixed(1)} s`);
    t = performance.now();
    const request = { themes: 50, sweeps: Number(process.env.FULL_SWEEPS ?? 500), seed: 1, threads, holdout: 0 };
    const estimate = estimateFit(store, studyId, request, machineSize());
    log(`full: estimate before the fit: ${describeEstimate(estimate)}`);
    t = performance.now();
    const run = createFitRun(store, studyId, request);
    let last = 0;
    // Wall time per phase (src/services fit-job.ts phases), from the progress a user sees.
    const phaseSeconds: Record<string, number> = {};
    let phase = '';
    let phaseStart = performance.now();
    const outcome = await runFitJob({
      store,
      runId: run.id,
      onProgress: (p) => {
        const now = performance.now();
        const next = String(p.phase ?? '');
        if (next !== phase) {
          if (phase) phaseSeconds[phase] = (phaseSeconds[phase] ?? 0) + (now - phaseStart) / 1000;
          phase = next;
          phaseStart = now;
        }
        const sweep = (p as { sweep?: number }).sweep ?? 0;
        if (sweep >= last + 50) {
          last = sweep;
          log(`full: sweep ${sweep}/${run.settings.sweeps}, ${((now - t) / 1000).toFixed(0)} s`);
        }
      },
    });
    const fitSeconds = (performance.now() - t) / 1000;
    const total = generateSeconds + importSeconds + fitSeconds;
    const peakRssMB = process.resourceUsage().maxRSS / 1024;
    const around = fitSeconds - (phaseSeconds.sampling ?? 0);
    log(`full: fit K=50, ${run.settings.sweeps} sweeps, ${threads} threads in ${fitSeconds.toFixed(1)} s (estimated ${estimate.seconds.total.toFixed(0)} s); import + fit ${(importSeconds + fitSeconds).toFixed(1)} s; peak RSS ${peakRssMB.toFixed(0)} MB (estimated ${(estimate.peakBytes / 1e6).toFixed(0)} MB)`);
    log(`full: phases ${Object.entries(phaseSeconds).map(([k, v]) => `${k} ${v.toFixed(1)} s`).join(', ')}; around the sweeps ${around.toFixed(1)} s = ${((100 * around) / fitSeconds).toFixed(1)}% of the fit's wall time (goal < 15%)`);
    t = performance.now();
    const model = loadRunModel(store, run.id)!;
    const tables = exportTables(store, model, { answerText: true });
    const exportSeconds = (performance.now() - t) / 1000;
    log(`full: export tables (answers by theme, shares by group, words, codebook) ${exportSeconds.toFixed(1)} s for ${tables.answers.rows.length.toLocaleString('en')} answer rows; peak RSS now ${(process.resourceUsage().maxRSS / 1024).toFixed(0)} MB`);
    // Apply: next wave's 100,000 answers coded with this run (the same generator, another seed).
    t = performance.now();
    const wave = new TextEncoder().encode(demoCsv(generateDemo({ answers: 100_000, seed: 2026 }).rows));
    const applied = await applyRun(buildBundle(store, model), { bytes: wave, fileName: 'next-wave.csv', mapping: DEMO_COLUMNS });
    const applySeconds = (performance.now() - t) / 1000;
    log(`full: apply to 100,000 new answers ${applySeconds.toFixed(1)} s (${(applied.file.bytes.length / 1e6).toFixed(0)} MB coded file); peak RSS now ${(process.resourceUsage().maxRSS / 1024).toFixed(0)} MB`);
    // The results pages as a person opens them: a server started on this data folder (first
    // visit after a restart), then a few clients for a while (p95).
    const server = await serveInChild(dir);
    const base = `/studies/${studyId}/runs/${run.id}`;
    const paths = { themes: `${base}/themes`, theme: `${base}/themes/0`, contrasts: `${base}/contrasts?by=branch_region`, answers: `${base}/answers?language=en` };
    let pages: Record<string, unknown> = {};
    try {
      pages = await measurePages(server.url, paths, { connections: 4, seconds: 10, log });
    } finally {
      await new Promise<void>((resolve) => {
        server.process.once('exit', () => resolve());
        server.process.kill('SIGTERM');
      });
    }
    return {
      answers,
      documents,
      threads,
      generateSeconds,
      importSeconds,
      fitSeconds,
      importPlusFitSeconds: importSeconds + fitSeconds,
      phaseSeconds,
      aroundSweepsShare: around / fitSeconds,
      estimatedSeconds: estimate.seconds.total,
      estimatedPeakMB: estimate.peakBytes / 1e6,
      exportSeconds,
      applySeconds,
      pages,
      totalSeconds: total,
      tokensPerSecond: outcome.diagnostics?.tokensPerSecond ?? null,
      peakRssMB,
    };
  } finally {
    store.close();
    await rm(dir, { recursive: true, force: true });
  }
}
