// The whole command-line journey on a small invented survey (test/services/survey-fixture.ts):
// import → languages → vocabulary → fit → export → apply → checks → contrasts.
import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { gunzipSync, gzipSync } from 'node:zlib';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { tempDir } from '../store/helpers.js';
import { FIXTURE_FLAGS, surveyCsv, surveyRows } from '../services/survey-fixture.js';
import { createFitRun, runFitJob } from '../../src/services/index.js';
import { openStore, setRunStatus } from '../../src/store/index.js';
import { cli } from './cli-harness.js';

const BOM = [0xef, 0xbb, 0xbf];
let t: ReturnType<typeof tempDir>;
let data: string;

function csvText(path: string): { bom: boolean; lines: string[] } {
  const bytes = readFileSync(path);
  const bom = bytes[0] === BOM[0] && bytes[1] === BOM[1] && bytes[2] === BOM[2];
  return { bom, lines: bytes.subarray(bom ? 3 : 0).toString('utf8').split('\r\n').filter((l) => l !== '') };
}

beforeAll(() => {
  t = tempDir('themata-cli-');
  data = join(t.dir, 'data');
  writeFileSync(join(t.dir, 'survey.csv'), surveyCsv(surveyRows(90)));
  writeFileSync(join(t.dir, 'wave2.csv'), surveyCsv(surveyRows(20).map((r) => ({ ...r, id: `new-${r.id}`, link: '' }))));
});
afterAll(() => t.cleanup());

