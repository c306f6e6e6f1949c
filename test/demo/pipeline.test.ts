// End to end on the demo study (issue 3, item 4): the committed files go through the text
// pipeline (import → language → tokens → vocabulary) and the result is checked against truth.json.
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { DEMO_COLUMNS, DEMO_FILE_NAMES, DEMO_LANGUAGES, type DemoTruth } from '../../demo/index.js';
import { DEMO_DIR } from '../../demo/generate.js';
import { keyWords, segmentWords } from '../../demo/key-words.js';
import {
  defaultPipelineSettings, identifyLanguages, mapColumns, prepareText, readTable, stemmerFor,
  type LanguageDecision, type MappedDocument, type PreparedText,
} from '../../src/text/index.js';

const languages = [...DEMO_LANGUAGES];
const truth: DemoTruth = JSON.parse(readFileSync(join(DEMO_DIR, DEMO_FILE_NAMES.truth), 'utf8'));
const truthRows = truth.rows!;
let docs: MappedDocument[] = [];
let decisions: LanguageDecision[] = [];
let prepared: PreparedText;

async function importDemo(file: string): Promise<MappedDocument[]> {
  const table = await readTable(new Uint8Array(readFileSync(join(DEMO_DIR, file))), file);
  return mapColumns(table, DEMO_COLUMNS, { languages });
}

beforeAll(async () => {
  docs = await importDemo(DEMO_FILE_NAMES.csv);
  // The declared-language column is withheld: the text alone decides.
  decisions = identifyLanguages(docs.map((d) => d.text), { languages });
  prepared = prepareText(docs.map((d, i) => ({ language: decisions[i].language, text: d.text })), defaultPipelineSettings());
});

function vocabularyOf(language: string) {
  const v = prepared.vocabularies.find((x) => x.language === language);
  if (v === undefined) throw new Error(`no ${language} vocabulary`);
  return v;
}

