import { existsSync } from 'node:fs';
import { demoCsv, DEMO_COLUMNS, generateDemo } from '/work/main/demo/index.js';
import { createFitRun, importFile, runFitJob } from '/work/main/src/services/index.js';
import { openStore, setRunStatus } from '/work/main/src/store/index.js';
import { createApp } from '/work/main/src/server/index.js';
import { JobQueue } from '/work/main/src/jobs/index.js';
const dir = '/tmp/prof-data';
const N = Number(process.argv[2] ?? 20000);
const fresh = !existsSync(dir);
const store = openStore(dir);
if (fresh) {
  const { rows } = generateDemo({ answers: N, seed: 11 });
  const s = await importFile(store, { study: 'Bench', bytes: new TextEncoder().encode(demoCsv(rows)), fileName: 'b.csv', mapping: DEMO_COLUMNS });
  const run = createFitRun(store, s.studyId, { themes: 20, sweeps: 20, burnIn: 5, covariates: ['branch_region'], holdout: 0.05 });
  await runFitJob({ store, runId: run.id });
  setRunStatus(store, run.id, 'finished');
}
const queue = new JobQueue({ store });
const app = createApp({ store, queue, loopbackOnly: true, localCsrf: 'x' });
for (const p of ['/studies/1/runs/1/themes', '/studies/1/runs/1/themes', '/studies/1/runs/1/themes/0', '/studies/1/runs/1/themes/0', '/studies/1/runs/1/contrasts?by=branch_region', '/studies/1/runs/1/contrasts?by=branch_region', '/studies/1/runs/1/answers?language=en', '/studies/1/runs/1/answers?language=en']) {
  const t0 = performance.now();
  const r = await app.request(p, { headers: { Accept: 'text/html' } });
  const body = await r.text();
  console.log(p, r.status, body.length, (performance.now() - t0).toFixed(1), 'ms');
}
await queue.close();
store.close();
