// Building the workbench in process for route tests: a temporary data folder, the real store and
// job queue, and helpers that send forms with the CSRF token like a browser would.
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { JobQueue } from '../../src/jobs/index.js';
import { createApp, type RequestRateLimiter, type SignInThrottle } from '../../src/server/index.js';
import type { UploadScanner } from '../../src/platform/index.js';
import { openStore, type ScryptCost, type Store } from '../../src/store/index.js';

export const LOCAL_CSRF = 'local-token-for-tests-0123456789';

export interface TestApp {
  app: ReturnType<typeof createApp>;
  store: Store;
  queue: JobQueue;
  dir: string;
  close(): Promise<void>;
}

export interface MakeAppOptions {
  loopbackOnly?: boolean;
  workerUrl?: URL;
  uploadLimitBytes?: number;
  secureCookies?: boolean;
  allowedHosts?: string[];
  signInThrottle?: SignInThrottle;
  /**
   * Request rate limits. Route tests send hundreds of requests a second as one account, far beyond
   * any person, so they run without limits unless a test passes a limiter; the limits have their
   * own tests (test/server/request-limits.test.ts), and `startServer` always has them.
   */
  requestLimiter?: RequestRateLimiter;
  /** Test-only scrypt cost for accounts made and checked through the app (default: production). */
  passwordCost?: ScryptCost;
  uploadScanner?: UploadScanner;
  /** An existing data folder to open (default: a new temporary one). */
  dir?: string;
}

export function makeApp(options: MakeAppOptions = {}): TestApp {
  const dir = options.dir ?? mkdtempSync(join(tmpdir(), 'themata-server-'));
  const store = openStore(dir);
  const queue = new JobQueue({ store, workerUrl: options.workerUrl, progressWriteMs: 0 });
  queue.start();
  const app = createApp({
    store,
    queue,
    loopbackOnly: options.loopbackOnly ?? true,
    localCsrf: LOCAL_CSRF,
    uploadLimitBytes: options.uploadLimitBytes,
    secureCookies: options.secureCookies,
    allowedHosts: options.allowedHosts,
    signInThrottle: options.signInThrottle,
    requestLimiter: options.requestLimiter ?? false,
    passwordCost: options.passwordCost,
    uploadScanner: options.uploadScanner,
  });
  return {
    app,
    store,
    queue,
    dir,
    async close() {
      await queue.close();
      store.close();
      rmSync(dir, { recursive: true, force: true });
    },
  };
}

export const HTML = { Accept: 'text/html' };

/** POST a urlencoded form. */
export function postForm(t: TestApp, path: string, fields: Record<string, string | string[]>, headers: Record<string, string> = {}) {
  const body = new URLSearchParams();
  for (const [k, v] of Object.entries(fields)) for (const x of Array.isArray(v) ? v : [v]) body.append(k, x);
  return t.app.request(path, { method: 'POST', body, headers: { 'Content-Type': 'application/x-www-form-urlencoded', ...headers } });
}

/** POST a multipart form with one file. */
export function postFile(t: TestApp, path: string, fields: Record<string, string>, file: { name: string; bytes: Uint8Array | string }, headers: Record<string, string> = {}) {
  const form = new FormData();
  for (const [k, v] of Object.entries(fields)) form.append(k, v);
  form.append('file', new File([file.bytes], file.name));
  return t.app.request(path, { method: 'POST', body: form, headers });
}

/** Study id from a redirect to /studies/N/… */
export function idFrom(location: string | null, pattern = /\/studies\/(\d+)/): number {
  const m = location?.match(pattern);
  if (!m) throw new Error(`No id in ${location}`);
  return Number(m[1]);
}

/** An invented bilingual survey: short answers about a park in English and Spanish. */
export function inventedSurvey(rows = 80): string {
  const en = [
    'the playground needs new swings and a safer fence',
    'more benches and shade trees near the playground please',
    'dogs off lead scare the children near the pond',
    'the pond smells and the ducks need cleaner water',
    'toilets are closed too often and need cleaning',
    'please open the toilets earlier and keep them clean',
    'night lighting on the paths would make walking safer',
    'the paths flood after rain and need better drainage',
  ];
  const es = [
    'el parque infantil necesita columpios nuevos y una valla segura',
    'más bancos y árboles de sombra junto al parque infantil',
    'los perros sueltos asustan a los niños cerca del estanque',
    'el estanque huele mal y los patos necesitan agua limpia',
    'los baños están cerrados muy a menudo y necesitan limpieza',
    'abran los baños más temprano y manténganlos limpios',
    'luces nocturnas en los caminos harían más seguro caminar',
    'los caminos se inundan con la lluvia y necesitan drenaje',
  ];
  const lines = ['respondent_id,comment,lang,district,weight'];
  for (let i = 0; i < rows; i++) {
    const spanish = i % 2 === 1;
    const pool = spanish ? es : en;
    const text = `${pool[i % pool.length]}; ${pool[Math.floor(i / 8) % pool.length]}`;
    lines.push(`R${String(i + 1).padStart(4, '0')},"${text}",${spanish ? 'es' : 'en'},${['North', 'South', 'East'][i % 3]},${(0.5 + (i % 4) * 0.25).toFixed(2)}`);
  }
  return lines.join('\n') + '\n';
}