describe('demo study through the text pipeline', () => {
  it('imports every row of the CSV with its id, text, link key, covariates and weight', () => {
    expect(docs.length).toBe(truthRows.length);
    docs.forEach((d, i) => expect(d.rowId).toBe(truthRows[i].answer_id));
    const linked = docs.filter((d) => d.linkKey);
    expect(linked.length).toBe(2 * new Set(linked.map((d) => d.linkKey)).size);
    expect(new Set(docs.map((d) => d.covariates.branch_region))).toEqual(new Set(['Corvane', 'Lunmere', 'Ostrevale', 'Sarnwick']));
    expect(docs.every((d) => d.weight > 0)).toBe(true);
  });

  it('imports the XLSX to the same documents as the CSV', async () => {
    const fromXlsx = await importDemo(DEMO_FILE_NAMES.xlsx);
    const strip = (d: MappedDocument) => ({ id: d.rowId, text: d.text, lang: d.declaredLanguage, link: d.linkKey ?? '', cov: d.covariates, w: d.weight });
    expect(fromXlsx.map(strip)).toEqual(docs.map(strip));
  });

  it('finds the written language of at least 98% of answers with 4+ words, declared column withheld', () => {
    let n = 0;
    let right = 0;
    const wrong: string[] = [];
    truthRows.forEach((t, i) => {
      if (t.language === null || segmentWords(docs[i].text, t.language).length < 4) return;
      n++;
      if (decisions[i].language === t.language) right++;
      else wrong.push(`${t.answer_id} ${t.language}→${decisions[i].language}: ${docs[i].text.slice(0, 60)}`);
    });
    console.log(`demo language accuracy: ${right}/${n} = ${((100 * right) / n).toFixed(2)}%; wrong: ${wrong.slice(0, 10).join(' | ')}`);
    expect(n).toBeGreaterThan(3500);
    expect(right / n).toBeGreaterThanOrEqual(0.98);
  });

  it('leaves answers with no language to tell ("-", "?", emoji) undetermined', () => {
    const symbolsOnly = truthRows.filter((t, i) => t.language === null && !/\p{L}/u.test(docs[i].text));
    expect(symbolsOnly.length).toBeGreaterThan(20);
    for (const t of symbolsOnly) {
      const i = truthRows.indexOf(t);
      expect(decisions[i].language, `${t.answer_id} ${docs[i].text}`).toBeNull();
    }
  });

  // Known misses, listed rather than hidden: demo non-answers the pipeline does not set aside.
  // None at present.
  const KNOWN_MISSES = new Set<string>([]);
  // Once missed: lexicon gaps, and very short answers put in another language and looked up in
  // that language's lexicon only. Each must now be excluded as a non-answer.
  const ONCE_MISSED = ['idk', 'no idea', 'no comment', 'tout va bien', 'nada en especial', 'rien à signaler', 'RAS', 'rien de spécial', 'passt so', 'nix', '大丈夫です', 'ないです', '別に'];

  it('excludes the once-missed non-answers ("idk", "tout va bien", "RAS", "nix", "大丈夫です" …) as non-answers', () => {
    const seen = new Set<string>();
    docs.forEach((d, i) => {
      if (!ONCE_MISSED.includes(d.text)) return;
      seen.add(d.text);
      expect(prepared.documents[i].excluded, `${d.rowId} "${d.text}" (${decisions[i].language})`).toBe('non-answer');
    });
    // The committed demo holds most of them (the rest are covered in test/text/tokens).
    expect(seen.size).toBeGreaterThanOrEqual(8);
  });

  it('sets every non-answer aside (undetermined or excluded) and keeps its words out of every vocabulary', () => {
    const nonAnswers = truthRows.map((t, i) => (t.kind === 'non-answer' ? i : -1)).filter((i) => i >= 0);
    expect(nonAnswers.length).toBeGreaterThan(100);
    const missed = new Set<string>();
    const missedRows = new Set<number>();
    const unexplained: string[] = [];
    for (const i of nonAnswers) {
      const d = prepared.documents[i];
      if (decisions[i].language === null || d.excluded !== null) {
        expect(d.tokens.length, `${docs[i].rowId} "${docs[i].text}"`).toBe(0);
        continue;
      }
      missed.add(`${docs[i].text} (${decisions[i].language})`);
      missedRows.add(i);
      // Only a listed known miss is allowed; anything else is a new failure.
      if (!KNOWN_MISSES.has(docs[i].text)) unexplained.push(`${docs[i].text} (${decisions[i].language})`);
    }
    console.log(`demo non-answers not set aside: ${missed.size} kinds: ${[...missed].join(' | ') || 'none'}`);
    expect(unexplained).toEqual([]);
    // Without the non-answers that were set aside the vocabularies come out identical: they
    // contributed nothing to any of them.
    const keep = truthRows.map((t, i) => t.kind !== 'non-answer' || missedRows.has(i));
    const without = prepareText(
      docs.flatMap((d, i) => (keep[i] ? [{ language: decisions[i].language, text: d.text }] : [])),
      defaultPipelineSettings(),
    );
    const summary = (p: PreparedText) => p.vocabularies.map((v) => ({ language: v.language, stems: v.stems, counts: [...v.counts] }));
    expect(summary(without)).toEqual(summary(prepared));
  });

  it('segments Japanese into words: the key words of the planted themes are vocabulary entries', () => {
    const ja = vocabularyOf('ja');
    const entries = new Set([...ja.stems, ...ja.surfaces]);
    const keys = truth.themes.flatMap((th) => th.keyWords.ja);
    const found = keys.filter((w) => entries.has(w));
    expect(found.length / keys.length).toBeGreaterThan(0.8);
    // No entry is a whole unsegmented phrase.
    expect(Math.max(...ja.surfaces.map((s) => [...s].length))).toBeLessThanOrEqual(10);
    const jaDocs = prepared.documents.filter((d, i) => truthRows[i].language === 'ja' && truthRows[i].kind !== 'non-answer' && d.excluded === null);
    expect(jaDocs.length).toBeGreaterThan(300);
    const meanTokens = jaDocs.reduce((s, d) => s + d.tokens.length, 0) / jaDocs.length;
    expect(meanTokens).toBeGreaterThan(5);
  });

  it('keeps the themes apart after stemming: no stem of one theme\'s key words belongs to another', () => {
    const words = keyWords();
    for (const language of languages) {
      const stem = stemmerFor(language, defaultPipelineSettings());
      const owner = new Map<string, string>();
      const clashes: string[] = [];
      for (const th of truth.themes) {
        for (const w of words[th.id][language]) {
          const s = stem(w);
          const o = owner.get(s);
          if (o !== undefined && o !== th.id) clashes.push(`${s} (${o}, ${th.id}:${w})`);
          owner.set(s, th.id);
        }
      }
      expect(clashes, language).toEqual([]);
    }
  });

  it('builds one vocabulary per demo language, each with more than 150 stems', () => {
    expect(prepared.vocabularies.map((v) => v.language).sort()).toEqual([...languages].sort());
    for (const language of languages) expect(vocabularyOf(language).stems.length, language).toBeGreaterThan(150);
  });
});
