// The real workbench as a separate process, for the crash tests: started with the production
// command (`node bin/themata.mjs --data DIR serve`), killed with SIGKILL, and inspected from the
// outside through HTTP and a read-only look at its SQLite file.
import { spawn, type ChildProcess } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import Database from 'better-sqlite3';
import { DATABASE_FILE } from '../../src/store/index.js';

const ROOT = fileURLToPath(new URL('../../', import.meta.url));
const BIN = join(ROOT, 'bin', 'themata.mjs');

export interface ServerProcess {
  readonly url: string;
  readonly child: ChildProcess;
  /** SIGKILL: no handler runs, nothing is flushed or closed. Resolves once the process is gone. */
  kill(): Promise<void>;
}

export function tempFolder(prefix: string): { dir: string; cleanup: () => void } {
  const dir = mkdtempSync(join(tmpdir(), prefix));
  return { dir, cleanup: () => rmSync(dir, { recursive: true, force: true }) };
}

/** Start `themata serve` on a free loopback port and wait until it says where it listens. */
export function startServerProcess(dataDir: string, timeoutMs = 60_000): Promise<ServerProcess> {
  const env = { ...process.env };
  delete env.THEMATA_DATA;
  const child = spawn(process.execPath, [BIN, '--data', dataDir, 'serve', '--host', '127.0.0.1', '--port', '0'], {
    cwd: ROOT,
    env,
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  const gone = new Promise<void>((resolve) => child.once('exit', () => resolve()));
  const kill = async () => {
    if (child.exitCode === null && child.signalCode === null) child.kill('SIGKILL');
    await gone;
  };
  return new Promise((resolve, reject) => {
    let out = '';
    let err = '';
    const timer = setTimeout(() => {
      void kill();
      reject(new Error(`The server did not start within ${timeoutMs} ms.\n${out}\n${err}`));
    }, timeoutMs);
    child.stdout!.on('data', (chunk: Buffer) => {
      out += chunk.toString();
      const m = /serving at (http:\/\/\S+?)\/? /.exec(out);
      if (m) {
        clearTimeout(timer);
        resolve({ url: m[1], child, kill });
      }
    });
    child.stderr!.on('data', (chunk: Buffer) => (err += chunk.toString()));
    child.once('exit', (code, signal) => {
      clearTimeout(timer);
      reject(new Error(`The server stopped before listening (code ${code}, signal ${signal}).\n${out}\n${err}`));
    });
  });
}

/** A browser-like client of a loopback workbench in local mode (no accounts): forms carry _csrf. */
export class LocalClient {
  private csrfToken: string | undefined;

  constructor(readonly base: string) {}

  async get(path: string): Promise<Response> {
    return fetch(this.base + path, { redirect: 'manual', headers: { Accept: 'text/html' } });
  }

  async csrf(): Promise<string> {
    if (this.csrfToken) return this.csrfToken;
    const page = await (await this.get('/')).text();
    const token = /name="_csrf" value="([^"]+)"/.exec(page)?.[1];
    if (!token) throw new Error('No CSRF token on the studies page.');
    return (this.csrfToken = token);
  }

  async postForm(path: string, fields: Record<string, string>): Promise<Response> {
    const body = new URLSearchParams({ ...fields, _csrf: await this.csrf() });
    return fetch(this.base + path, { method: 'POST', body, redirect: 'manual', headers: { Accept: 'text/html' } });
  }

  async postFile(path: string, fields: Record<string, string>, file: { name: string; bytes: Uint8Array }): Promise<Response> {
    const form = new FormData();
    for (const [k, v] of Object.entries({ ...fields, _csrf: await this.csrf() })) form.append(k, v);
    form.append('file', new File([file.bytes], file.name));
    return fetch(this.base + path, { method: 'POST', body: form, redirect: 'manual', headers: { Accept: 'text/html' } });
  }
}

/** Open the data folder's database read-only (as an outside inspector would) and run fn. */
export function inspect<T>(dataDir: string, fn: (db: Database.Database) => T): T {
  const db = new Database(join(dataDir, DATABASE_FILE), { readonly: true, fileMustExist: true });
  try {
    return fn(db);
  } finally {
    db.close();
  }
}

/** PRAGMA integrity_check and foreign_key_check; returns the problems found (empty when sound). */
export function databaseProblems(db: Database.Database): string[] {
  const integrity = (db.pragma('integrity_check') as { integrity_check: string }[]).map((r) => r.integrity_check);
  const problems = integrity.filter((r) => r !== 'ok');
  const keys = db.pragma('foreign_key_check') as unknown[];
  if (keys.length) problems.push(`${keys.length} rows break a foreign key: ${JSON.stringify(keys.slice(0, 3))}`);
  return problems;
}

export const sleep = (ms: number) => new Promise<void>((resolve) => setTimeout(resolve, ms));
