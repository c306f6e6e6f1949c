// Apply needs only the text column (issue 14): the other mapped columns are used when the new
// file has them; every answer without shares says why; a covariate level the fit never saw is
// coded with the reference level's prior and the result says so. Export's answers-by-theme has
// the answer text and the reason, and no question column or group for a one-question study.
// Invented survey (survey-fixture.ts).
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { applyRun } from '../../src/services/apply-run.js';
import { buildBundle, exportRun, exportTables } from '../../src/services/export-run.js';
import { createFitRun, importFile, loadRunModel, runFitJob, type RunBundle } from '../../src/services/index.js';
import { InputError } from '../../src/text/types.js';
import { withTempStore } from '../store/helpers.js';
import { FIXTURE_MAPPING, surveyCsv, surveyRows } from './survey-fixture.js';

const enc = (s: string) => new TextEncoder().encode(s);
const decode = (b: Uint8Array) => new TextDecoder().decode(b.slice(3));
/** Minimal RFC 4180 reader for the files under test (quoted cells may hold commas). */
function parseCsv(text: string): string[][] {
  const rows: string[][] = [];
  let row: string[] = [];
  let cell = '';
  let quoted = false;
  for (let i = 0; i < text.length; i++) {
    const c = text[i];
    if (quoted) {
      if (c === '"' && text[i + 1] === '"') (cell += '"'), i++;
      else if (c === '"') quoted = false;
      else cell += c;
    } else if (c === '"') quoted = true;
    else if (c === ',') row.push(cell), (cell = '');
    else if (c === '\r') continue;
    else if (c === '\n') row.push(cell), rows.push(row), (row = []), (cell = '');
    else cell += c;
  }
  return rows;
}

let ctx: ReturnType<typeof withTempStore>;
let bundle: RunBundle;
let runId: number;
beforeAll(async () => {
  ctx = withTempStore();
  const rows = surveyRows(90);
  // One non-answer in the study, so the export has a row without shares and its reason.
  rows[5] = { ...rows[5], answer: 'n/a', lang: 'en' };
  const s = await importFile(ctx.store, { study: 'Library', bytes: enc(surveyCsv(rows)), fileName: 'wave1.csv', mapping: FIXTURE_MAPPING, languages: ['en', 'es'] });
  const run = createFitRun(ctx.store, s.studyId, { themes: 3, sweeps: 20, burnIn: 5, seed: 7, covariates: ['region', 'age'] });
  await runFitJob({ store: ctx.store, runId: run.id });
  runId = run.id;
  bundle = buildBundle(ctx.store, loadRunModel(ctx.store, run.id)!);
});
afterAll(() => ctx.cleanup());

