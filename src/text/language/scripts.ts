// Script detection: the first and cheapest language evidence. A letter's Unicode script
// (Unicode Standard Annex #24, "Unicode Script Property") often settles the language outright
// (Hangul → Korean, Thai → Thai) and always narrows the candidates for the trigram step.
import type { Script } from './languages.js';

const SCRIPT_PATTERNS: readonly [Script, RegExp][] = [
  ['Latin', /\p{Script=Latin}/u],
  ['Cyrillic', /\p{Script=Cyrillic}/u],
  ['Greek', /\p{Script=Greek}/u],
  ['Arabic', /\p{Script=Arabic}/u],
  ['Hebrew', /\p{Script=Hebrew}/u],
  ['Devanagari', /\p{Script=Devanagari}/u],
  ['Bengali', /\p{Script=Bengali}/u],
  ['Tamil', /\p{Script=Tamil}/u],
  ['Armenian', /\p{Script=Armenian}/u],
  ['Georgian', /\p{Script=Georgian}/u],
  ['Thai', /\p{Script=Thai}/u],
  ['Lao', /\p{Script=Lao}/u],
  ['Khmer', /\p{Script=Khmer}/u],
  ['Myanmar', /\p{Script=Myanmar}/u],
  ['Hangul', /\p{Script=Hangul}/u],
  ['Kana', /[\p{Script=Hiragana}\p{Script=Katakana}]/u],
  ['Han', /\p{Script=Han}/u],
];

const LETTER = /[\p{L}\p{M}]/u;

export interface ScriptCounts {
  /** Letters (and combining marks) per script. */
  readonly counts: Partial<Record<Script, number>>;
  /** All letters, including those of scripts not listed. */
  readonly letters: number;
}

/** Count the letters of each script in a text. */
export function countScripts(text: string): ScriptCounts {
  const counts: Partial<Record<Script, number>> = {};
  let letters = 0;
  let last: Script | undefined;
  for (const ch of text) {
    const code = ch.charCodeAt(0);
    // ASCII fast path: most survey text is mostly ASCII.
    if (code < 0x80) {
      if ((code >= 0x41 && code <= 0x5a) || (code >= 0x61 && code <= 0x7a)) {
        counts.Latin = (counts.Latin ?? 0) + 1;
        letters++;
      }
      continue;
    }
    if (!LETTER.test(ch)) continue;
    letters++;
    // Neighbouring letters usually share a script: try the last one first.
    let script: Script | undefined;
    if (last !== undefined && patternOf(last).test(ch)) script = last;
    else {
      for (const [name, pattern] of SCRIPT_PATTERNS) {
        if (pattern.test(ch)) {
          script = name;
          break;
        }
      }
    }
    // Marks of script "Inherited" (UAX #24) and letters of unlisted scripts count as letters only.
    if (script === undefined) continue;
    counts[script] = (counts[script] ?? 0) + 1;
    last = script;
  }
  return { counts, letters };
}

function patternOf(script: Script): RegExp {
  for (const [name, pattern] of SCRIPT_PATTERNS) if (name === script) return pattern;
  return LETTER;
}
