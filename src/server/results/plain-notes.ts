// The notes the contrast computation attaches to its result (src/stats, src/services) are exact
// but technical; the pages say the same in a researcher's words. Unknown notes pass unchanged.

const RULES: [RegExp, (m: RegExpMatchArray, by: string) => string | null][] = [
  [/cluster bootstrap/, () => 'Translations of the same answer were counted as one answer when computing intervals.'],
  [
    /^Levels with more than (\d+) resampling units were resampled as \1 random groups of units\.?$/,
    (m) => `In groups with more than ${Number(m[1]).toLocaleString('en-GB')} answers, intervals were computed from ${Number(m[1]).toLocaleString('en-GB')} random batches of answers, to keep the page quick; this does not make them narrower than they should be.`,
  ],
  [/^Numeric covariate cut at its quantiles into (\d+) bins\.?$/, (m, by) => `${by} is a number: its values were split into ${m[1]} groups of about equal size.`],
  // The page says this itself, once, beside the grid.
  [/document\(s\) left out: no value for/, () => null],
  [
    /^Linked answers are one respondent: each link group counts once per level \(its first answer and weight\); (\d+) linked answers? (?:was|were) not counted again\.?$/,
    (m) => `Linked answers (such as translations) come from one respondent, so each respondent counts once per group, with their first answer and weight; ${m[1]} linked ${m[1] === '1' ? 'answer was' : 'answers were'} not counted again.`,
  ],
];

/** A note in plain words, or null when the page already says it elsewhere. */
export function plainNote(note: string, by: string): string | null {
  for (const [pattern, say] of RULES) {
    const m = note.match(pattern);
    if (m) return say(m, by);
  }
  return note;
}

export function plainNotes(notes: readonly string[], by: string): string[] {
  return notes.map((n) => plainNote(n, by)).filter((n): n is string => n !== null);
}
