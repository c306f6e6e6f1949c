// Hostile content (issue 8 item 3): answers, labels, covariate values, study and file names full
// of HTML, script, right-to-left overrides and control characters are shown as text on every
// page, and no script of theirs runs in chromium. Invented data.
import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { chromium, type BrowserContext } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startServer, type RunningServer } from '../../src/server/index.js';
import { createFitRun, importFile, runFitJob } from '../../src/services/index.js';
import { openStore, setRunStatus, setThemeLabel } from '../../src/store/index.js';

const CHROMIUM = process.env.CHROMIUM_PATH ?? '/usr/bin/chromium';
const haveBrowser = existsSync(CHROMIUM);

const SCRIPT = '<script>window.__pwned=1</script>';
const IMG = '<img src=x onerror="window.__pwned=2">';
const SVG = '"><svg onload="window.__pwned=3">';
const RTL = '\u202Egnp.exe';

function hostileCsv(): string {
  const lines = ['id,text,group'];
  const base = ['the reading room is quiet and warm', 'opening hours on sunday are too short', 'the wifi drops every afternoon', 'more children books in the library'];
  for (let i = 0; i < 60; i++) {
    const extra = i % 4 === 0 ? SCRIPT : i % 4 === 1 ? IMG : i % 4 === 2 ? SVG : `${RTL} \u0007 bell`;
    lines.push(`H${i},"${base[i % 4].replace(/"/g, '""')} ${base[(i >> 2) % 4]} ${extra.replace(/"/g, '""')}","${i % 2 ? SCRIPT.replace(/"/g, '""') : IMG.replace(/"/g, '""')}"`);
  }
  return lines.join('\n') + '\n';
}

// Skipped only outside CI when no browser is installed; in CI a missing browser fails.
describe.skipIf(!haveBrowser && process.env.CI !== 'true')('hostile content in chromium', () => {
  let dir: string;
  let server: RunningServer;
  let context: BrowserContext;
  let base = '';

  beforeAll(async () => {
    expect(haveBrowser, `No chromium at ${CHROMIUM}`).toBe(true);
    dir = mkdtempSync(join(tmpdir(), 'themata-hostile-'));
    const store = openStore(dir);
    const summary = await importFile(store, {
      study: `Study ${SCRIPT}${RTL}`,
      bytes: new TextEncoder().encode(hostileCsv()),
      fileName: `${IMG}.csv`,
      mapping: { id: 'id', text: ['text'], covariates: [{ column: 'group', type: 'categorical' }] },
      languages: ['en'],
    });
    const run = createFitRun(store, summary.studyId, { themes: 3, sweeps: 15, burnIn: 5, covariates: ['group'], name: `run ${SVG}` });
    await runFitJob({ store, runId: run.id });
    setRunStatus(store, run.id, 'finished');
    setThemeLabel(store, run.id, 0, `label ${SCRIPT}`);
    store.close();
    server = await startServer({ host: '127.0.0.1', port: 0, dataDir: dir });
    base = `${server.url}studies/${summary.studyId}`;
    context = await chromium.launchPersistentContext(join(dir, 'profile'), {
      executablePath: CHROMIUM,
      headless: true,
      args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
    });
    base = `${base}`;
    (globalThis as { __runId?: number }).__runId = run.id;
  });

  afterAll(async () => {
    await context?.close();
    await server?.close();
    rmSync(dir, { recursive: true, force: true });
  });

  it('shows every hostile string as text and runs none of it', async () => {
    const page = context.pages()[0] ?? (await context.newPage());
    const dialogs: string[] = [];
    page.on('dialog', (d) => {
      dialogs.push(d.message());
      void d.dismiss();
    });
    const runId = (globalThis as { __runId?: number }).__runId;
    const paths = ['', '/data', '/languages?show=all', '/vocabulary', '/runs', `/runs/${runId}/themes`, `/runs/${runId}/themes/0`, `/runs/${runId}/contrasts?by=group`, `/runs/${runId}/answers`, `/runs/${runId}/checks`];
    for (const p of paths) {
      await page.goto(p === '' ? server.url : `${base}${p}`);
      const pwned = await page.evaluate(() => (globalThis as { __pwned?: number }).__pwned);
      expect(pwned, `script ran on ${p || '/'}`).toBeUndefined();
      expect(await page.locator('img[src="x"], svg[onload]').count(), `markup injected on ${p || '/'}`).toBe(0);
    }
    expect(dialogs).toEqual([]);
    await page.goto(`${base}/runs/${runId}/themes`);
    expect(await page.locator('.label-form input[name="label"]').first().inputValue()).toBe(`label ${SCRIPT}`);
    await page.goto(`${base}/data`);
    expect(await page.textContent('#imports')).toContain(`${IMG}.csv`);
    await page.goto(`${base}/runs/${runId}/answers`);
    expect(await page.textContent('.answer-list')).toContain(SCRIPT);
  });

  // Not hostile content, but it needs the same browser: the sign-in page's own script works
  // under the content security policy.
  it('V2.1.12: the sign-in form can show the password it masks', async () => {
    const page = context.pages()[0] ?? (await context.newPage());
    await page.goto(`${server.url}login`);
    const field = page.locator('#password');
    await field.fill('correct horse 🐴 battery');
    expect(await field.getAttribute('type')).toBe('password');
    const toggle = page.getByLabel('Show password');
    expect(await toggle.isVisible()).toBe(true);
    await toggle.check();
    expect(await field.getAttribute('type')).toBe('text');
    expect(await field.inputValue()).toBe('correct horse 🐴 battery');
    await toggle.uncheck();
    expect(await field.getAttribute('type')).toBe('password');
  });
});
