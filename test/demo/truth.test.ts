// truth.json says what the rows contain: same rows, link groups share one mixture, and each
// answer's text carries the key words of exactly the themes planted in it.
import { describe, expect, it } from 'vitest';
import { DEFAULT_ANSWERS, DEFAULT_SEED, DEMO_LANGUAGES, THEME_IDS, generateDemo, type DemoLanguage } from '../../demo/index.js';
import { crossThemeWords, segmentWords } from '../../demo/key-words.js';
import { stripAccents } from '../../demo/compose.js';

const { rows, truth } = generateDemo({ answers: DEFAULT_ANSWERS, seed: DEFAULT_SEED });
const truthRows = truth.rows!;
const fold = (w: string) => stripAccents(w).toLowerCase();

describe('demo truth', () => {
  it('has one truth row per CSV row, in the same order', () => {
    expect(truthRows.length).toBe(rows.length);
    expect(truthRows.map((t) => t.answer_id)).toEqual(rows.map((r) => r.answer_id));
    expect(truth.counts.rows).toBe(rows.length);
  });

  it('gives each answer a mixture that sums to one and themes that match its sentence counts', () => {
    for (const t of truthRows) {
      if (t.kind === 'non-answer') {
        expect(t.mixture).toBeNull();
        expect(t.themes).toEqual([]);
        continue;
      }
      expect(Math.abs(t.mixture!.reduce((s, x) => s + x, 0) - 1)).toBeLessThan(1e-3);
      expect([...t.themes].sort()).toEqual(THEME_IDS.filter((_, k) => t.sentences[k] > 0).sort());
    }
  });

  it('puts an answer and its translation in one link group with one mixture and different languages', () => {
    const groups = new Map<string, number[]>();
    rows.forEach((r, i) => r.link_key && groups.set(r.link_key, [...(groups.get(r.link_key) ?? []), i]));
    expect(groups.size).toBeGreaterThan(0.08 * rows.length);
    for (const [key, members] of groups) {
      expect(members, key).toHaveLength(2);
      const [a, b] = members.map((i) => truthRows[i]);
      expect(b.kind).toBe('translation');
      expect(b.translationOf).toBe(a.answer_id);
      expect(b.mixture).toEqual(a.mixture);
      expect(b.language).not.toBe(a.language);
      expect(rows[members[1]].weight).toBe(rows[members[0]].weight);
    }
  });

  it('declares the written language except where a mismatch is planted', () => {
    rows.forEach((r, i) => {
      const t = truthRows[i];
      if (t.language === null) return;
      expect(r.questionnaire_language === t.language, r.answer_id).toBe(!t.declaredMismatch);
    });
    expect(truth.counts.declaredMismatch).toBeGreaterThan(50);
  });

  it('writes the key words of every planted theme and of no other theme (rows without typos)', () => {
    const words = Object.fromEntries(
      truth.themes.map((th) => [th.id, Object.fromEntries(DEMO_LANGUAGES.map((l) => [l, new Set(th.keyWords[l].map(fold))]))]),
    ) as Record<string, Record<DemoLanguage, Set<string>>>;
    let checked = 0;
    rows.forEach((r, i) => {
      const t = truthRows[i];
      if (t.kind === 'non-answer' || t.typos || t.mixedWith) return;
      const seen = new Set(segmentWords(r.answer, t.language!).map(fold));
      for (const theme of THEME_IDS) {
        const hit = [...words[theme][t.language!]].some((w) => seen.has(w));
        expect(hit, `${r.answer_id} ${theme}: ${r.answer}`).toBe(t.themes.includes(theme));
      }
      checked++;
    });
    expect(checked).toBeGreaterThan(3000);
  });

  it('gives every theme at least 30 key words in every language and shares none across themes', () => {
    for (const th of truth.themes) for (const l of DEMO_LANGUAGES) expect(th.keyWords[l].length, `${th.id} ${l}`).toBeGreaterThanOrEqual(30);
    for (const l of DEMO_LANGUAGES) expect([...crossThemeWords(l).keys()], l).toEqual([]);
  });

  it('carries the planted noise: non-answers, mixed languages, long answers, emoji, a few hundred in Japanese', () => {
    const c = truth.counts;
    expect(c.nonAnswers).toBeGreaterThan(100);
    expect(c.mixed).toBeGreaterThan(20);
    expect(c.long).toBeGreaterThan(20);
    expect(c.emoji).toBeGreaterThan(100);
    expect(c['language:ja']).toBeGreaterThan(200);
    expect(c['language:ja']).toBeLessThan(600);
    for (const l of DEMO_LANGUAGES) expect(c[`language:${l}`], l).toBeGreaterThan(200);
  });
});

describe('demo phrase material', () => {
  it('has 10 templates and 12 fillers per theme in every language, so translations line up by index', async () => {
    const { PHRASES } = await import('../../demo/phrases/index.js');
    for (const l of DEMO_LANGUAGES) {
      for (const theme of THEME_IDS) {
        expect(PHRASES[l].themes[theme].templates.length, `${l} ${theme}`).toBe(10);
        expect(PHRASES[l].themes[theme].fillers.length, `${l} ${theme}`).toBe(12);
      }
    }
  });
});

describe('demo README', () => {
  it('quotes the shipped counts and planted-effect shares of truth.json', async () => {
    const { readFileSync } = await import('node:fs');
    const { join } = await import('node:path');
    const { DEMO_DIR } = await import('../../demo/generate.js');
    const readme = readFileSync(join(DEMO_DIR, 'README.md'), 'utf8');
    const n = (x: number) => x.toLocaleString('en-US');
    expect(readme).toContain(`${n(truth.counts.answers)} original answers, ${n(truth.counts.translations)} translations, ${n(truth.counts.nonAnswers)} non-answers`);
    for (const e of truth.effects) expect(readme).toContain(`| ${e.meanShareAtLevel.toFixed(2)} | ${e.meanShareElsewhere.toFixed(2)} |`);
  });
});