describe('themata command line, end to end', () => {
  it('imports a CSV and prints the summary', async () => {
    const r = await cli(['--data', data, 'import', join(t.dir, 'survey.csv'), '--study', 'Test survey', '--languages', 'en,es', ...FIXTURE_FLAGS]);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/Imported survey\.csv into study "Test survey" \(new study\): 90 rows, 90 answers\./);
    expect(r.stdout).toMatch(/Answers per language: (en|es) \d+, (en|es) \d+/);
    expect(r.stdout).toMatch(/encoding assumed UTF-8/);
    expect(r.stdout).toMatch(/Vocabulary of the study: en \d+ words, es \d+ words/);
  });

  it('lists language decisions as CSV and top words of a language', async () => {
    const out = join(t.dir, 'languages.csv');
    const r = await cli(['--data', data, 'languages', '--study', 'Test survey', '--out', out]);
    expect(r.code).toBe(0);
    const { bom, lines } = csvText(out);
    expect(bom).toBe(true);
    expect(lines[0]).toBe('id,question,language,source,confidence,declared,written,declared check,mixed with,mixed share');
    expect(lines).toHaveLength(91);
    // Formula guard on the id "-3"; its text confirms its declared language (issue 12).
    expect(lines.find((l) => l.startsWith("'-3,"))).toMatch(/^'-3,answer,es,declared,[0-9.]+,es,es,confirmed,,$/);
    const v = await cli(['--data', data, 'vocabulary', '--study', 'Test survey', '--lang', 'en', '--top', '5']);
    expect(v.code).toBe(0);
    expect(v.stdout.split('\n')[1]).toBe('rank\tword\tstem\tcount\tanswers');
    expect(v.stdout.trim().split('\n')).toHaveLength(7);
  });

  it('fits a small model and prints one JSON line with the run name and diagnostics', async () => {
    const r = await cli(['--data', data, 'fit', '--study', 'Test survey', '--themes', '3', '--sweeps', '40', '--burn-in', '10', '--seed', '5', '--covariate', 'region', '--holdout', '0.2', '--name', 'small']);
    // Only the estimate said before the sweeps (issue 15); the progress bar is silent off a terminal.
    expect(r.stderr).toMatch(/^Estimate: [^\n]+\n(Note: [^\n]+\n)*$/);
    expect(r.code).toBe(0);
    const lines = r.stdout.trim().split('\n');
    expect(lines).toHaveLength(1);
    const d = JSON.parse(lines[0]);
    expect(d).toMatchObject({ run: 'small', themes: 3, sweeps: 40, languages: ['en', 'es'] });
    expect(d.heldOutDocuments).toBeGreaterThan(0);
    expect(d.logLikelihoodTrace.last).toBeGreaterThan(d.logLikelihoodTrace.first);
  });

  it('resumes an interrupted fit from its checkpoint', async () => {
    const store = openStore(data);
    try {
      const run = createFitRun(store, 'Test survey', { themes: 2, sweeps: 30, burnIn: 5, checkpointEvery: 5, name: 'half' });
      let sweep = 0;
      await runFitJob({ store, runId: run.id, onProgress: (p) => (sweep = p.sweep ?? sweep), shouldStop: () => sweep >= 10 });
      setRunStatus(store, run.id, 'interrupted');
    } finally {
      store.close();
    }
    const r = await cli(['--data', data, 'resume', '--study', 'Test survey', '--run', 'half']);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    expect(JSON.parse(r.stdout)).toMatchObject({ run: 'half', sweeps: 30 });
    const again = await cli(['--data', data, 'resume', '--study', 'Test survey', '--run', 'half']);
    expect(again.code).toBe(2);
    expect(again.stderr).toMatch(/is finished/);
  });

  it('exports the six files with their headers, a BOM and the formula-injection guard', async () => {
    const dir = join(t.dir, 'export');
    // Without the answer text (its commas would need a CSV reader below); one text column: no question column.
    const r = await cli(['--data', data, 'export', '--study', 'Test survey', '--run', 'small', '--out', dir, '--draws', '200', '--no-answer-text']);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    expect(r.stdout.trim().split('\n').map((p) => p.split(/[\\/]/).pop())).toEqual(['answers-by-theme.csv', 'theme-words.csv', 'theme-shares-by-group.csv', 'codebook.json', 'small.themata-run', 'theme-tables.xlsx']);
    const answers = csvText(join(dir, 'answers-by-theme.csv'));
    expect(answers.bom).toBe(true);
    expect(answers.lines[0]).toBe('id,region,age,language,link key,weight,Theme 1,Theme 2,Theme 3,dominant theme,left out because');
    expect(answers.lines).toHaveLength(91);
    // No cell may start with = + - @ tab or CR: the fixture has ids "-3" and regions "=Coast", "@Hills".
    const cells = answers.lines.slice(1).flatMap((l) => l.split(','));
    expect(cells.filter((c) => /^[=+\-@\t\r]/.test(c))).toEqual([]);
    expect(cells).toContain("'=Coast");
    expect(cells).toContain("'@Hills");
    // Every included answer has shares summing to 1, held-out ones too (fold-in).
    const withShares = answers.lines.slice(1).map((l) => l.split(',')).filter((c) => c[6] !== '');
    expect(withShares.length).toBe(90);
    for (const c of withShares) expect(Number(c[6]) + Number(c[7]) + Number(c[8])).toBeCloseTo(1, 4);
    expect(csvText(join(dir, 'theme-words.csv')).lines[0]).toBe('theme,language,rank,word,stem,probability,exclusivity');
    const shares = csvText(join(dir, 'theme-shares-by-group.csv'));
    expect(shares.lines[0]).toBe('covariate,level,theme,share,low,high,n,effective n');
    const regionRows = shares.lines.filter((l) => l.startsWith('region,'));
    expect(regionRows).toHaveLength(4 * 3);
    for (const l of regionRows) {
      const c = l.split(',');
      expect(Number(c[4])).toBeLessThanOrEqual(Number(c[3]));
      expect(Number(c[5])).toBeGreaterThanOrEqual(Number(c[3]));
    }
    const codebook = JSON.parse(readFileSync(join(dir, 'codebook.json'), 'utf8'));
    expect(codebook.themes).toHaveLength(3);
    expect(Object.keys(codebook.themes[0].words)).toEqual(['en', 'es']);
    // By default the answer text follows the id; --no-workbook leaves the workbook out.
    const full = join(t.dir, 'export-full');
    const r2 = await cli(['--data', data, 'export', '--study', 'Test survey', '--run', 'small', '--out', full, '--draws', '20', '--no-workbook']);
    expect(r2.code).toBe(0);
    expect(r2.stdout).not.toContain('theme-tables.xlsx');
    expect(csvText(join(full, 'answers-by-theme.csv')).lines[0]).toMatch(/^id,answer,region,age,/);
  });

  it('applies the run to a new file, from the database and from the saved bundle alone', async () => {
    const out1 = join(t.dir, 'coded.csv');
    const r1 = await cli(['--data', data, 'apply', '--study', 'Test survey', '--run', 'small', join(t.dir, 'wave2.csv'), '--out', out1]);
    expect(r1.code).toBe(0);
    const coded = csvText(out1);
    expect(coded.bom).toBe(true);
    expect(coded.lines[0]).toBe('id,answer,region,age,language,link key,weight,Theme 1,Theme 2,Theme 3,dominant theme,left out because');
    expect(coded.lines).toHaveLength(21);
    expect(r1.stderr).toMatch(/Coded 20 of 20 answers/);
    const out2 = join(t.dir, 'coded-from-bundle.csv');
    // Another data folder is another installation: its key did not sign the bundle (V5.5.1).
    const args2 = ['--data', join(t.dir, 'no-database'), 'apply', '--bundle', join(t.dir, 'export', 'small.themata-run'), join(t.dir, 'wave2.csv'), '--out', out2, '--text', 'answer', '--id', 'id', '--covariate', 'region'];
    const refused = await cli(args2);
    expect(refused.code).toBe(2);
    expect(refused.stderr).toMatch(/small\.themata-run was saved by another Themata installation.*apply it with --trust-bundle/);
    const r2 = await cli([...args2, '--trust-bundle']);
    expect(r2.code).toBe(0);
    expect(r2.stderr).toMatch(/a bundle of another Themata installation, because --trust-bundle was given/);
    expect(csvText(out2).lines[0]).toBe('id,answer,region,language,link key,weight,Theme 1,Theme 2,Theme 3,dominant theme,left out because');
  });

  it('V5.5.1: applies a bundle this data folder signed, and refuses the same bundle once edited, even with --trust-bundle', async () => {
    const bundleFile = join(t.dir, 'export', 'small.themata-run');
    const args = (bundle: string, out: string) => ['--data', data, 'apply', '--bundle', bundle, join(t.dir, 'wave2.csv'), '--out', out, '--text', 'answer', '--id', 'id', '--covariate', 'region'];
    const ok = await cli(args(bundleFile, join(t.dir, 'coded-signed.csv')));
    expect(ok.code).toBe(0);
    expect(ok.stderr).not.toMatch(/trust/);
    // Relabel a theme inside the signed payload, as someone editing the file would.
    const envelope = JSON.parse(gunzipSync(readFileSync(bundleFile)).toString('utf8'));
    envelope.payload = envelope.payload.replace('"Theme 1"', '"Theme one"');
    const edited = join(t.dir, 'edited.themata-run');
    writeFileSync(edited, gzipSync(JSON.stringify(envelope)));
    for (const extra of [[], ['--trust-bundle']]) {
      const r = await cli([...args(edited, join(t.dir, 'coded-edited.csv')), ...extra]);
      expect(r.code).toBe(2);
      expect(r.stderr).toMatch(/edited\.themata-run was changed after this Themata installation saved it \(its signature does not match\)/);
    }
  });

  it('reports checks and contrasts', async () => {
    const c = await cli(['--data', data, 'checks', '--study', 'Test survey', '--run', 'small', '--json']);
    expect(c.code).toBe(0);
    const checks = JSON.parse(c.stdout);
    expect(checks.perplexity.perplexity).toBeGreaterThan(1);
    expect(checks.coherence.themes.length).toBe(6);
    const out = join(t.dir, 'by-region.csv');
    const k = await cli(['--data', data, 'contrasts', '--study', 'Test survey', '--run', 'small', '--by', 'region', '--out', out, '--draws', '200']);
    expect(k.code).toBe(0);
    expect(csvText(out).lines[0]).toBe('covariate,level,theme,share,low,high,n,effective n');
  });

  it('compares numbers of themes over seeds', async () => {
    const r = await cli(['--data', data, 'compare-k', '--study', 'Test survey', '--themes', '2,3', '--seeds', '2', '--sweeps', '20', '--json']);
    expect(r.code).toBe(0);
    const rows = JSON.parse(r.stdout.trim().split('\n').pop()!);
    expect(rows.map((x: { K: number; runs: number }) => [x.K, x.runs])).toEqual([[2, 2], [3, 2]]);
    for (const row of rows) {
      expect(row.perplexity).toBeGreaterThan(1);
      expect(row.stability).toBeGreaterThan(0);
      expect(row.stability).toBeLessThanOrEqual(1 + 1e-9);
    }
  });

  it('answers a user error with one clear line on stderr and exit code 2', async () => {
    const r = await cli(['--data', data, 'import', join(t.dir, 'survey.csv'), '--study', 'Other', '--text', 'nope']);
    expect(r.code).toBe(2);
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
    expect(r.stderr).toMatch(/nope/);
    const missing = await cli(['--data', data, 'fit', '--study', 'No such study', '--themes', '3']);
    expect(missing.code).toBe(2);
    expect(missing.stderr).toMatch(/no study called "No such study"/);
    const badRun = await cli(['--data', data, 'export', '--study', 'Test survey', '--run', 'nope', '--out', t.dir]);
    expect(badRun.code).toBe(2);
    const usage = await cli(['--data', data, 'fit', '--study', 'Test survey']);
    expect(usage.code).toBe(2);
    expect(usage.stderr).toMatch(/--themes/);
  });
});
