// Glossary rows as link groups (docs/design.md §3, issue 12). Outside check: a real five-language
// glossary and real short answers from the `emojibase-data` package (MIT; see emojibase-glossary.ts).
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { createFitRun, glossaryLinkKey, glossaryTermsByLanguage, importFile, importGlossary, listGlossaries, prepareCorpus, removeImport } from '../../src/services/index.js';
import * as S from '../../src/store/index.js';
import { InputError } from '../../src/text/types.js';
import { withTempStore } from '../store/helpers.js';
import { EMOJIBASE_LOCALES, csv, emojiAnswersCsv, subgroupGlossaryCsv, subgroupNames } from './emojibase-glossary.js';

let ctx: ReturnType<typeof withTempStore>;
beforeEach(() => (ctx = withTempStore()));
afterEach(() => ctx.cleanup());

const enc = (s: string) => new TextEncoder().encode(s);
const MAPPING = { id: 'id', text: ['text'], language: 'lang', covariates: [] };

async function emojiStudy() {
  return importFile(ctx.store, { study: 'Emoji', bytes: enc(emojiAnswersCsv()), fileName: 'emoji-answers.csv', mapping: MAPPING });
}

async function rejection(p: Promise<unknown>): Promise<InputError> {
  const e = await p.then(() => null, (x: unknown) => x);
  expect(e).toBeInstanceOf(InputError);
  return e as InputError;
}

function stemsOf(tokens: Int32Array, stems: string[]): string[] {
  return Array.from(tokens, (w) => stems[w]);
}

