// On the demo study (demo/, invented for Themata; truth.json marks what was planted): answers
// written in another language than the questionnaire's (`declaredMismatch`) get the language
// they are written in, the declared one staying beside it; answers mixing two languages
// (`mixedWith`) go by their majority language and are flagged; and the vocabulary of each
// language holds no other language's function words ("the", "and" in French).
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { DEMO_COLUMNS, DEMO_FILE_NAMES, DEMO_LANGUAGES, type DemoTruth } from '../../../demo/index.js';
import { DEMO_DIR } from '../../../demo/generate.js';
import { DECLARED_PRIOR, defaultPipelineSettings, identifyLanguages, mapColumns, prepareText, readTable, type LanguageDecision, type MappedDocument } from '../../../src/text/index.js';

const languages = [...DEMO_LANGUAGES];
const truth: DemoTruth = JSON.parse(readFileSync(join(DEMO_DIR, DEMO_FILE_NAMES.truth), 'utf8'));
const rows = truth.rows!;
let docs: MappedDocument[] = [];
let decisions: LanguageDecision[] = [];
let trusted: LanguageDecision[] = [];

beforeAll(async () => {
  const table = await readTable(new Uint8Array(readFileSync(join(DEMO_DIR, DEMO_FILE_NAMES.csv))), DEMO_FILE_NAMES.csv);
  docs = mapColumns(table, DEMO_COLUMNS, { languages });
  const texts = docs.map((d) => d.text);
  const declared = docs.map((d) => d.declaredLanguage);
  decisions = identifyLanguages(texts, { languages, declared, declaredPrior: DECLARED_PRIOR });
  trusted = identifyLanguages(texts, { languages, declared });
});

describe('demo study: the written language, not the questionnaire, decides', () => {
  it('gives answers declared in another language the language they are written in', () => {
    const mismatched = rows.map((t, i) => ({ t, i })).filter(({ t, i }) => t.language !== null && docs[i].declaredLanguage !== undefined && docs[i].declaredLanguage !== t.language);
    const right = mismatched.filter(({ t, i }) => decisions[i].language === t.language);
    const before = mismatched.filter(({ t, i }) => trusted[i].language === t.language);
    const wrong = mismatched.filter(({ t, i }) => decisions[i].language !== t.language).map(({ t, i }) => `${t.answer_id} ${docs[i].declaredLanguage}/${t.language}→${decisions[i].language}: ${docs[i].text.slice(0, 50)}`);
    console.log(`demo answers declared in another language than written: ${mismatched.length}; written language found ${right.length} (trusting the declaration: ${before.length}); missed: ${wrong.slice(0, 8).join(' | ')}`);
    expect(mismatched.length).toBeGreaterThanOrEqual(100);
    expect(before.length).toBe(0);
    expect(right.length / mismatched.length).toBeGreaterThanOrEqual(0.95);
    for (const { i } of right) {
      expect(decisions[i].declaredCheck).toBe('overruled');
      expect(decisions[i].written).toBe(decisions[i].language);
    }
  });

  it('keeps the declaration of every other answer that has a language', () => {
    let n = 0;
    let kept = 0;
    rows.forEach((t, i) => {
      if (t.language === null || docs[i].declaredLanguage !== t.language) return;
      n++;
      if (decisions[i].language === t.language) kept++;
    });
    console.log(`demo answers declared in their own language: ${kept}/${n} keep it`);
    expect(kept / n).toBeGreaterThanOrEqual(0.998);
  });

  it('flags answers mixing two languages and decides them by their majority language', () => {
    const mixed = rows.map((t, i) => ({ t, i })).filter(({ t }) => t.mixedWith !== undefined);
    const flagged = mixed.filter(({ i }) => decisions[i].mixed !== undefined);
    const majority = mixed.filter(({ t, i }) => decisions[i].language === t.language);
    const rightSecond = flagged.filter(({ t, i }) => decisions[i].mixed!.language === t.mixedWith);
    const falseFlags = rows.filter((t, i) => t.mixedWith === undefined && decisions[i].mixed !== undefined).length;
    console.log(`demo mixed answers: ${mixed.length}; flagged ${flagged.length} (second language right ${rightSecond.length}); main language right ${majority.length}; flagged but not mixed: ${falseFlags}`);
    expect(mixed.length).toBeGreaterThan(30);
    expect(flagged.length / mixed.length).toBeGreaterThanOrEqual(0.9);
    expect(rightSecond.length).toBe(flagged.length);
    expect(majority.length / mixed.length).toBeGreaterThanOrEqual(0.9);
    expect(falseFlags).toBeLessThanOrEqual(rows.length * 0.005);
  });

  it('keeps English words out of the French vocabulary, but for the English sentences of mixed answers', () => {
    const settings = defaultPipelineSettings();
    const foreign = ['the', 'and', 'please'];
    const countsIn = (d: LanguageDecision[]) => {
      const v = prepareText(docs.map((x, i) => ({ language: d[i].language, text: x.text })), settings).vocabularies.find((x) => x.language === 'fr')!;
      return foreign.map((w) => {
        const id = v.surfaces.indexOf(w);
        return id < 0 ? 0 : v.counts[id];
      });
    };
    const before = countsIn(trusted);
    const after = countsIn(decisions);
    console.log(`"the", "and", "please" in the French vocabulary: trusting declarations ${before.join(', ')}; written language ${after.join(', ')}`);
    expect(before.reduce((s, n) => s + n, 0)).toBeGreaterThan(20);
    // What is left comes from mixed answers (a French majority with one English sentence) and
    // "thé" typed without its accent.
    expect(after.reduce((s, n) => s + n, 0)).toBeLessThanOrEqual(0.1 * before.reduce((s, n) => s + n, 0));
  });
});