describe('Apply with a partial file', () => {
  it('codes a file with only the text column, listing the mapped columns it lacks', async () => {
    const csv = 'answer\nthe wifi is slow and the computers are old\nmás cuentos para niños y familias\n';
    const { file, summary } = await applyRun(bundle, { bytes: enc(csv), fileName: 'only-text.csv' });
    expect(summary.coded).toBe(2);
    expect(summary.missingColumns).toEqual([
      { column: 'region', role: 'covariate' },
      { column: 'age', role: 'covariate' },
      { column: 'id', role: 'id' },
      { column: 'lang', role: 'language' },
      { column: 'link', role: 'link key' },
      { column: 'weight', role: 'weight' },
    ]);
    // The prior's covariates are absent: said per covariate and per row.
    expect(summary.covariateNotes.map((n) => [n.covariate, n.kind, n.answers])).toEqual([
      ['region', 'absent', 2],
      ['age', 'absent', 2],
    ]);
    const [header, first] = parseCsv(decode(file.bytes));
    expect(header.slice(0, 2)).toEqual(['id', 'answer']);
    expect(header).not.toContain('question');
    expect(header.slice(-3)).toEqual(['dominant theme', 'left out because', 'coding note']);
    expect(first[1]).toBe('the wifi is slow and the computers are old');
    expect(first.at(-1)).toContain('region not in the file: the prior of the reference level');
    expect(first.at(-1)).toMatch(/age not in the file: the fit's mean \(\d/);
  });

  it('refuses a file without the text column, naming the column and the file\'s columns at once', async () => {
    let err: unknown;
    try {
      await applyRun(bundle, { bytes: enc('id,comment,region\n1,hello,North\n'), fileName: 'no-text.csv' });
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(InputError);
    expect((err as InputError).message).toBe(
      'no-text.csv: the answers must be in a column "answer" (the run\'s text column), but the file has none of them. Its columns are: "id", "comment", "region". Rename the answer column, or say which column holds the text (--text COL).',
    );
  });

  it('says why an answer has no shares: a non-answer, an undetermined language', async () => {
    const csv = 'id,answer,region\nx1,n/a,North\nx2,the wifi keeps dropping on my laptop,South\nx3,"12345 67890",North\n';
    const { file, summary } = await applyRun(bundle, { bytes: enc(csv), fileName: 'reasons.csv' });
    expect(summary.coded).toBe(1);
    const rows = parseCsv(decode(file.bytes));
    const reason = rows[0].indexOf('left out because');
    expect(rows[1][0]).toBe('x1');
    expect(rows[1][reason]).toBe('non-answer');
    expect(rows[2][reason]).toBe('');
    expect(rows[3][reason]).toMatch(/^(language undetermined|no words after filtering)$/);
  });

  it('accepts a region the fit never saw, coding it with the reference level\'s prior and saying so', async () => {
    const csv = 'id,answer,region,age\nw1,the wifi is slow,Islands,40\nw2,longer opening hours on weekends,North,30\nw3,faster wifi please,Islands,22\n';
    const { file, summary } = await applyRun(bundle, { bytes: enc(csv), fileName: 'wave3.csv' });
    expect(summary.coded).toBe(3);
    const levels = bundle.encoding!.levels[bundle.encoding!.specs.findIndex((s) => s.column === 'region')]!;
    expect(summary.covariateNotes).toEqual([
      { covariate: 'region', kind: 'new levels', levels: ['Islands'], levelCount: 1, answers: 2, codedAs: `the prior of the reference level "${levels[0]}"` },
    ]);
    const rows = parseCsv(decode(file.bytes));
    const note = rows[0].indexOf('coding note');
    expect(rows[1][note]).toBe(`region "Islands" not seen in the fit: prior of the reference level "${levels[0]}"`);
    expect(rows[2][note]).toBe('');
    // The prior really is the reference level's: the same answer coded as the reference gets the same mixture.
    const asRef = await applyRun(bundle, { bytes: enc(csv.replace(/Islands/g, levels[0])), fileName: 'wave3.csv' });
    const share = (b: Uint8Array) => parseCsv(decode(b))[1].slice(rows[0].indexOf('weight') + 1, rows[0].indexOf('dominant theme'));
    expect(share(file.bytes)).toEqual(share(asRef.file.bytes));
  });
});

describe('answers-by-theme.csv from Export', () => {
  it('writes the answer text and the reason, and no question column or question group for one text column', () => {
    const model = loadRunModel(ctx.store, runId)!;
    const files = exportRun(ctx.store, model, { draws: 20 });
    const answers = parseCsv(decode(files.find((f) => f.name === 'answers-by-theme.csv')!.bytes));
    expect(answers[0].slice(0, 3)).toEqual(['id', 'answer', 'region']);
    expect(answers[0]).not.toContain('question');
    const reason = answers[0].indexOf('left out because');
    const na = answers.find((r) => r[1] === 'n/a')!;
    expect(na[reason]).toBe('non-answer');
    expect(na[answers[0].indexOf('dominant theme')]).toBe('');
    const coded = answers.filter((r, i) => i > 0 && r[reason] === '');
    expect(coded.length).toBe(answers.length - 2);
    const shares = decode(files.find((f) => f.name === 'theme-shares-by-group.csv')!.bytes);
    expect(shares).not.toMatch(/\r\nquestion,/);
    expect(shares).toMatch(/\r\nregion,/);
  });

  it('leaves the text out when asked', () => {
    const t = exportTables(ctx.store, loadRunModel(ctx.store, runId)!, { draws: 10, answerText: false });
    expect(t.answers.header.slice(0, 2)).toEqual(['id', 'region']);
  });
});
