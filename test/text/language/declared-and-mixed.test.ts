// The declared language as a prior, neutral non-words, and answers in two languages, on small
// invented answers (written for these tests; the outside checks are in short-texts.test.ts and
// demo-languages.test.ts).
import { describe, expect, it } from 'vitest';
import { DECLARED_PRIOR, identifyLanguages, isNeutralText } from '../../../src/text/language/index.js';
import { declaredPrior } from '../../../src/text/language/declared-prior.js';

const EN = [
  'The reading room is far too noisy in the afternoon and nobody asks people to be quiet.',
  'Please open the library on Sunday mornings, the week is too busy for me to come.',
  'The wifi drops every few minutes and the computers are slow and old.',
  'More books for children and a story time on Saturday would help families a lot.',
];
const ES = [
  'La sala de lectura es demasiado ruidosa por la tarde y nadie pide silencio a la gente.',
  'Por favor abran la biblioteca los domingos por la mañana, entre semana no puedo venir.',
  'El wifi se corta cada pocos minutos y los ordenadores son lentos y viejos.',
  'Más libros para niños y cuentos los sábados ayudarían mucho a las familias.',
];
const study = [...EN, ...EN, ...ES, ...ES];
const declaredOf = [...EN, ...EN].map(() => 'en').concat([...ES, ...ES].map(() => 'es'));

function decide(extra: string[], declared: (string | undefined)[]) {
  const out = identifyLanguages([...study, ...extra], { languages: ['en', 'es'], declared: [...declaredOf, ...declared], declaredPrior: DECLARED_PRIOR });
  return out.slice(study.length);
}

describe('declared language as a strong prior', () => {
  it('puts the prior mass on the declared language and spreads the rest', () => {
    expect(declaredPrior(['en', 'es', 'fr'], 'es', 0.8)).toEqual([0.1, 0.8, 0.1].map((x) => expect.closeTo(x, 12)));
    expect(declaredPrior(['en', 'es'], 'de', 0.8)).toEqual([0.5, 0.5]);
  });

  it('confirms, keeps or overrules the declaration and says which', () => {
    const [confirmed, kept, overruled] = decide(['The computers are slow and the wifi drops.', 'ok', 'Los ordenadores son lentos y el wifi se corta cada pocos minutos.'], ['en', 'es', 'en']);
    expect(confirmed).toMatchObject({ language: 'en', source: 'declared', declaredCheck: 'confirmed', written: 'en' });
    expect(kept).toMatchObject({ language: 'es', source: 'declared', declaredCheck: 'kept', written: null });
    expect(overruled).toMatchObject({ language: 'es', declaredCheck: 'overruled', written: 'es' });
    expect(overruled.source).not.toBe('declared');
  });

  it('refuses a prior mass outside (0, 1)', () => {
    expect(() => identifyLanguages(['x'], { languages: ['en'], declaredPrior: 1 })).toThrow(RangeError);
  });
});

describe('neutral non-words', () => {
  it('recognises numbers, emoticons, single letters and shared interjections, not words', () => {
    for (const t of ['12345', '3.5/10', '???', ':-)', 'xD', '<3', '^^', 'ok', 'OK!', 'okay', 'lol', 'hahaha', 'hmm', 'a', 'x y', ':) ok']) expect(isNeutralText(t), t).toBe(true);
    for (const t of ['nada', 'rien', 'gut', 'NO', 'wifi', 'ok thanks', 'Netflix']) expect(isNeutralText(t), t).toBe(false);
  });

  it('leaves them undetermined without a declaration, and never overrules a declaration with them', () => {
    const texts = ['ok', 'xD', '10/10', '???', 'b'];
    for (const d of decide(texts, texts.map(() => undefined))) expect(d).toMatchObject({ language: null, source: 'undetermined' });
    for (const d of decide(texts, texts.map(() => 'es'))) expect(d).toMatchObject({ language: 'es', declaredCheck: 'kept' });
  });
});

describe('answers in two languages', () => {
  it('go by the language of most of their words, and carry the other', () => {
    const [d] = decide(['The wifi drops every few minutes and the computers are slow. The reading room is far too noisy in the afternoon. Por favor abran los domingos.'], ['es']);
    expect(d.language).toBe('en');
    expect(d.mixed).toEqual({ language: 'es', share: expect.any(Number) });
    expect(d.mixed!.share).toBeLessThan(0.5);
    expect(d.declaredCheck).toBe('overruled');
  });

  it('find a sentence in another script', () => {
    const [d] = identifyLanguages(['図書館の開館時間をもっと長くしてほしいです。日曜日も開けてください。The wifi is slow.'], { languages: ['en', 'ja'] });
    expect(d.language).toBe('ja');
    expect(d.mixed?.language).toBe('en');
  });

  it('are not flagged for one short aside', () => {
    const [d] = decide(['The wifi drops every few minutes and the computers are slow. Gracias.'], [undefined]);
    expect(d.language).toBe('en');
    expect(d.mixed).toBeUndefined();
  });
});
