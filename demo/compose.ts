// Turning planted sentence choices into text, and the noise real answers carry.
import type { Rng } from '../src/model/types.js';
import { PHRASES } from './phrases/index.js';
import { THEME_IDS, type DemoLanguage } from './types.js';
import { choose } from './sampling.js';

/** One planted sentence: theme index and the template/filler indices (reused by translations). */
export interface SentenceChoice {
  theme: number;
  template: number;
  filler: number;
}

export function drawSentence(rng: Rng, theme: number): SentenceChoice {
  // Indices are drawn large and reduced modulo each language's list length when rendered, so a
  // translation renders the same choice in its own language.
  return { theme, template: rng.nextInt(720720), filler: rng.nextInt(720720) };
}

export function renderSentence(choice: SentenceChoice, language: DemoLanguage): string {
  const phrases = PHRASES[language].themes[THEME_IDS[choice.theme]];
  const template = phrases.templates[choice.template % phrases.templates.length];
  const text = template.includes('{x}') ? template.replace('{x}', phrases.fillers[choice.filler % phrases.fillers.length]) : template;
  // German contracts "von dem" to "vom", as everyone writes it.
  return capitalise(language === 'de' ? text.replaceAll('von dem ', 'vom ') : text);
}

export function capitalise(text: string): string {
  const first = text.charAt(0);
  const upper = first.toUpperCase();
  return first === upper ? text : upper + text.slice(1);
}

/** Sentences joined with the language's gap and, sometimes, a connector before a later sentence. */
export function joinSentences(rng: Rng, sentences: string[], language: DemoLanguage, paragraphs: boolean): string {
  const phrases = PHRASES[language];
  let out = '';
  for (let i = 0; i < sentences.length; i++) {
    let s = sentences[i];
    if (i > 0 && rng.nextDouble() < 0.25) s = choose(rng, phrases.connectors) + s;
    if (i === 0) out = s;
    else if (paragraphs && i % 4 === 0) out += '\n\n' + s;
    else out += phrases.sentenceGap + s;
  }
  return out;
}

const LETTER = /\p{L}/u;

/** One typing slip in a word: two letters swapped, one dropped or one doubled (common practice). */
export function typo(rng: Rng, word: string): string {
  const n = word.length;
  if (n < 4) return word;
  const i = 1 + rng.nextInt(n - 2);
  if (!LETTER.test(word[i]) || !LETTER.test(word[i - 1])) return word;
  switch (rng.nextInt(3)) {
    case 0:
      return word.slice(0, i - 1) + word[i] + word[i - 1] + word.slice(i + 1);
    case 1:
      return word.slice(0, i) + word.slice(i + 1);
    default:
      return word.slice(0, i) + word[i] + word.slice(i);
  }
}

/** Slips in about `rate` of the words of a space-separated text. */
export function addTypos(rng: Rng, text: string, rate: number): string {
  const words = text.split(' ');
  let changed = false;
  for (let i = 0; i < words.length; i++) {
    if (rng.nextDouble() < rate) {
      const w = typo(rng, words[i]);
      if (w !== words[i]) {
        words[i] = w;
        changed = true;
      }
    }
  }
  return changed ? words.join(' ') : text;
}

/** Text typed without accents, as on a keyboard without them. */
export function stripAccents(text: string): string {
  return text.normalize('NFD').replace(/[\u0300-\u036f]/g, '').replace(/ß/g, 'ss').normalize('NFC');
}

/** All lower case and no final full stop, as typed quickly on a phone. */
export function casual(text: string): string {
  return text.toLowerCase().replace(/[.。]$/, '');
}
