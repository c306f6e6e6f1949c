// Marking a theme's words inside an answer, for the theme page. Words are found with
// Intl.Segmenter (so scripts written without spaces work too) and matched to the theme's words
// by written form, or by stem as a prefix (the stems come from the study's stemmer).

export interface MarkPart {
  readonly text: string;
  readonly marked: boolean;
}

const MIN_STEM = 3; // shorter stems match too many unrelated words (common practice)

export function markWords(text: string, language: string, words: readonly { word: string; stem: string }[]): MarkPart[] {
  const surfaces = new Set(words.map((w) => w.word.toLocaleLowerCase(language)));
  const stems = words.map((w) => w.stem.toLocaleLowerCase(language)).filter((s) => s.length >= MIN_STEM && !/\s/.test(s));
  let segmenter: Intl.Segmenter;
  try {
    segmenter = new Intl.Segmenter(language, { granularity: 'word' });
  } catch {
    segmenter = new Intl.Segmenter('und', { granularity: 'word' });
  }
  const parts: MarkPart[] = [];
  let plain = '';
  for (const seg of segmenter.segment(text)) {
    const lower = seg.segment.toLocaleLowerCase(language);
    const hit = seg.isWordLike === true && (surfaces.has(lower) || stems.some((s) => lower.startsWith(s)));
    if (hit) {
      if (plain) parts.push({ text: plain, marked: false });
      plain = '';
      parts.push({ text: seg.segment, marked: true });
    } else plain += seg.segment;
  }
  if (plain) parts.push({ text: plain, marked: false });
  return parts;
}
