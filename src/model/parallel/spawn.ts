// Starts a worker thread that runs a TypeScript module.
//
// Why: worker threads under tsx on Node 20 do not load .ts files by themselves (STYLE.md,
// "Gotchas"). The worker therefore starts from a tiny `eval: true` snippet that registers tsx's
// ESM loader (`tsx/esm/api` register(), resolved from this package) and then imports the worker
// module by URL. Works the same under vitest and under `node --import tsx`.
import { createRequire } from 'node:module';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { Worker, type WorkerOptions } from 'node:worker_threads';

function tsxApiUrl(): string {
  try {
    return import.meta.resolve('tsx/esm/api');
  } catch {
    // Some test runners do not provide import.meta.resolve; the CommonJS entry registers the same loader.
    return pathToFileURL(createRequire(import.meta.url).resolve('tsx/esm/api')).href;
  }
}

/**
 * The package's own tsconfig.json (for its JSX settings), not the one of the folder the process
 * was started in (issue 13; src/platform/typescript-runtime.ts explains).
 */
function packageTsconfig(): string {
  return fileURLToPath(new URL('../../../tsconfig.json', import.meta.url));
}

/** A worker running the module at `moduleUrl` (a .ts or .js file URL). */
export function spawnTsWorker(moduleUrl: URL, options: Omit<WorkerOptions, 'eval'> = {}): Worker {
  const snippet = [
    `import(${JSON.stringify(tsxApiUrl())})`,
    `.then((api) => { api.register({ tsconfig: ${JSON.stringify(packageTsconfig())} }); return import(${JSON.stringify(moduleUrl.href)}); })`,
    // A start-up failure is reported on workerData.port and, when workerData.ctrl exists, by
    // writing -1 into its slot 3 (protocol.ts DONE) so a main thread blocked on it wakes up.
    `.catch((error) => { const wd = require('node:worker_threads').workerData || {}; const text = String(error && error.stack || error);`,
    ` if (wd.port) wd.port.postMessage({ error: text }); else console.error(text);`,
    ` if (wd.ctrl) { Atomics.store(wd.ctrl, 3, -1); Atomics.notify(wd.ctrl, 3); } });`,
  ].join('');
  return new Worker(snippet, { ...options, eval: true });
}
