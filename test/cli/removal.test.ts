// `themata remove-study`, `remove-import` and `remove-run` (OWASP ASVS 4.0.3 V8.3.2): without
// --yes they say what would go and change nothing; with --yes they delete; an import a run was
// fitted on is refused with a message naming the run.
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createFitRun, runFitJob } from '../../src/services/index.js';
import { getStudyByName, listImports, listRuns, openStore } from '../../src/store/index.js';
import { FIXTURE_FLAGS, surveyCsv, surveyRows } from '../services/survey-fixture.js';
import { tempDir } from '../store/helpers.js';
import { cli } from './cli-harness.js';

let t: ReturnType<typeof tempDir>;
let data: string;

function counts() {
  const store = openStore(data);
  try {
    const study = getStudyByName(store, 'Survey');
    return study ? { imports: listImports(store, study.id).map((i) => i.fileName), runs: listRuns(store, study.id).map((r) => r.name) } : null;
  } finally {
    store.close();
  }
}

beforeAll(async () => {
  t = tempDir('themata-cli-remove-');
  data = join(t.dir, 'data');
  writeFileSync(join(t.dir, 'first.csv'), surveyCsv(surveyRows(60)));
  writeFileSync(join(t.dir, 'second.csv'), surveyCsv(surveyRows(20).map((r) => ({ ...r, id: `b-${r.id}`, link: '' }))));
  for (const file of ['first.csv', 'second.csv']) expect((await cli(['--data', data, 'import', join(t.dir, file), '--study', 'Survey', ...FIXTURE_FLAGS])).code).toBe(0);
  const store = openStore(data);
  const run = createFitRun(store, 'Survey', { themes: 2, sweeps: 6, burnIn: 2, sampler: 'reference', name: 'k2' });
  await runFitJob({ store, runId: run.id });
  store.close();
});
afterAll(() => t.cleanup());

describe('themata remove-*', () => {
  it('without --yes says what would be removed and removes nothing', async () => {
    const run = await cli(['--data', data, 'remove-run', '--study', 'Survey', '--run', 'k2']);
    expect(run.code).toBe(0);
    expect(run.stdout).toMatch(/^Would delete run "k2" \(finished\) of study "Survey": \d+ stored results, 0 checkpoints, 0 theme labels and 0 exported files\.\nNothing was deleted\. Add --yes to delete\.\n$/);
    const study = await cli(['--data', data, 'remove-study', '--study', 'Survey']);
    expect(study.code).toBe(0);
    expect(study.stdout).toMatch(/^Would delete study "Survey": 2 imported files \(\d+\.\d kB of original files\), 80 answers, .*1 run with/);
    expect(study.stdout).toContain('Nothing was deleted. Add --yes to delete.');
    expect(counts()).toEqual({ imports: ['first.csv', 'second.csv'], runs: ['k2'] });
  });

  it('refuses to remove an import a run was fitted on, naming the run, and lists the files when the name is wrong', async () => {
    const refused = await cli(['--data', data, 'remove-import', '--study', 'Survey', '--import', 'second.csv', '--yes']);
    expect(refused.code).toBe(2);
    expect(refused.stderr).toBe('themata: Run "k2" was fitted on answers of second.csv. Delete that run first (Runs page, or themata remove-run), then delete the file: a run\'s results need the answers it was fitted on.\n');
    const unknown = await cli(['--data', data, 'remove-import', '--study', 'Survey', '--import', 'third.csv']);
    expect(unknown.code).toBe(2);
    expect(unknown.stderr).toMatch(/has no imported file "third\.csv"\. Its files \(number, name\): \d+ first\.csv \(60 answers\); \d+ second\.csv \(20 answers\)/);
    expect(counts()).toEqual({ imports: ['first.csv', 'second.csv'], runs: ['k2'] });
  });

  it('with --yes removes a run, then an import, then the study', async () => {
    const run = await cli(['--data', data, 'remove-run', '--study', 'Survey', '--run', 'k2', '--yes']);
    expect(run.code).toBe(0);
    expect(run.stdout).toMatch(/^Deleted run "k2" of study "Survey": /);
    const imp = await cli(['--data', data, 'remove-import', '--study', 'Survey', '--import', 'second.csv', '--yes']);
    expect(imp.code).toBe(0);
    expect(imp.stdout).toContain('Deleted second.csv from study "Survey": the original file and 20 answers');
    expect(counts()).toEqual({ imports: ['first.csv'], runs: [] });
    const study = await cli(['--data', data, 'remove-study', '--study', 'Survey', '--yes', '--vacuum']);
    expect(study.code).toBe(0);
    expect(study.stdout).toMatch(/^Deleted study "Survey": 1 imported file .*60 answers/);
    expect(study.stdout).toContain('The data file was rewritten (VACUUM)');
    expect(counts()).toBeNull();
    const again = await cli(['--data', data, 'remove-study', '--study', 'Survey', '--yes']);
    expect(again.code).toBe(2);
    expect(again.stderr).toContain('There is no study called "Survey"');
  });
});
