// themata languages (issue 12): the decision CSV shows declared, written and decided side by
// side, and the review actions of the Languages page work from the command line: accept the
// written language for some answers or all, or set a language by hand. Data: the invented
// survey of test/services/survey-fixture.ts, with two English answers declared Spanish.
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { tempDir } from '../store/helpers.js';
import { FIXTURE_FLAGS, surveyCsv, surveyRows } from '../services/survey-fixture.js';
import { cli } from './cli-harness.js';

let t: ReturnType<typeof tempDir>;
let data: string;

function rowsOf(csv: string): Record<string, string>[] {
  const [header, ...lines] = csv.trim().split('\n');
  const names = header.split(',');
  return lines.map((l) => Object.fromEntries(l.split(',').map((v, i) => [names[i], v])));
}

beforeAll(async () => {
  t = tempDir('themata-cli-languages-');
  data = join(t.dir, 'data');
  const rows = surveyRows(40);
  for (const id of ['r0', 'r2']) rows.find((r) => r.id === id)!.lang = 'es';
  writeFileSync(join(t.dir, 'survey.csv'), surveyCsv(rows));
  for (const [study, extra] of [['Default', []], ['Trusted', ['--trust-declared']]] as const) {
    const r = await cli(['--data', data, 'import', join(t.dir, 'survey.csv'), '--study', study, '--languages', 'en,es', ...FIXTURE_FLAGS, ...extra]);
    expect(r.code, r.stderr).toBe(0);
  }
});
afterAll(() => t.cleanup());

describe('themata languages', () => {
  it('lists declared, written and decided side by side; by default the written language won', async () => {
    const r = await cli(['--data', data, 'languages', '--study', 'Default', '--disagreements']);
    expect(r.code).toBe(0);
    expect(r.stdout.split('\n')[0]).toBe('id,question,language,source,confidence,declared,written,declared check,mixed with,mixed share');
    expect(rowsOf(r.stdout).map((x) => [x.id, x.declared, x.written, x.language, x['declared check']])).toEqual([
      ['r0', 'es', 'en', 'en', 'overruled'],
      ['r2', 'es', 'en', 'en', 'overruled'],
    ]);
  });

  it('accepts the written language for one row, then for all, where declarations were trusted', async () => {
    const before = rowsOf((await cli(['--data', data, 'languages', '--study', 'Trusted', '--disagreements'])).stdout);
    expect(before.map((x) => [x.id, x.language, x.written])).toEqual([
      ['r0', 'es', 'en'],
      ['r2', 'es', 'en'],
    ]);
    const one = await cli(['--data', data, 'languages', '--study', 'Trusted', '--accept-written', 'r2']);
    expect(one.code).toBe(0);
    expect(one.stdout).toMatch(/^Took the written language for 1 answer of 1 row;/);
    const all = await cli(['--data', data, 'languages', '--study', 'Trusted', '--accept-written']);
    expect(all.stdout).toMatch(/^Took the written language for 1 answer;/);
    const after = rowsOf((await cli(['--data', data, 'languages', '--study', 'Trusted', '--disagreements'])).stdout);
    expect(after.map((x) => [x.id, x.declared, x.language, x.source])).toEqual([
      ['r0', 'es', 'en', 'overridden'],
      ['r2', 'es', 'en', 'overridden'],
    ]);
  });

  it('sets a language by hand for listed rows, and says which row or language is wrong', async () => {
    const set = await cli(['--data', data, 'languages', '--study', 'Default', '--set', 'undetermined', '--rows', 'r4,r6']);
    expect(set.code).toBe(0);
    expect(set.stdout).toMatch(/^Set the language of 2 answers to undetermined\./);
    const undetermined = rowsOf((await cli(['--data', data, 'languages', '--study', 'Default', '--undetermined'])).stdout).map((x) => x.id);
    expect(undetermined).toEqual(expect.arrayContaining(['r4', 'r6']));
    const badRow = await cli(['--data', data, 'languages', '--study', 'Default', '--set', 'en', '--rows', 'nope']);
    expect(badRow.code).toBe(2);
    expect(badRow.stderr).toMatch(/--rows: no answer has the row id "nope"/);
    const badLanguage = await cli(['--data', data, 'languages', '--study', 'Default', '--set', 'fr', '--rows', 'r4']);
    expect(badLanguage.code).toBe(2);
    expect(badLanguage.stderr).toMatch(/"fr" is not a language of this study \(en, es\)/);
  });
});
