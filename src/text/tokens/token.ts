// What a token is.

export type TokenKind =
  | 'word'
  | 'number'
  | 'url'
  | 'email'
  | 'emoji'
  | 'mention'
  | 'punctuation'
  | 'symbol'
  /** An elided article or clitic split off a word: French "l'", English "'s", "n't". */
  | 'clitic';

export interface Token {
  readonly kind: TokenKind;
  /** As written, after NFKC (original case). */
  readonly surface: string;
  /** Lower-cased (language-aware) form; what stop words, stemming and vocabularies see. */
  readonly normal: string;
}

/** Which kinds to keep besides words (all false by default: docs/design.md §5 drops them). */
export interface TokenizeOptions {
  keepNumbers?: boolean;
  keepUrls?: boolean;
  keepEmails?: boolean;
  keepEmoji?: boolean;
  keepPunctuation?: boolean;
}
