// Starting a worker thread that runs TypeScript. On Node 20, loader hooks registered in the main
// thread (bin/themata.mjs, vitest) are not inherited by worker threads, so the worker is started
// from a tiny script that registers tsx's ESM hooks first and then imports the worker module by
// URL (the gotcha recorded in STYLE.md). The same path is used under vitest and under `npm start`.
import { createRequire } from 'node:module';
import { pathToFileURL } from 'node:url';
import { Worker } from 'node:worker_threads';

function tsxApiUrl(): string {
  try {
    return import.meta.resolve('tsx/esm/api');
  } catch {
    // Some test runners transform modules so that import.meta.resolve is missing.
    return pathToFileURL(createRequire(import.meta.url).resolve('tsx/esm/api')).href;
  }
}

const BOOT = `
const { workerData } = require('node:worker_threads');
(async () => {
  const { register } = await import(workerData.__tsxApi);
  register();
  await import(workerData.__module);
})().catch((error) => {
  const { parentPort } = require('node:worker_threads');
  parentPort.postMessage({ type: 'error', message: 'The fit worker could not start: ' + (error && error.message ? error.message : String(error)) });
});
`;

/** Start `moduleUrl` (a .ts or .js module) in a worker thread with `data` as its workerData. */
export function startTypeScriptWorker(moduleUrl: URL | string, data: Record<string, unknown>): Worker {
  return new Worker(BOOT, {
    eval: true,
    workerData: { ...data, __tsxApi: tsxApiUrl(), __module: String(moduleUrl) },
  });
}
