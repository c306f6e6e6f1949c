// Non-answers: "nothing", "n/a", "no comment", "-", "なし", "无" … A document that is only a
// non-answer says nothing about any theme; it is excluded with the reason 'non-answer' and never
// reaches a vocabulary. Phrases come from the shipped survey lexicons (lexicons/survey-fillers).
// Very short answers are the hardest to put in the right language ("idk" or "tout va bien" can
// look Spanish to trigrams), so a text of at most MAX_SHORT_WORDS words is also compared with the
// whole non-answer phrases of every other language of the study.
import { SURVEY_LEXICONS, surveyLexicon, type SurveyLexicon } from './lexicons.js';
import { normalizeText } from './normalize.js';

interface Index {
  readonly phrases: Set<string>;
  readonly words: Set<string>;
}

const indexes = new Map<string, Index>();

/** "Very short": up to this many words, a non-answer phrase of any study language counts (common practice). */
export const MAX_SHORT_WORDS = 4;

// Letters, digits, in-word apostrophes and in-word ZWNJ/ZWJ (Persian, Indic) make the key;
// everything else separates words.
const NOT_KEY = /[^\p{L}\p{M}\p{N}'\u200C\u200D]+|(?<![\p{L}\p{M}])[\u200C\u200D]+|[\u200C\u200D]+(?![\p{L}\p{M}])/gu;

function key(text: string, language: string): string {
  return normalizeText(text, language).replace(NOT_KEY, ' ').replace(/'+(?=\s|$)|(?<=^|\s)'+/g, '').trim();
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
 * With `studyLanguages`, a very short text (at most MAX_SHORT_WORDS words) that is a whole
 * non-answer phrase of any of them counts too; an undetermined text is then looked up in the
 * study languages' lexicons (all lexicons when none of them has one).
 */
export function isNonAnswer(text: string, language: string | null, studyLanguages?: readonly string[]): boolean {
  if (!SOMETHING.test(text)) return true;
  const study = studyLanguages?.filter((l) => surveyLexicon(l) !== undefined) ?? [];
  const index = language === null && study.length > 0 ? studyIndex(study) : indexFor(language);
  const k = key(text, language ?? 'und');
  if (k === '') return false;
  if (index.phrases.has(k)) return true;
  const words = k.split(' ');
  // Unspaced scripts: the whole key is one "word"; checked as a phrase above.
  if (words.every((word) => index.words.has(word))) return true;
  if (language === null || words.length > MAX_SHORT_WORDS) return false;
  // Other study languages: whole phrases only. Their filler words are not used: a short answer
  // made of another language's fillers is more likely a real answer than a non-answer.
  for (const other of study) {
    if (other === language) continue;
    if (indexFor(other).phrases.has(key(text, other))) return true;
  }
  return false;
}

function studyIndex(study: readonly string[]): Index {
  const id = `study:${[...study].sort().join(',')}`;
  let index = indexes.get(id);
  if (index === undefined) {
    index = build(study.map((l) => surveyLexicon(l) as SurveyLexicon), 'und');
    indexes.set(id, index);
  }
  return index;
}
