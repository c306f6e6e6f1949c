// The browser journey of issue 7, in Debian's chromium driven by playwright-core: a researcher
// creates a study, uploads the demo CSV, maps its columns, reviews languages, starts a small run
// and watches it progress live, renames a theme, reads a theme page and the contrasts, downloads
// answers-by-theme.csv and codes a small new file. Screenshots go to test-output/ (not committed).
import { existsSync, mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { chromium, type BrowserContext, type Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startServer, type RunningServer } from '../../src/server/index.js';

const CHROMIUM = process.env.CHROMIUM_PATH ?? '/usr/bin/chromium';
const haveBrowser = existsSync(CHROMIUM);
const root = join(import.meta.dirname, '..', '..');
const shots = join(root, 'test-output', 'browser');
const demoCsv = join(root, 'demo', 'library-survey.csv');

if (!haveBrowser && process.env.CI === 'true') {
  // In CI the journey must run: a missing browser is a failure, not a skip.
  describe('browser journey', () => {
    it('finds chromium', () => {
      expect.fail(`No chromium at ${CHROMIUM}. Install it (apt-get install -y chromium) or set CHROMIUM_PATH.`);
    });
  });
} else {
  describe.skipIf(!haveBrowser)('browser journey', () => {
    let dir: string;
    let server: RunningServer;
    let context: BrowserContext;
    let page: Page;
    const problems: string[] = [];

    beforeAll(async () => {
      dir = mkdtempSync(join(tmpdir(), 'themata-journey-'));
      mkdirSync(shots, { recursive: true });
      server = await startServer({ host: '127.0.0.1', port: 0, dataDir: join(dir, 'data') });
      context = await chromium.launchPersistentContext(join(dir, 'profile'), {
        executablePath: CHROMIUM,
        headless: true,
        acceptDownloads: true,
        viewport: { width: 1280, height: 900 },
        args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
      });
      page = context.pages()[0] ?? (await context.newPage());
      page.on('console', (m) => {
        if (m.type() === 'error') problems.push(m.text());
      });
      page.on('pageerror', (e) => problems.push(e.message));
    });

    afterAll(async () => {
      await context?.close();
      await server?.close();
      rmSync(dir, { recursive: true, force: true });
    });

    const shot = (name: string) => page.screenshot({ path: join(shots, `${name}.png`), fullPage: true });

    it('does the whole job on the demo file', async () => {
      await page.goto(server.url);
      await shot('01-studies');
      await page.fill('input[name="name"]', 'Library journey');
      await page.click('button:has-text("Create study")');
      await page.waitForURL(/\/studies\/\d+\/data$/);

      await page.setInputFiles('#upload-form input[type="file"]', demoCsv);
      await page.click('#upload-form button[type="submit"]');
      await page.waitForSelector('#mapping-form');
      expect(await page.textContent('main')).toContain('encoding UTF-8');
      // The suggestions already map the demo's columns; check two and keep the rest.
      expect(await page.inputValue('select[aria-label="Use of column answer"]')).toBe('text');
      expect(await page.inputValue('select[aria-label="Use of column questionnaire_language"]')).toBe('language');
      await shot('02-mapping');
      await page.click('#mapping-form button[type="submit"]');
      await page.waitForSelector('text=Imported library-survey.csv', { timeout: 60_000 });
      await shot('03-data');

      await page.click('nav.tabs >> text=Languages');
      await page.waitForSelector('#language-counts');
      await shot('04-languages');

      await page.click('nav.tabs >> text=Vocabulary');
      await page.waitForSelector('#vocabulary-sizes');
      await shot('04b-vocabulary');

      await page.click('nav.tabs >> text=Runs');
      await page.fill('input[name="themes"]', '8');
      await page.click('summary:has-text("More settings")');
      await page.fill('input[name="sweeps"]', '100');
      await page.fill('input[name="burnIn"]', '20');
      await page.check('input[name="covariates"][value="branch_region"]');
      await page.click('#new-run-form button[type="submit"]');
      await page.waitForSelector('#run-progress');
      const first = await page.getAttribute('#run-progress', 'data-status');
      const seen = new Set<string>([`${first}|${await page.textContent('#run-sweep')}`]);
      const url = page.url();
      for (let i = 0; i < 600 && !(await page.$('#open-themes')); i++) {
        seen.add(`${await page.getAttribute('#run-progress', 'data-status')}|${await page.textContent('#run-sweep')}`);
        await page.waitForTimeout(100);
      }
      await page.waitForSelector('#open-themes', { timeout: 60_000 });
      // The panel changed several times on the same page: updates arrived by server-sent events.
      expect(page.url()).toBe(url);
      expect(seen.size).toBeGreaterThan(1);
      await shot('05-run');

      await page.click('#open-themes');
      await page.waitForSelector('#themes');
      const label = page.locator('.label-form input[name="label"]').first();
      await label.fill('Opening hours');
      await page.locator('.label-form button').first().click();
      await page.waitForSelector('.label-form .saved');
      await page.reload();
      expect(await page.locator('.label-form input[name="label"]').first().inputValue()).toBe('Opening hours');
      // The Themes table fits the window: no language, balance or score behind a side scroll (issue 14).
      // (A string, evaluated in the page: the tests are compiled without the DOM's types.)
      const fit = await page.evaluate<{ table: number; main: number; page: number; window: number }>(
        "({ table: document.querySelector('#themes').scrollWidth, main: document.querySelector('main').clientWidth, page: document.documentElement.scrollWidth, window: window.innerWidth })",
      );
      expect(fit.table).toBeLessThanOrEqual(fit.main);
      expect(fit.page).toBeLessThanOrEqual(fit.window);
      await shot('06-themes');

      await page.click('#themes tbody tr:first-child a:has-text("open")');
      await page.waitForSelector('h1:has-text("Opening hours")');
      await shot('07-theme');

      await page.click('nav.run-tabs >> text=Contrasts');
      await page.waitForSelector('#contrast-grid');
      await shot('08-contrasts');

      await page.click('nav.run-tabs >> text=Answers');
      await page.waitForSelector('.answer-list');
      await shot('09-answers');

      await page.click('nav.run-tabs >> text=Checks');
      await page.waitForSelector('text=Held-out perplexity', { timeout: 60_000 });
      await shot('10-checks');

      await page.click('nav.run-tabs >> text=Export');
      await page.click('#export-form button');
      await page.waitForSelector('#export-files', { timeout: 60_000 });
      await shot('11-export');
      const [download] = await Promise.all([page.waitForEvent('download'), page.click('a[download="answers-by-theme.csv"]')]);
      const saved = join(dir, 'answers-by-theme.csv');
      await download.saveAs(saved);
      const header = readFileSync(saved, 'utf8').replace(/^\uFEFF/, '').split(/\r?\n/)[0];
      expect(header).toContain('branch_region');
      expect(header).toContain('Opening hours');

      await page.click('nav.run-tabs >> text=Apply');
      const wave = join(dir, 'next-wave.csv');
      writeFileSync(
        wave,
        'answer_id,answer,questionnaire_language,link_key,branch_region,channel,age_band,wave,weight\n' +
          'B1,The library should open earlier on Sundays.,en,,Corvane,web,30-44,2027,1\n' +
          'B2,Faltan enchufes para cargar el portátil.,es,,Sarnwick,paper,18-29,2027,1\n',
      );
      await page.setInputFiles('#apply-form input[type="file"]', wave);
      await page.click('#apply-form button[type="submit"]');
      await page.waitForSelector('#applied-download', { timeout: 60_000 });
      await shot('12-apply');

      expect(problems.filter((p) => /Content Security Policy|Refused/.test(p))).toEqual([]);
    });
  });
}
