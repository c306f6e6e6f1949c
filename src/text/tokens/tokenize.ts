// Cutting a text into tokens (docs/design.md §5). Scripts written without spaces (Chinese, Japanese,
// Thai, Khmer, Lao, Myanmar) are segmented with Intl.Segmenter (ICU's dictionary-based word
// break, Unicode Standard Annex #29 "Unicode Text Segmentation" §4 with dictionary extensions);
// everything else is split on white space, and any chunk that is not a plain word goes to
// wink-tokenizer 5.3.0, which recognises URLs, e-mail addresses, emoji, emoticons, numbers,
// punctuation and English contractions.
import Tokenizer from 'wink-tokenizer';
import { languageInfo } from '../language/languages.js';
import { composeText, lowerCase } from './normalize.js';
import type { Token, TokenKind, TokenizeOptions } from './token.js';

/** Receives each token: kind, surface (NFKC, original case) and normal (lower-cased). */
export type TokenSink = (kind: TokenKind, surface: string, normal: string) => void;

// ZWNJ/ZWJ survive normalisation only inside words of scripts that need them (invisible.ts).
const PLAIN_WORD = /^[\p{L}\p{M}][\p{L}\p{M}\u200C\u200D]*$/u;
const EDGE_PUNCTUATION = /^(\p{P}*)(.*?)(\p{P}*)$/su;
const LETTER = /\p{L}/u;
const DIGIT = /\p{N}/u;
const URL_OR_EMAIL = /(?:https?:\/\/|www\.)[^\s]+|[^\s@]+@[^\s@]+\.[^\s@]+/giu;
// Last resort when wink-tokenizer cannot reproduce a chunk: letter runs (with inner apostrophes),
// digit runs, single other characters.
const FALLBACK = /[\p{L}\p{M}][\p{L}\p{M}\u200C\u200D]*(?:'[\p{L}\p{M}\u200C\u200D]+)*|\p{N}+(?:[.,]\p{N}+)*|\S/gu;
// Languages whose articles and pronouns elide before a vowel: "l'homme", "dell'uomo", "qu'il".
const ELIDING = new Set(['fr', 'it', 'ca']);
const MAX_ELIDED_PREFIX = 5;
// English clitics written onto a word, split off as wink-tokenizer does ("it's" → "it" + "'s").
const NEGATED_STEMS: Readonly<Record<string, string>> = { ca: 'can', wo: 'will', sha: 'shall' };
const ENGLISH_CLITIC = /^(.*[\p{L}\p{M}])(n't|'s|'re|'ll|'ve|'d|'m)$/iu;

const wink = new Tokenizer();
const segmenters = new Map<string, Intl.Segmenter>();

/** Tokens of a text in a language (BCP 47 subtag); by default words only. */
export function tokenize(text: string, language: string, options: TokenizeOptions = {}): Token[] {
  const out: Token[] = [];
  scanTokens(text, language, (kind, surface, normal) => {
    if (keeps(kind, options)) out.push({ kind, surface, normal });
  });
  return out;
}

function keeps(kind: TokenKind, options: TokenizeOptions): boolean {
  switch (kind) {
    case 'word':
      return true;
    case 'number':
      return options.keepNumbers === true;
    case 'url':
      return options.keepUrls === true;
    case 'email':
      return options.keepEmails === true;
    case 'emoji':
      return options.keepEmoji === true;
    case 'punctuation':
    case 'symbol':
      return options.keepPunctuation === true;
    default:
      return false;
  }
}

/** Every token of a text, of every kind, in order: the allocation-light core of `tokenize`. */
export function scanTokens(text: string, language: string, sink: TokenSink): void {
  if (text === '') return;
  const composed = composeText(text);
  if (languageInfo(language)?.segmenter === true) segmentUnspaced(composed, language, sink);
  else splitSpaced(composed, language, sink);
}

function segmentUnspaced(text: string, language: string, sink: TokenSink): void {
  let segmenter = segmenters.get(language);
  if (segmenter === undefined) {
    segmenter = new Intl.Segmenter(language, { granularity: 'word' });
    segmenters.set(language, segmenter);
  }
  // URLs and addresses first: the word segmenter would cut them into pieces.
  const rest = text.replace(URL_OR_EMAIL, (match) => {
    sink(match.includes('@') && !match.includes('/') ? 'email' : 'url', match, match.toLowerCase());
    return ' ';
  });
  for (const part of segmenter.segment(rest)) {
    const s = part.segment;
    if (part.isWordLike === true) {
      if (LETTER.test(s)) sink('word', s, lowerCase(s, language));
      else sink(DIGIT.test(s) ? 'number' : 'symbol', s, s);
    } else if (s.trim() !== '') sink(classifyOther(s), s, s);
  }
}

function splitSpaced(text: string, language: string, sink: TokenSink): void {
  for (const chunk of text.split(/\s+/)) {
    if (chunk === '') continue;
    if (PLAIN_WORD.test(chunk)) {
      sink('word', chunk, lowerCase(chunk, language));
      continue;
    }
    // "word," or "(word)": a plain word between punctuation needs no tokenizer.
    const edges = EDGE_PUNCTUATION.exec(chunk);
    if (edges !== null && edges[2] !== '' && PLAIN_WORD.test(edges[2]) && !edges[1].includes('@') && !edges[1].includes('#')) {
      for (const ch of edges[1]) sink('punctuation', ch, ch);
      sink('word', edges[2], lowerCase(edges[2], language));
      for (const ch of edges[3]) sink('punctuation', ch, ch);
      continue;
    }
    complexChunk(chunk, language, sink);
  }
}

function complexChunk(chunk: string, language: string, sink: TokenSink): void {
  const tokens = wink.tokenize(chunk);
  // wink-tokenizer drops letters outside its alphabet in some contexts ("Niño's" → "o", "'s");
  // when its pieces do not add up to the chunk, fall back to a plain Unicode split.
  let joined = '';
  for (const t of tokens) joined += t.value;
  if (joined !== chunk) {
    for (const match of chunk.matchAll(FALLBACK)) emitWordLike(match[0], language, sink);
    return;
  }
  // wink-tokenizer splits words at letters it does not know ("ğüşıöç" → "ğ", "ü", "şı", "öç");
  // adjacent letter pieces of one chunk are one word again.
  let pending = '';
  const flush = (): void => {
    if (pending !== '') emitWordLike(pending, language, sink);
    pending = '';
  };
  for (const t of tokens) {
    const tag = t.tag as string;
    // wink-tokenizer cuts "can't" into "ca" + "n't" (and "won't" into "wo" + "n't").
    if (language === 'en' && tag === 'word' && t.value.toLowerCase() === "n't" && pending !== '') {
      const fixed = NEGATED_STEMS[pending.toLowerCase()];
      if (fixed !== undefined) pending = pending[0] === pending[0].toUpperCase() ? fixed[0].toUpperCase() + fixed.slice(1) : fixed;
    }
    if ((tag === 'word' || tag === 'alien') && PLAIN_WORD.test(t.value) && !(tag === 'word' && t.value.toLowerCase() === "n't")) {
      pending += t.value;
      continue;
    }
    flush();
    switch (tag) {
      case 'word':
      case 'alien':
        if (t.value.startsWith("'") || t.value.toLowerCase() === "n't") sink('clitic', t.value, lowerCase(t.value, language));
        else emitWordLike(t.value, language, sink);
        break;
      case 'hashtag':
        emitWordLike(t.value.slice(1), language, sink);
        break;
      case 'number':
      case 'ordinal':
      case 'time':
        sink('number', t.value, t.value);
        break;
      case 'url':
        sink('url', t.value, t.value.toLowerCase());
        break;
      case 'email':
        sink('email', t.value, t.value.toLowerCase());
        break;
      case 'emoji':
      case 'emoticon':
        sink('emoji', t.value, t.value);
        break;
      case 'mention':
        sink('mention', t.value, t.value.toLowerCase());
        break;
      case 'punctuation':
        sink('punctuation', t.value, t.value);
        break;
      default:
        sink(classifyOther(t.value), t.value, t.value);
    }
  }
  flush();
}

/** A letter run that may carry an elided article or inner apostrophes. */
function emitWordLike(value: string, language: string, sink: TokenSink): void {
  if (!LETTER.test(value)) {
    sink(DIGIT.test(value) ? 'number' : classifyOther(value), value, value);
    return;
  }
  const apostrophe = value.indexOf("'");
  if (apostrophe > 0 && apostrophe <= MAX_ELIDED_PREFIX && ELIDING.has(language) && apostrophe < value.length - 1) {
    const head = value.slice(0, apostrophe + 1);
    sink('clitic', head, lowerCase(head, language));
    emitWordLike(value.slice(apostrophe + 1), language, sink);
    return;
  }
  const clitic = language === 'en' ? ENGLISH_CLITIC.exec(value) : null;
  if (clitic !== null) {
    emitWordLike(clitic[1], language, sink);
    sink('clitic', clitic[2], lowerCase(clitic[2], language));
    return;
  }
  // Stray apostrophes at the edges ("'hello'") are quotation marks, not part of the word.
  const word = value.replace(/^'+|'+$/g, '');
  if (word === '') return;
  sink('word', word, lowerCase(word, language));
}

const EMOJI = /\p{Extended_Pictographic}/u;

function classifyOther(value: string): TokenKind {
  if (EMOJI.test(value)) return 'emoji';
  if (/^\p{P}+$/u.test(value)) return 'punctuation';
  if (DIGIT.test(value)) return 'number';
  return 'symbol';
}
