import { readFileSync } from 'node:fs';
import iconv from 'iconv-lite';
import { describe, expect, it } from 'vitest';
import { readTable } from '../../../src/text/import/index.js';
import { inputError } from './helpers/read.js';

const fixture = (name: string) => new Uint8Array(readFileSync(new URL(`../../fixtures/import/${name}`, import.meta.url)));

// The survey every fixture holds (test/fixtures/import/make-fixtures.ts).
const ANSWERS = [
  'Der Service war schnell, die Straße sauber.',
  'Très bien, mais le café coûte 3 € de trop.',
  'El envío llegó tarde; la atención fue amable.',
  'Größere Auswahl wäre schön, gerne auch günstiger als 20 €.',
];

describe('text encodings', () => {
  // windows-1252 code page (Microsoft, "Windows 1252" code chart): é = 0xE9, ß = 0xDF, € = 0x80.
  it('reads a windows-1252 file with é, ß and € right and says so', async () => {
    const bytes = fixture('survey-windows-1252.csv');
    expect([...bytes]).toContain(0x80); // the € byte really is in the file
    const t = await readTable(bytes, 'survey-windows-1252.csv');
    expect(t.assumed.encoding).toBe('windows-1252');
    expect(t.assumed.encodingConfidence).toBeGreaterThan(0);
    expect(t.assumed.encodingConfidence).toBeLessThan(1);
    expect(t.rows.map((r) => r[2])).toEqual(ANSWERS);
    expect(t.rows.map((r) => r[1])).toEqual(['Köln', 'Lyon', 'Málaga', 'München']);
  });

  // Unicode Standard 15.0, section 23.8 (byte order mark): FF FE = UTF-16LE, FE FF = UTF-16BE.
  it.each([
    ['survey-utf16le-bom.csv', 'UTF-16LE', [0xff, 0xfe]],
    ['survey-utf16be-bom.csv', 'UTF-16BE', [0xfe, 0xff]],
  ])('reads %s by its byte-order mark', async (name, encoding, bom) => {
    const bytes = fixture(name);
    expect([bytes[0], bytes[1]]).toEqual(bom);
    const t = await readTable(bytes, name);
    expect(t.assumed).toMatchObject({ encoding, encodingConfidence: 1 });
    expect(t.columns).toEqual(['id', 'region', 'answer']);
    expect(t.rows.map((r) => r[2])).toEqual(ANSWERS);
  });

  it('strips a UTF-8 byte-order mark from the first column name', async () => {
    const bytes = Buffer.concat([Buffer.from([0xef, 0xbb, 0xbf]), Buffer.from('id,answer\n1,ça va\n')]);
    const t = await readTable(bytes, 'bom.csv');
    expect(t.columns).toEqual(['id', 'answer']);
    expect(t.assumed.encoding).toBe('UTF-8');
    expect(t.rows).toEqual([['1', 'ça va']]);
  });

  it('recognises UTF-16LE without a byte-order mark from its zero bytes', async () => {
    const t = await readTable(iconv.encode('id,answer\n1,très bien\n2,fine\n', 'utf-16le'), 'nobom.csv');
    expect(t.assumed.encoding).toBe('UTF-16LE');
    expect(t.rows).toEqual([['1', 'très bien'], ['2', 'fine']]);
  });

  it('reads Cyrillic in windows-1251', async () => {
    const text = 'id,answer\n1,"Обслуживание было быстрым и вежливым, спасибо большое"\n2,"Доставка опоздала на три дня, это очень плохо"\n';
    const t = await readTable(iconv.encode(text, 'windows-1251'), 'ru.csv');
    expect(t.assumed.encoding).toBe('windows-1251');
    expect(t.rows[0][1]).toBe('Обслуживание было быстрым и вежливым, спасибо большое');
  });

  it('prefers UTF-8 whenever the bytes are valid UTF-8', async () => {
    const t = await readTable(Buffer.from('id,answer\n1,Grüße 中文 €\n'), 'u.csv');
    expect(t.assumed).toMatchObject({ encoding: 'UTF-8', encodingConfidence: 1 });
    expect(t.rows[0][1]).toBe('Grüße 中文 €');
  });

  it('reads a UTF-8 file with one damaged byte as UTF-8, not as a legacy encoding', async () => {
    const good = Buffer.from('id,answer\n1,Grüße aus Köln\n2,très bien ça va\n3,niño\n');
    const bytes = Buffer.concat([good, Buffer.from([0x34, 0x2c, 0xff, 0x0a])]); // "4,<0xFF>"
    const t = await readTable(bytes, 'damaged.csv');
    expect(t.assumed.encoding).toBe('UTF-8');
    expect(t.assumed.encodingConfidence).toBeLessThan(1);
    expect(t.rows[0][1]).toBe('Grüße aus Köln');
    expect(t.rows[3][1]).toBe('\ufffd');
  });

  it('refuses binary data with a message that says what to do', async () => {
    const bytes = new Uint8Array([0x69, 0x64, 0x0a, 0x00, 0x01, 0x02, 0x00, 0x00, 0x9f, 0x00, 0x00, 0x05]);
    const err = await inputError(readTable(bytes, 'data.bin'));
    expect(err.message).toContain('data.bin');
    expect(err.message).toMatch(/UTF-8/);
  });

  it('refuses a UTF-8 byte-order mark followed by invalid UTF-8', async () => {
    const bytes = new Uint8Array([0xef, 0xbb, 0xbf, 0x61, 0x0a, 0xc3, 0x28, 0x0a]);
    const err = await inputError(readTable(bytes, 'bad.csv'));
    expect(err.message).toContain('not valid UTF-8');
  });
});
