// Non-answers: "nothing", "n/a", "no comment", "-", "なし", "无" … A document that is only a
// non-answer says nothing about any theme; it is excluded with the reason 'non-answer' and never
// reaches a vocabulary. Phrases come from the shipped survey lexicons (lexicons/survey-fillers).
import { SURVEY_LEXICONS, surveyLexicon, type SurveyLexicon } from './lexicons.js';
import { normalizeText } from './normalize.js';

interface Index {
  readonly phrases: Set<string>;
  readonly words: Set<string>;
}

const indexes = new Map<string, Index>();

// Letters, digits and in-word apostrophes make the key; everything else separates words.
function key(text: string, language: string): string {
  return normalizeText(text, language).replace(/[^\p{L}\p{M}\p{N}']+/gu, ' ').replace(/'+(?=\s|$)|(?<=^|\s)'+/g, '').trim();
}

function build(lexicons: readonly SurveyLexicon[], language: string): Index {
  const phrases = new Set<string>();
  const words = new Set<string>();
  for (const lexicon of lexicons) {
    for (const phrase of lexicon.nonAnswers) {
      const k = key(phrase, language);
      if (k === '') continue;
      phrases.add(k);
      if (!k.includes(' ')) words.add(k);
    }
    for (const filler of lexicon.fillers) {
      const k = key(filler, language);
      if (k !== '') words.add(k);
    }
  }
  return { phrases, words };
}

function indexFor(language: string | null): Index {
  const id = language ?? '*';
  let index = indexes.get(id);
  if (index === undefined) {
    const own = language === null ? undefined : surveyLexicon(language);
    // Undetermined language, or a language without its own lexicon: every lexicon's phrases.
    index = build(own === undefined ? SURVEY_LEXICONS : [own], language ?? 'und');
    indexes.set(id, index);
  }
  return index;
}

const SOMETHING = /[\p{L}\p{N}\p{Extended_Pictographic}]/u;

/**
 * True when a text says nothing: empty or punctuation only, a known non-answer phrase of its
 * language (of any language when `language` is null), or only non-answer and filler words.
 */
export function isNonAnswer(text: string, language: string | null): boolean {
  if (!SOMETHING.test(text)) return true;
  const index = indexFor(language);
  const k = key(text, language ?? 'und');
  if (k === '') return false;
  if (index.phrases.has(k)) return true;
  // Unspaced scripts: the whole key is one "word"; checked as a phrase above.
  for (const word of k.split(' ')) if (!index.words.has(word)) return false;
  return true;
}
