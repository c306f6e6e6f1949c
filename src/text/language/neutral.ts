// Texts that carry no language evidence at all, whatever their letters: numbers, emoticons
// (":D", "xD", "<3"), single letters, and the interjections that survey answers share
// across the languages written in Latin script ("ok", "lol", "haha", "hmm"). Such an answer is
// neutral: without a declared language it stays undetermined and is listed, never forced into
// a language by a trigram profile that must pick something (docs/design.md §5).
//
// A whole text is neutral when every one of its space-separated pieces is. Names and brands
// spelled the same in several languages ("Netflix", "pizza", "DVD") cannot be told by their form
// (and "GUT" or "NO" are words, not acronyms); the
// study model leaves them undetermined by the weight of evidence instead (identify.ts).

/** Western emoticons: optional hat or brow, eyes, optional nose, mouth (common practice). */
const EMOTICON = /^[<>}\]O0o]?[:;=8%][-'^o"]?[)(\][dDpPoO03/\\|*$&@#xXsScCLlzZjJBE<>{}?]{1,3}$/u;
/** Emoticons written the other way round or with letters as eyes ("xD", "XP", "D:", "<3"). */
const OTHER_EMOTICONS = /^(?:[xX][dDpP(O)o]+|[dD][xX:]|<\/?3+|\\[mM]\/|\^+[_.-]?\^+|[oO0][_.][oO0]|[tT]_[tT]|-_-)$/u;
/** Interjections spelled alike across Latin-script survey languages (written for Themata; common practice). */
const INTERJECTION = /^(?:o+k+(?:a+y+|e+y+|i+|é+)?|k+|lo+l+|xd+|(?:h[aeiou]){2,}h?|(?:[aeiou]h){2,}|h+m+|m+h?m+|a+h+|o+h+|e+h+|u+h+|w+o+w+|y+a+y+)$/u;
const LETTER = /[\p{L}\p{M}]/gu;

/** True when one space-separated piece of a text carries no language evidence. */
export function isNeutralPiece(piece: string): boolean {
  if (EMOTICON.test(piece) || OTHER_EMOTICONS.test(piece)) return true;
  // Punctuation around a word does not change it ("ok!", "(a)").
  const core = piece.replace(/^[^\p{L}\p{M}\p{N}]+|[^\p{L}\p{M}\p{N}]+$/gu, '');
  const letters = core.match(LETTER)?.length ?? 0;
  // Numbers, punctuation, emoji, and one letter alone or among digits ("3a", "x").
  if (letters <= 1) return true;
  return INTERJECTION.test(core.toLowerCase());
}

/** True when no piece of the text carries language evidence (an empty text included). */
export function isNeutralText(text: string): boolean {
  const pieces = text.split(/\s+/u);
  for (const piece of pieces) if (piece !== '' && !isNeutralPiece(piece)) return false;
  return true;
}
