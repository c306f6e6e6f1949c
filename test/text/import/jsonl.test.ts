import { describe, expect, it } from 'vitest';
import { inputError, readText } from './helpers/read.js';

// JSON Lines (https://jsonlines.org): UTF-8, one JSON value per line, here one object per line.
describe('JSON Lines', () => {
  it('takes columns as the union of keys in first-seen order', async () => {
    const t = await readText('{"id":"r1","answer":"Bueno"}\n{"answer":"Malo","lang":"es","id":"r2"}\n', 'a.jsonl');
    expect(t.format).toBe('jsonl');
    expect(t.columns).toEqual(['id', 'answer', 'lang']);
    expect(t.rows).toEqual([
      ['r1', 'Bueno', ''],
      ['r2', 'Malo', 'es'],
    ]);
  });

  it('writes numbers and booleans as text, null as missing', async () => {
    const t = await readText('{"n":2.5,"b":true,"z":null}\n', 'a.jsonl');
    expect(t.rows).toEqual([['2.5', 'true', '']]);
  });

  it('refuses a nested object or list, naming the line and the field', async () => {
    const nested = await inputError(readText('{"id":1,"answer":"ok"}\n{"id":2,"answer":{"text":"hidden","lang":"en"}}\n', 'a.jsonl'));
    expect(nested.message).toContain('a.jsonl: line 2, field "answer" holds a nested object');
    expect(nested.column).toBe('answer');
    const list = await inputError(readText('[{"id":1,"tags":["a","b"]}]', 'a.json'));
    expect(list.message).toContain('item 1, field "tags" holds a list');
  });

  it('skips blank lines and accepts CRLF', async () => {
    const t = await readText('{"a":"1"}\r\n\r\n   \r\n{"a":"2"}\r\n', 'a.ndjson');
    expect(t.rows).toEqual([['1'], ['2']]);
  });

  it('reads a .json file holding an array of objects', async () => {
    const t = await readText('[{"id":1,"text":"hola"},{"id":2,"text":"adiós"}]', 'a.json');
    expect(t.rows).toEqual([['1', 'hola'], ['2', 'adiós']]);
  });

  it('recognises JSON Lines by content when the extension says nothing', async () => {
    const t = await readText('{"id":1,"text":"hola, qué tal"}\n', 'export.txt');
    expect(t.format).toBe('jsonl');
  });

  it('names the line of invalid JSON', async () => {
    const err = await inputError(readText('{"a":1}\n\n{"a": oops}\n', 'bad.jsonl'));
    expect(err.message).toContain('bad.jsonl: line 3 is not valid JSON');
  });

  it('refuses a line that is not an object', async () => {
    const err = await inputError(readText('{"a":1}\n[1,2]\n', 'bad.jsonl'));
    expect(err.message).toContain('line 2 holds an array, not a JSON object');
  });

  it('refuses a file with no objects', async () => {
    expect((await inputError(readText('\n\n', 'e.jsonl'))).message).toMatch(/blank|empty/);
  });

  it('refuses more rows than maxRows', async () => {
    const err = await inputError(readText('{"a":1}\n{"a":2}\n{"a":3}\n', 'm.jsonl', { maxRows: 2 }));
    expect(err.message).toContain('more than 2 rows');
  });
});
