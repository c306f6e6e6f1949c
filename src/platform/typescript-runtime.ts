// Running Themata's TypeScript sources wherever the command is started from. tsx reads the JSX
// settings (`jsx: react-jsx`, `jsxImportSource: hono/jsx`) from a tsconfig.json; without being
// told which, it takes the one in the current folder, so `themata serve` started from a
// researcher's data folder rendered every page with "React is not defined" (issue 13). The
// package's own tsconfig is therefore named explicitly: bin/themata.mjs passes it to tsx's
// `register({ tsconfig })` and sets TSX_TSCONFIG_PATH (tsx 4.23, dist/esm/api: the option wins,
// the variable is the fallback), and worker threads register with the same file.
import { createRequire } from 'node:module';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { Worker } from 'node:worker_threads';

/** The package's tsconfig.json (two folders above this file), as a file path. */
export function packageTsconfigPath(): string {
  return fileURLToPath(new URL('../../tsconfig.json', import.meta.url));
}

/** URL of tsx's ESM API as resolved from this package. */
export function tsxApiUrl(): string {
  try {
    return import.meta.resolve('tsx/esm/api');
  } catch {
    // Some test runners transform modules so that import.meta.resolve is missing.
    return pathToFileURL(createRequire(import.meta.url).resolve('tsx/esm/api')).href;
  }
}

// On Node 20, loader hooks registered in the main thread (bin/themata.mjs, vitest) are not
// inherited by worker threads, so the worker starts from a tiny script that registers tsx's ESM
// hooks first and then imports the worker module by URL (STYLE.md, "Gotchas").
const BOOT = `
const { workerData } = require('node:worker_threads');
(async () => {
  const { register } = await import(workerData.__tsxApi);
  register({ tsconfig: workerData.__tsconfig });
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
    workerData: { ...data, __tsxApi: tsxApiUrl(), __tsconfig: packageTsconfigPath(), __module: String(moduleUrl) },
  });
}
