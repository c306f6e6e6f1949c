// The installed command started from a folder outside the package (issue 13): the command line
// imports, fits and exports, and the workbench it serves answers real pages and fits a queued run
// in its worker threads (the fit worker and, with two threads, the parallel sampler's workers).
// Before the fix, tsx took the JSX settings from the current folder and every page was a 500.
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import { existsSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { tempDir } from '../store/helpers.js';
import { FIXTURE_FLAGS, surveyCsv, surveyRows } from '../services/survey-fixture.js';

const root = join(import.meta.dirname, '..', '..');
const bin = join(root, 'bin', 'themata.mjs');
const t = tempDir('themata-elsewhere-');
let server: ChildProcess | undefined;
afterAll(() => {
  server?.kill('SIGTERM');
  t.cleanup();
});

function themata(...args: string[]) {
  return spawnSync(process.execPath, [bin, '--data', 'data', ...args], { encoding: 'utf8', cwd: t.dir, timeout: 120_000 });
}

/** Starts `themata serve --port 0` in the temporary folder; resolves to its address. */
function serve(): Promise<string> {
  return new Promise((resolve, reject) => {
    server = spawn(process.execPath, [bin, '--data', 'data', 'serve', '--port', '0'], { cwd: t.dir, stdio: ['ignore', 'pipe', 'pipe'] });
    let out = '';
    let err = '';
    server.stdout!.on('data', (chunk) => {
      out += String(chunk);
      const m = /serving at (http:\/\/\S+?)\/? /.exec(out);
      if (m) resolve(m[1]);
    });
    server.stderr!.on('data', (chunk) => (err += String(chunk)));
    server.once('exit', (code) => reject(new Error(`serve ended with code ${code}: ${out}${err}`)));
  });
}

async function waitForFinished(base: string, path: string): Promise<string> {
  for (let i = 0; i < 600; i++) {
    const res = await fetch(`${base}${path}`, { redirect: 'manual' });
    // A finished run's page sends the reader on to its themes.
    if (res.status === 303) return res.headers.get('location') ?? '';
    const html = await res.text();
    const status = /data-status="([a-z]+)"/.exec(html)?.[1];
    if (status !== 'queued' && status !== 'running') throw new Error(`run is ${status}: ${html.slice(0, 3000)}`);
    await new Promise((r) => setTimeout(r, 250));
  }
  throw new Error('run did not finish in time');
}

describe('themata started from another folder', () => {
  it('imports, fits and exports on the command line with the folder as its working directory', () => {
    expect(existsSync(join(t.dir, 'tsconfig.json'))).toBe(false);
    writeFileSync(join(t.dir, 'survey.csv'), surveyCsv(surveyRows(60)));
    const imported = themata('import', 'survey.csv', '--study', 'Elsewhere', ...FIXTURE_FLAGS);
    expect(imported.stderr).toBe('');
    expect(imported.status).toBe(0);
    const fit = themata('fit', '--study', 'Elsewhere', '--themes', '3', '--sweeps', '30', '--covariate', 'region', '--name', 'from-cli');
    expect(fit.stderr).toMatch(/^Estimate: [^\n]+\n(Note: [^\n]+\n)*$/); // said before the sweeps (issue 15)
    expect(fit.status).toBe(0);
    expect(JSON.parse(fit.stdout.trim()).run).toBe('from-cli');
    const exported = themata('export', '--study', 'Elsewhere', '--run', 'from-cli', '--out', 'results');
    expect(exported.status).toBe(0);
    expect(existsSync(join(t.dir, 'results', 'answers-by-theme.csv'))).toBe(true);
  });

  it('serves real pages and fits a run queued in the workbench in worker threads', async () => {
    const base = await serve();
    const home = await fetch(`${base}/`);
    expect(home.status).toBe(200);
    const homeHtml = await home.text();
    expect(homeHtml.startsWith('<!DOCTYPE html>')).toBe(true);
    expect(homeHtml).toContain('Elsewhere');
    const runs = await fetch(`${base}/studies/1/runs`);
    expect(runs.status).toBe(200);
    const runsHtml = await runs.text();
    expect(runsHtml).toContain('from-cli');
    const themes = await fetch(`${base}/studies/1/runs/1/themes`);
    expect(themes.status).toBe(200);
    expect(await themes.text()).toContain('<table class="list themes fit" id="themes"');

    const csrf = /name="_csrf" value="([^"]+)"/.exec(runsHtml)?.[1];
    expect(csrf).toBeTruthy();
    const form = new URLSearchParams({ _csrf: csrf!, themes: '3', sweeps: '30', burnIn: '5', seed: '2', threads: '2', holdout: '0', name: 'from-web' });
    const queued = await fetch(`${base}/studies/1/runs`, { method: 'POST', body: form, redirect: 'manual' });
    expect(queued.status).toBe(303);
    const runPath = queued.headers.get('location')!;
    expect(runPath).toMatch(/^\/studies\/1\/runs\/\d+$/);
    const themesPath = await waitForFinished(base, runPath);
    expect(themesPath).toBe(`${runPath}/themes`);
    const webThemes = await fetch(`${base}${themesPath}`);
    expect(webThemes.status).toBe(200);
    const webHtml = await webThemes.text();
    expect(webHtml).toContain('id="label-2"'); // three themes, each with its label cell
    expect(webHtml).not.toContain('id="label-3"');
  }, 180_000);
});
