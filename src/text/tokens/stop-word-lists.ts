// The open multilingual stop-word lists of stopwords-iso 1.1.0 (MIT; "the most comprehensive
// collection of stopwords for multiple languages", github.com/stopwords-iso), keyed by ISO 639-1.
import lists from 'stopwords-iso/stopwords-iso.json' with { type: 'json' };

const LISTS = lists as unknown as Readonly<Record<string, readonly string[]>>;

/** The open list's stop words for a language (ISO 639-1 key), or an empty list. */
export function openStopWords(language: string): readonly string[] {
  // Norwegian Bokmål and Nynorsk share stopwords-iso's `no` list.
  const key = language === 'nb' || language === 'nn' ? 'no' : language;
  return Object.prototype.hasOwnProperty.call(LISTS, key) ? LISTS[key] : [];
}
