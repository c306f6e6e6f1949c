// The production start path: `themata serve` (bin/themata.mjs, as `npm start` runs it) in its own
// process. Proves the fit worker thread loads its TypeScript there too, and that the server will
// not listen beyond loopback without accounts. Invented data (helpers.ts).
import { spawn, type ChildProcess } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { createServer } from 'node:net';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { importFile } from '../../src/services/index.js';
import { openStore } from '../../src/store/index.js';
import { inventedSurvey } from './helpers.js';

const bin = join(import.meta.dirname, '..', '..', 'bin', 'themata.mjs');
let dir: string;
let child: ChildProcess | undefined;

function freePort(): Promise<number> {
  return new Promise((resolve) => {
    const probe = createServer().listen(0, '127.0.0.1', () => {
      const { port } = probe.address() as { port: number };
      probe.close(() => resolve(port));
    });
  });
}

function serve(args: string[]): { child: ChildProcess; output: Promise<{ url?: string; code?: number | null; text: string }> } {
  const c = spawn(process.execPath, [bin, '--data', dir, 'serve', ...args], { stdio: ['ignore', 'pipe', 'pipe'] });
  const output = new Promise<{ url?: string; code?: number | null; text: string }>((resolve) => {
    let text = '';
    const onData = (chunk: Buffer) => {
      text += chunk.toString();
      const m = text.match(/serving at (http:\/\/\S+?\/)(\s|$)/);
      if (m) resolve({ url: m[1], text });
    };
    c.stdout!.on('data', onData);
    c.stderr!.on('data', onData);
    c.once('exit', (code) => resolve({ code, text }));
  });
  return { child: c, output };
}

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'themata-serve-'));
  const store = openStore(dir);
  await importFile(store, {
    study: 'Invented park survey',
    bytes: new TextEncoder().encode(inventedSurvey(60)),
    fileName: 'park.csv',
    mapping: { id: 'respondent_id', text: ['comment'], language: 'lang', covariates: [{ column: 'district', type: 'categorical' }], weight: 'weight' },
  });
  store.close();
});

afterAll(async () => {
  if (child && child.exitCode === null) {
    await new Promise<void>((resolve) => {
      child!.once('exit', () => resolve());
      child!.kill('SIGTERM');
    });
  }
  rmSync(dir, { recursive: true, force: true });
});

describe('themata serve', () => {
  it('refuses to listen on every address before an account exists', async () => {
    const { output } = serve(['--host', '0.0.0.0', '--port', String(await freePort())]);
    const out = await output;
    expect(out.url).toBeUndefined();
    expect(out.code).not.toBe(0);
    expect(out.text).toMatch(/before an account exists/);
  });

  it('fits a run started from the web form in a worker thread of the served process', async () => {
    const started = serve(['--port', String(await freePort())]);
    child = started.child;
    const { url } = await started.output;
    expect(url).toMatch(/^http:\/\/127\.0\.0\.1:\d+\/$/);
    const runs = new URL('/studies/1/runs', url);
    const csrf = (await (await fetch(runs, { headers: { Accept: 'text/html' } })).text()).match(/name="_csrf" value="([^"]+)"/)![1];
    const res = await fetch(runs, { method: 'POST', redirect: 'manual', body: new URLSearchParams({ _csrf: csrf, themes: '3', sweeps: '20', burnIn: '5' }) });
    expect(res.status).toBe(303);
    let page = '';
    for (let i = 0; i < 120 && !/<td>finished|<td>failed/.test(page); i++) {
      await new Promise((r) => setTimeout(r, 250));
      page = await (await fetch(runs, { headers: { Accept: 'text/html' } })).text();
    }
    expect(page).toContain('<td>finished');
  });
});
