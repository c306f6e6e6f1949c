// Outside check: the Snowball project's reference vocabularies (snowballstem/snowball-data,
// commit ba91f32, BSD-3-Clause; see test/fixtures/snowball/README.md and COPYING). Each language
// must agree with the reference at least as well as the README measured for the npm packages,
// and every disagreement must be a known one (listed below), so a regression names its word.
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { foldDiacritics, stemmerFor, stemmerName } from '../../../src/text/tokens/index.js';

function pairs(file: string): [string, string][] {
  const url = new URL(`../../fixtures/snowball/${file}.tsv`, import.meta.url);
  return readFileSync(url, 'utf8')
    .trim()
    .split('\n')
    .slice(1)
    .map((row) => row.split('\t') as [string, string]);
}

// README levels (full vocabularies). English is the Porter (1980) algorithm via the stemmer
// package, checked against porter.tsv. Russian folds ё → е as the current algorithm does, so it
// reaches 1.0 instead of the README's 0.9978.
const CASES: { file: string; language: string; level: number }[] = [
  { file: 'porter', language: 'en', level: 0.9984 },
  { file: 'spanish', language: 'es', level: 0.9997 },
  { file: 'french', language: 'fr', level: 0.9576 },
  { file: 'german', language: 'de', level: 0.9644 },
  { file: 'portuguese', language: 'pt', level: 1 },
  { file: 'italian', language: 'it', level: 1 },
  { file: 'dutch_porter', language: 'nl', level: 1 },
  { file: 'swedish', language: 'sv', level: 0.982 },
  { file: 'russian', language: 'ru', level: 0.9978 },
  { file: 'danish', language: 'da', level: 1 },
  { file: 'norwegian', language: 'nb', level: 0.9935 },
  { file: 'finnish', language: 'fi', level: 0.9999 },
];

// Words on which snowball-stemmers 0.6.0 follows an older revision of the algorithm than the
// reference data (French and German: newer rules; Swedish: the newer "-et" ending; Norwegian:
// accented vowels and "-s" endings).
const KNOWN: Record<string, readonly string[]> = {
  french: [
    "altaïques",
    "ambiguïtés",
    "azoïque",
    "d'activités",
    "d'ajouter",
    "d'amour",
    "d'animaux",
    "d'arbitrage",
    "d'arrêter",
    "d'atlanta",
    "d'autres",
    "d'effectuer",
    "d'entre",
    "d'essais",
    "d'histoire",
    "d'importants",
    "d'irlande",
    "d'opilions",
    "d'orthographe",
    "d'utilisateur",
    "d'église",
    "d'évaluation",
    "j'aime",
    "l''''équipe",
    "l'achat",
    "l'adresse",
    "l'ain",
    "l'altitude",
    "l'ancienne",
    "l'appel",
    "l'architecture",
    "l'article",
    "l'atlantique",
    "l'autonomie",
    "l'aviation",
    "l'embouchure",
    "l'engagement",
    "l'espace",
    "l'examen",
    "l'extrême",
    "l'humanité",
    "l'importance",
    "l'information",
    "l'instrument",
    "l'invasion",
    "l'la",
    "l'ohio",
    "l'oracle",
    "l'ouvrage",
    "l'université",
    "l'échec",
    "l'égalité",
    "l'épisode",
    "l'étape",
    "n'ait",
    "n'hésite",
    "qu'aucun",
    "s'appuie",
    "s'ils",
    "s'oppose",
    "taïwanaises",
    "voltaïque",
  ],
  german: [
    "abödet",
    "angerichtet",
    "angewendet",
    "ausgeziechnet",
    "beleuchtete",
    "beneidete",
    "beredet",
    "bereiteten",
    "bestreitet",
    "betrachteten",
    "brauchtet",
    "breiteten",
    "brummbaßgezeter",
    "bündeln",
    "ebnete",
    "eilet",
    "endete",
    "erdichteten",
    "erlöset",
    "fraget",
    "geendet",
    "geleitete",
    "gesendet",
    "gestattet",
    "getötet",
    "gezüchtet",
    "gstanzln",
    "irret",
    "jätete",
    "könnet",
    "lächeln",
    "loeb",
    "mündet",
    "nitroglyzerin",
    "reguels",
    "scheinet",
    "schlängeln",
    "schütteln",
    "schwindet",
    "singet",
    "spielet",
    "staketen",
    "stattfindet",
    "straucheln",
    "tasteten",
    "unangetastet",
    "vereiteln",
    "vernünfteln",
    "verrostetes",
    "vorwaltet",
    "wachteln",
    "wäret",
  ],
  swedish: [
    "besväret",
    "bråddjupet",
    "dagbladet",
    "djupet",
    "dopet",
    "fullskrivet",
    "fönsterbrädet",
    "galet",
    "huvudet",
    "kindbenet",
    "krutet",
    "kulet",
    "könet",
    "ljudet",
    "lånet",
    "malätet",
    "mulet",
    "nakterhuset",
    "penningbegäret",
    "samhällslivet",
    "skriket",
    "skådespelet",
    "sorgehuset",
    "sällskapsnöjet",
    "sönderslaget",
    "troget",
    "tråget",
    "upptaget",
  ],
  norwegian: [
    "bunkers",
    "flòta",
    "hòle",
    "hóvet",
    "kapers",
    "knòdast",
    "lósande",
    "mòlen",
    "ròket",
    "skòra",
    "stòta",
  ],
};

describe('stemming agrees with the Snowball reference vocabularies', () => {
  for (const { file, language, level } of CASES) {
    it(`${language} (${file}.tsv) at or above ${level}, with only known disagreements`, () => {
      const rows = pairs(file);
      const stem = stemmerFor(language, { stemming: true, foldDiacritics: false });
      const wrong = rows.filter(([word, expected]) => stem(word) !== expected).map(([word]) => word);
      const agreement = 1 - wrong.length / rows.length;
      console.log(`snowball ${file}: ${rows.length} pairs, agreement ${agreement.toFixed(4)} (README ${level})`);
      expect(wrong.filter((word) => !(KNOWN[file] ?? []).includes(word))).toEqual([]);
      // The README level is for the full vocabulary; these files hold every Nth pair, so allow
      // the one-word granularity of the sample.
      expect(agreement).toBeGreaterThanOrEqual(level - 1 / rows.length);
    });
  }
});

describe('stemming options', () => {
  it('uses Porter for English and Snowball elsewhere, none where no algorithm exists', () => {
    expect(stemmerName('en')).toBe('porter');
    expect(stemmerName('es')).toBe('spanish');
    expect(stemmerName('zh')).toBeNull();
    expect(stemmerFor('zh', { stemming: true, foldDiacritics: false })('自由')).toBe('自由');
  });

  it('keeps words whole when stemming is off', () => {
    expect(stemmerFor('en', { stemming: false, foldDiacritics: false })('running')).toBe('running');
    expect(stemmerFor('en', { stemming: true, foldDiacritics: false })('running')).toBe('run');
  });

  it('folds diacritics after stemming, leaving non-Latin marks alone', () => {
    const stem = stemmerFor('fr', { stemming: true, foldDiacritics: true });
    expect(stem('éducation')).toBe('educ');
    expect(foldDiacritics('Ñandú café naïve')).toBe('Nandu cafe naive');
    // Devanagari vowel signs and the Japanese voicing mark are parts of letters, not accents.
    expect(foldDiacritics('हिन्दी')).toBe('हिन्दी');
    expect(foldDiacritics('が')).toBe('が');
  });
});