describe('importGlossary', () => {
  it('turns each row of a real five-language glossary into one link group whose stems are the answers\' stems', async () => {
    const answers = await emojiStudy();
    expect(answers.studyLanguages.sort()).toEqual([...EMOJIBASE_LOCALES].sort());
    const before = {
      answers: S.listDocuments(ctx.store, answers.studyId).total,
      languages: S.languageSummary(ctx.store, answers.studyId),
      excluded: S.exclusionSummary(ctx.store, answers.studyId),
      listed: S.listStudies(ctx.store)[0].documents,
      vocabulary: S.vocabularySizes(ctx.store, answers.studyId),
    };
    const bytes = enc(subgroupGlossaryCsv());
    const g = await importGlossary(ctx.store, { study: 'Emoji', bytes, fileName: 'subgroups.csv' });
    const subgroups = subgroupNames();
    expect(g.rows).toBe(subgroups.length);
    expect(g.linkGroups).toBe(subgroups.length);
    expect(g.columns.map((c) => c.language)).toEqual([...EMOJIBASE_LOCALES]);
    // "neutral / skeptical" is two synonyms: every "/" adds a term beyond the one per row.
    const slashes = subgroups.filter((s) => s.names.en.includes('/')).length;
    expect(slashes).toBeGreaterThan(0);
    expect(g.termsPerLanguage.en).toBe(subgroups.length + slashes);

    // The original file is kept byte for byte, as an import of kind 'glossary'.
    const record = S.getImport(ctx.store, g.importId)!;
    expect(record.kind).toBe('glossary');
    expect(S.getImportBytes(ctx.store, g.importId)).toEqual(bytes);
    expect(record.sha256).toBe(S.sha256Hex(bytes));

    // The fit's input holds the rows as link groups of tiny documents, one per language.
    const tokens = S.listDocumentTokens(ctx.store, answers.studyId);
    const byKey = new Map<string, typeof tokens>();
    for (const d of tokens) if (d.linkKey?.startsWith('glossary:')) byKey.set(d.linkKey, [...(byKey.get(d.linkKey) ?? []), d]);
    expect([...byKey.values()].filter((docs) => new Set(docs.map((d) => d.language)).size >= 2).length).toBe(g.linkingRows);
    expect(g.linkingRows).toBeGreaterThan(subgroups.length * 0.9);
    const row1 = byKey.get(glossaryLinkKey(g.importId, 1))!;
    expect(row1.map((d) => d.language).sort()).toEqual([...EMOJIBASE_LOCALES].sort());

    // Stems: each subgroup name was also an answer; its glossary document has the same word ids.
    const glossaryDocs = [...S.iterateDocuments(ctx.store, answers.studyId, { kind: 'glossary' })];
    expect(glossaryDocs.length).toBe(Object.values(g.documentsPerLanguage).reduce((a, b) => a + b, 0));
    const tokenById = new Map(tokens.map((d) => [d.id, d.tokens]));
    let compared = 0;
    for (const language of EMOJIBASE_LOCALES) {
      const stems = S.loadVocabulary(ctx.store, answers.studyId, language).stems;
      for (const [i, s] of subgroups.entries()) {
        const answer = S.listDocuments(ctx.store, answers.studyId, { search: `${language}-sub-${s.key}-1` }).rows[0];
        const term = glossaryDocs.find((d) => d.language === language && d.rowId === String(i + 1))!;
        // An answer whose text was taken to be written in another language has that language's stems.
        if (answer.language !== language) continue;
        const a = tokenById.get(answer.id);
        const t = tokenById.get(term.id);
        expect(Boolean(a), `${language} "${s.names[language]}"`).toBe(Boolean(t));
        if (!a || !t) continue;
        expect(stemsOf(t, stems), `${language} "${s.names[language]}" → "${term.text}"`).toEqual(stemsOf(a, stems));
        compared++;
      }
    }
    expect(compared).toBeGreaterThan(subgroups.length * EMOJIBASE_LOCALES.length * 0.9);

    // Not answers: no count, list, language review or left-out figure changes.
    expect(S.listDocuments(ctx.store, answers.studyId).total).toBe(before.answers);
    expect(S.languageSummary(ctx.store, answers.studyId)).toEqual(before.languages);
    expect(S.exclusionSummary(ctx.store, answers.studyId)).toEqual(before.excluded);
    expect(S.listStudies(ctx.store)[0].documents).toBe(before.listed);
    // The answers alone decide the vocabulary: glossary words count towards no pruning threshold.
    expect(S.vocabularySizes(ctx.store, answers.studyId)).toEqual(before.vocabulary);
    expect([...S.iterateDocuments(ctx.store, answers.studyId)].some((d) => d.question === 'glossary')).toBe(false);

    // Listings for the Data and Languages pages.
    expect(listGlossaries(ctx.store, answers.studyId)).toEqual([expect.objectContaining({ importId: g.importId, fileName: 'subgroups.csv', rows: subgroups.length, linkingRows: g.linkingRows })]);
    expect(glossaryTermsByLanguage(ctx.store, answers.studyId).ja).toEqual({ terms: g.termsPerLanguage.ja, documents: subgroups.length, withWords: g.withWordsPerLanguage.ja });
  });

  it('gives the fit fewer link groups: the glossary rows join their languages', async () => {
    const answers = await emojiStudy();
    const run = createFitRun(ctx.store, 'Emoji', { themes: 4, sweeps: 10, holdout: 0, name: 'before' });
    const without = prepareCorpus(ctx.store, run);
    const g = await importGlossary(ctx.store, { study: answers.studyId, bytes: enc(subgroupGlossaryCsv()), fileName: 'subgroups.csv' });
    const withGlossary = prepareCorpus(ctx.store, run);
    const added = Object.values(g.withWordsPerLanguage).reduce((a, b) => a + b, 0);
    expect(withGlossary.documentIds.length).toBe(without.documentIds.length + added);
    // Answers have no link key (one group each); each glossary row with words is one group.
    const rowsWithWords = new Set(S.listDocumentTokens(ctx.store, answers.studyId).filter((d) => d.linkKey?.startsWith('glossary:')).map((d) => d.linkKey)).size;
    expect(withGlossary.corpus.numGroups).toBe(without.corpus.numGroups + rowsWithWords);
    // Held-out answers are drawn as before; glossary rows are links, never held out.
    const split = prepareCorpus(ctx.store, createFitRun(ctx.store, 'Emoji', { themes: 4, sweeps: 10, holdout: 0.5, name: 'split' }));
    const glossaryIds = new Set(S.listDocumentTokens(ctx.store, answers.studyId).filter((d) => d.glossary).map((d) => d.id));
    expect(glossaryIds.size).toBe(added);
    expect(split.heldOutIds.length).toBeGreaterThan(without.documentIds.length * 0.3);
    expect([...split.heldOutIds].filter((id) => glossaryIds.has(id))).toEqual([]);
    expect([...split.documentIds].filter((id) => glossaryIds.has(id))).toHaveLength(added);
  });

  it('reads synonyms separated by ";" or "/" into one document per language, and skips one-language rows', async () => {
    const answers = await emojiStudy();
    const file = csv([
      ['en', 'es', 'de'],
      ['red apple; apple', 'manzana roja / manzana', 'roter Apfel'],
      ['grinning face', '', ''],
      ['', '', ''],
    ]);
    const g = await importGlossary(ctx.store, { study: 'Emoji', bytes: enc(file), fileName: 'apples.csv' });
    expect(g).toMatchObject({ rows: 3, linkGroups: 1, singleLanguageRows: [2], termsPerLanguage: { en: 2, es: 2, de: 1 } });
    const docs = [...S.iterateDocuments(ctx.store, answers.studyId, { kind: 'glossary' })];
    expect(docs.map((d) => [d.language, d.text, d.linkKey])).toEqual([
      ['en', 'red apple; apple', glossaryLinkKey(g.importId, 1)],
      ['es', 'manzana roja; manzana', glossaryLinkKey(g.importId, 1)],
      ['de', 'roter Apfel', glossaryLinkKey(g.importId, 1)],
    ]);
  });

  it('refuses columns that are not languages of the study, naming them and the study\'s languages', async () => {
    await emojiStudy();
    const e = await rejection(importGlossary(ctx.store, { study: 'Emoji', bytes: enc('English,italiano,notes\napple,mela,fruit\n'), fileName: 'bad.csv' }));
    expect(e.message).toContain('"notes" is not a language');
    expect(e.message).toContain('"italiano (it)" is not a language of this study');
    for (const l of EMOJIBASE_LOCALES) expect(e.message).toContain(l);
    expect(e.file).toBe('bad.csv');
    expect(S.listImports(ctx.store, 1)).toHaveLength(1);
  });

  it('refuses an empty glossary, a file with one language column, and a study that does not exist', async () => {
    await emojiStudy();
    const empty = await rejection(importGlossary(ctx.store, { study: 'Emoji', bytes: enc('en,es\napple,\n,pera\n'), fileName: 'empty.csv' }));
    expect(empty.message).toMatch(/glossary is empty.*2 data rows read, 2 with terms in one language only/);
    const one = await rejection(importGlossary(ctx.store, { study: 'Emoji', bytes: enc('en\napple\n'), fileName: 'one.csv' }));
    expect(one.message).toContain('at least two language columns');
    expect(one.message).toContain('only "en"');
    const twice = await rejection(importGlossary(ctx.store, { study: 'Emoji', bytes: enc('en,English,es\na,b,c\n'), fileName: 'twice.csv' }));
    expect(twice.message).toContain('both name the language en');
    const missing = await rejection(importGlossary(ctx.store, { study: 'Nope', bytes: enc('en,es\na,b\n'), fileName: 'g.csv' }));
    expect(missing.message).toContain('no study called "Nope"');
    S.createStudy(ctx.store, { name: 'Empty', languages: [] });
    const bare = await rejection(importGlossary(ctx.store, { study: 'Empty', bytes: enc('en,es\na,b\n'), fileName: 'g.csv' }));
    expect(bare.message).toContain('has no languages yet: import its answers first');
    expect(S.listImports(ctx.store, 1)).toHaveLength(1);
  });

  it('is deleted like any import: its documents go and the vocabulary is rebuilt', async () => {
    const answers = await emojiStudy();
    const sizes = S.vocabularySizes(ctx.store, answers.studyId);
    const g = await importGlossary(ctx.store, { study: 'Emoji', bytes: enc(subgroupGlossaryCsv()), fileName: 'subgroups.csv' });
    const outcome = await removeImport(ctx.store, g.importId);
    expect(outcome.message).toContain('term document');
    expect([...S.iterateDocuments(ctx.store, answers.studyId, { kind: 'glossary' })]).toHaveLength(0);
    expect(listGlossaries(ctx.store, answers.studyId)).toEqual([]);
    expect(S.vocabularySizes(ctx.store, answers.studyId)).toEqual(sizes);
  });
});
