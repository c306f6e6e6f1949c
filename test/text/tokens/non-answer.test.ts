import { describe, expect, it } from 'vitest';
import { isNonAnswer, MAX_SHORT_WORDS } from '../../../src/text/tokens/index.js';
import { defaultPipelineSettings, prepareText } from '../../../src/text/vocabulary/index.js';

const STUDY = ['de', 'en', 'es', 'fr', 'ja'];

describe('non-answers of the shipped lexicons, in their own language', () => {
  it.each([
    ['nada en especial', 'es'],
    ['Nada en especial.', 'es'],
    ['rien à signaler', 'fr'],
    ['Rien a signaler', 'fr'],
    ['RAS', 'fr'],
    ['R.A.S.', 'fr'],
    ['rien de spécial', 'fr'],
    ['passt so', 'de'],
    ['Passt so!', 'de'],
    ['nix', 'de'],
    ['大丈夫です', 'ja'],
    ['大丈夫です。', 'ja'],
    ['ないです', 'ja'],
    ['別に', 'ja'],
    ['idk', 'en'],
    ['no idea', 'en'],
    ['no comment', 'en'],
    ['tout va bien', 'fr'],
  ] as const)('%j (%s)', (text, language) => {
    expect(isNonAnswer(text, language)).toBe(true);
  });
});

describe('very short answers put in the wrong language', () => {
  it.each([
    ['idk', 'es'],
    ['no idea', 'es'],
    ['No comment.', 'es'],
    ['tout va bien', 'es'],
    ['tout va bien', 'it'],
    ['nix', 'fr'],
    ['RAS', 'es'],
    ['passt so', 'en'],
  ] as const)('%j decided as %s is a non-answer of another study language', (text, language) => {
    // Without the study's languages only the decided language's lexicon is consulted.
    if (language !== 'it') expect(isNonAnswer(text, language)).toBe(false);
    expect(isNonAnswer(text, language, [...STUDY, language])).toBe(true);
  });

  it('only consults languages of the study', () => {
    expect(isNonAnswer('nix', 'fr', ['fr', 'en'])).toBe(false);
    expect(isNonAnswer('nix', 'fr', ['fr', 'de'])).toBe(true);
  });

  it(`stops at ${MAX_SHORT_WORDS} words: a longer text must match its own language`, () => {
    const long = 'je ne sais pas du tout';
    expect(isNonAnswer(long, 'es', ['es', 'fr'])).toBe(false);
    expect(isNonAnswer('je ne sais pas', 'es', ['es', 'fr'])).toBe(true);
  });

  it("does not read another language's filler words as a non-answer", () => {
    // "tout" and "beaucoup" are French fillers, but only whole phrases cross languages.
    expect(isNonAnswer('tout beaucoup', 'fr')).toBe(true);
    expect(isNonAnswer('tout beaucoup', 'es', ['es', 'fr'])).toBe(false);
  });

  it('keeps real short answers', () => {
    for (const [text, language] of [
      ['horario', 'es'],
      ['more books', 'en'],
      ['wifi lent', 'fr'],
      ['Parkplatz fehlt', 'de'],
      ['駐車場', 'ja'],
    ] as const) {
      expect(isNonAnswer(text, language, STUDY), text).toBe(false);
    }
  });

  it('looks an undetermined text up in the study languages only', () => {
    expect(isNonAnswer('nix', null, ['de', 'en'])).toBe(true);
    expect(isNonAnswer('nix', null, ['en', 'fr'])).toBe(false);
    // No study languages known: every shipped lexicon.
    expect(isNonAnswer('nix', null)).toBe(true);
  });
});

describe('prepareText checks short answers against every language of the study', () => {
  it('excludes "idk" and "tout va bien" decided as Spanish as non-answers', () => {
    const prepared = prepareText(
      [
        { language: 'es', text: 'idk' },
        { language: 'es', text: 'tout va bien' },
        { language: 'es', text: 'el horario es corto' },
        { language: 'en', text: 'the opening hours are short' },
        { language: 'fr', text: 'les horaires sont courts' },
      ],
      { ...defaultPipelineSettings(), minCount: 1 },
    );
    expect(prepared.documents.map((d) => d.excluded)).toEqual(['non-answer', 'non-answer', null, null, null]);
  });

  it('does not borrow a language the study does not have', () => {
    const prepared = prepareText(
      [
        { language: 'es', text: 'tout va bien' },
        { language: 'es', text: 'el horario es corto' },
      ],
      { ...defaultPipelineSettings(), minCount: 1 },
    );
    expect(prepared.documents[0].excluded).toBeNull();
  });
});
