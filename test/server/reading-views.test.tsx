// The reading pages' views on their own, with props chosen to hit each case: five languages
// (three in the row, two behind "more languages"), a negative coherence, a theme not aligned,
// the contrast shading scale, and the plain words that replace the statistics' notes.
import { describe, expect, it } from 'vitest';
import { plainNote, plainNotes } from '../../src/server/results/plain-notes.js';
import { diffShade } from '../../views/pages/contrasts.js';
import { ThemesPage, type ThemeRow } from '../../views/pages/themes.js';

const frame = { title: 'Themes', user: { name: 'local', local: true }, csrf: 'token', study: { id: 1, name: 'S' } };
const languages = ['fr', 'en', 'es', 'de', 'it'];
const name = (k: number, saved: string | null) => ({ k, text: saved ?? `mots ${k}`, saved, suggestion: `mots ${k}`, suggested: saved === null, words: languages.map((l) => ({ language: l, words: [`${l}-a`, `${l}-b`] })) });
const rows: ThemeRow[] = [0, 1].map((k) => ({
  k,
  name: name(k, k === 0 ? 'Horaires' : null),
  share: 0.5,
  words: Object.fromEntries(languages.map((l) => [l, [`${l}${k}x`, `${l}${k}y`]])),
  balance: languages.map((language) => ({ language, share: 0.2 })),
  coherence: k === 0 ? 0.12 : -0.04,
  stability: 0.9,
  alignment: k === 1 ? { status: 'not aligned', source: 'translations' } : { status: 'aligned', source: 'translations' },
}));

describe('the Themes table', () => {
  it('keeps seven columns with five languages: three in the row in reading order, two collapsed', async () => {
    const html = await (<ThemesPage frame={frame} base="/s/1/r/1" languages={languages} rows={rows} canEdit stabilityNote="" sort="" links={{ languages: 5, answerGroupsAcrossLanguages: 50, glossaryRowsAcrossLanguages: 0 }} />).toString();
    const table = html.slice(html.indexOf('id="themes"'), html.indexOf('</table>'));
    expect(table.match(/<th scope="col"/g)!.length).toBe(7);
    expect(table).toContain('Top words · fr, en, es, de, it');
    const row = table.slice(table.indexOf('fr0x'));
    expect(row.indexOf('fr0x')).toBeLessThan(row.indexOf('en0x'));
    expect(row.indexOf('en0x')).toBeLessThan(row.indexOf('es0x'));
    expect(row).toMatch(/<details class="more-languages"><summary>2 more languages<\/summary><div class="lang-words"><span class="lang">de<\/span>/);
    expect(html).not.toContain('not tied together');
  });

  it('flags the negative coherence and the theme not aligned, and only those', async () => {
    const html = await (<ThemesPage frame={frame} base="/s/1/r/1" languages={languages} rows={rows} canEdit stabilityNote="" sort="" links={{ languages: 5, answerGroupsAcrossLanguages: 50, glossaryRowsAcrossLanguages: 0 }} />).toString();
    expect(html.match(/>negative<\/span>/g)!.length).toBe(1);
    expect(html).toMatch(/-0\.04<span class="flag"/);
    expect(html).not.toMatch(/0\.12<span class="flag"/);
    expect(html.match(/>not aligned across languages<\/span>/g)!.length).toBe(1);
    // The saved label has no suggestion beside it; the other shows its suggestion and an Accept.
    expect(html.match(/<span class="tag">suggested<\/span>/g)!.length).toBe(1);
    expect(html).toContain('value="Horaires"');
    expect(html).toContain('Accept all 1 suggested label');
  });

  it('warns when nothing ties the languages, and says so more softly when little does', async () => {
    const none = await (<ThemesPage frame={frame} base="/b" languages={languages} rows={rows} canEdit={false} stabilityNote="" sort="" links={{ languages: 5, answerGroupsAcrossLanguages: 0, glossaryRowsAcrossLanguages: 0 }} />).toString();
    expect(none).toContain('The languages of this study are not tied together');
    expect(none).not.toContain('Accept');
    const few = await (<ThemesPage frame={frame} base="/b" languages={languages} rows={rows} canEdit={false} stabilityNote="" sort="" links={{ languages: 5, answerGroupsAcrossLanguages: 3, glossaryRowsAcrossLanguages: 2 }} />).toString();
    expect(few).toContain('Only 3 linked groups of answers and 2 glossary rows tie the 5 languages');
  });
});

describe('contrast shading by difference', () => {
  it('is symmetric around the overall share, in four steps each side', () => {
    expect(diffShade(0, 0.1)).toBe('diff-0');
    expect(diffShade(0.01, 0.1)).toBe('diff-0');
    expect(diffShade(0.05, 0.1)).toBe('diff-p2');
    expect(diffShade(-0.05, 0.1)).toBe('diff-m2');
    expect(diffShade(0.1, 0.1)).toBe('diff-p4');
    expect(diffShade(-0.1, 0.1)).toBe('diff-m4');
    expect(diffShade(NaN, 0.1)).toBe('diff-0');
  });
});

describe('plain notes', () => {
  it('rewrites the statistics’ notes in plain words and drops the one the page says itself', () => {
    expect(plainNote('Documents of one link group were resampled together (cluster bootstrap).', 'region')).toBe('Translations of the same answer were counted as one answer when computing intervals.');
    expect(plainNote('Numeric covariate cut at its quantiles into 4 bins.', 'age')).toBe('age is a number: its values were split into 4 groups of about equal size.');
    expect(plainNote('Levels with more than 5000 resampling units were resampled as 5000 random groups of units.', 'x')).toMatch(/^In groups with more than 5,000 answers/);
    expect(plainNote('Linked answers are one respondent: each link group counts once per level (its first answer and weight); 12 linked answers were not counted again.', 'x')).toMatch(/12 linked answers were not counted again\.$/);
    expect(plainNotes(['3 document(s) left out: no value for "x" or an unusable weight.', 'Something new.'], 'x')).toEqual(['Something new.']);
  });
});

describe('language order', () => {
  it('puts the language the researcher named first first, else the one with most answers', async () => {
    const { languageOrder } = await import('../../src/server/results/theme-names.js');
    // Answers: 1 in de, 3 in en, 2 in es.
    const data = { model: { languages: ['de', 'en', 'es'] }, docLanguage: Int32Array.from([0, 1, 1, 1, 2, 2]) } as never;
    expect(languageOrder({ languages: ['es', 'de', 'en'] }, data)).toEqual(['es', 'en', 'de']);
    // Alphabetical, as an import fills it in when no languages were named: most answers first.
    expect(languageOrder({ languages: ['de', 'en', 'es'] }, data)).toEqual(['en', 'es', 'de']);
    expect(languageOrder({ languages: [] }, data)).toEqual(['en', 'es', 'de']);
  });
});
