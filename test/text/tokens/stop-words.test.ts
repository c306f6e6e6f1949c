import { describe, expect, it } from 'vitest';
import { isNonAnswer, openStopWords, stopWordSet, SURVEY_LEXICONS, surveyLexicon } from '../../../src/text/tokens/index.js';

describe('survey lexicons (lexicons/survey-fillers)', () => {
  it('ship for at least en, es, fr, de, it, pt, nl, ja, zh, each stating its provenance', () => {
    for (const language of ['en', 'es', 'fr', 'de', 'it', 'pt', 'nl', 'ja', 'zh']) {
      const lexicon = surveyLexicon(language);
      expect(lexicon, language).toBeDefined();
      expect(lexicon?.provenance).toMatch(/Written for Themata/);
      expect(lexicon?.nonAnswers.length).toBeGreaterThan(10);
    }
    for (const lexicon of SURVEY_LEXICONS) expect(lexicon.license).not.toBe('');
  });
});

describe('non-answers', () => {
  it.each([
    ['Nothing.', 'en'],
    ['N/A', 'en'],
    ['no comment!', 'en'],
    ["Don’t know", 'en'],
    ['nothing really, thanks', 'en'],
    ['-', 'en'],
    ['...', null],
    ['', null],
    ['Nada', 'es'],
    ['Rien à ajouter', 'fr'],
    ['Keine Ahnung.', 'de'],
    ['niente', 'it'],
    ['não sei', 'pt'],
    ['geen idee', 'nl'],
    ['特になし', 'ja'],
    ['无', 'zh'],
    ['nichts', null],
  ] as const)('%j (%s) is a non-answer', (text, language) => {
    expect(isNonAnswer(text, language)).toBe(true);
  });

  it.each([
    ['nothing about the parking was right', 'en'],
    ['The bus was late', 'en'],
    ['nada de aparcamiento', 'es'],
    ['😀', null],
    ['42', null],
    ['待ち時間が長い', 'ja'],
  ] as const)('%j (%s) is an answer', (text, language) => {
    expect(isNonAnswer(text, language)).toBe(false);
  });
});

describe('stop words', () => {
  it('join the open list (stopwords-iso 1.1.0), the survey fillers and the study list', () => {
    const set = stopWordSet('en', { en: ['Clinic'], '*': ['covid'] });
    expect(openStopWords('en')).toContain('the');
    expect(set.has('the')).toBe(true); // open list
    expect(set.has('okay')).toBe(true); // survey fillers
    expect(set.has('clinic')).toBe(true); // study list, normalised
    expect(set.has('covid')).toBe(true); // study list for every language
    expect(set.has('parking')).toBe(false);
    expect(stopWordSet('fr').has('clinic')).toBe(false);
  });

  it('can take survey theme words off the open list (lexicon "keep")', () => {
    expect(openStopWords('en')).toContain('opening');
    expect(openStopWords('en')).toContain('computer');
    expect(stopWordSet('en').has('opening')).toBe(true);
    const set = stopWordSet('en', {}, { keepThemeWords: true });
    expect(set.has('opening')).toBe(false);
    expect(set.has('computer')).toBe(false);
    expect(set.has('rooms')).toBe(false);
    expect(set.has('the')).toBe(true);
    expect(stopWordSet('fr', {}, { keepThemeWords: true }).has('ouvert')).toBe(false);
  });

  it('compare in normal form (Turkish lower case)', () => {
    expect(stopWordSet('tr', { tr: ['IŞIK'] }).has('ışık')).toBe(true);
  });
});
