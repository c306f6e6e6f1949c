// ASVS 4.0.3 V5.3.10 and V5.5.2: an XLSX workbook is XML, and a hostile one may declare XML
// entities. An external entity (XXE, CWE-611) must not pull a file of the server into the table,
// and nested internal entities ("billion laughs", CWE-776) must not blow up. Either a table
// without the file's contents or an InputError. The workbooks are built here, by hand, as stored
// (uncompressed) ZIP archives (PKWARE APPNOTE 6.3.10, sections 4.3.7 and 4.3.12).
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { readTable } from '../../src/text/import/index.js';
import { InputError } from '../../src/text/types.js';

const CRC_TABLE = Array.from({ length: 256 }, (_, n) => {
  let c = n;
  for (let k = 0; k < 8; k++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1;
  return c >>> 0;
});

function crc32(bytes: Buffer): number {
  let c = 0xffffffff;
  for (const b of bytes) c = CRC_TABLE[(c ^ b) & 0xff] ^ (c >>> 8);
  return (c ^ 0xffffffff) >>> 0;
}

/** A ZIP archive of the given files, stored without compression. */
function storedZip(files: Record<string, string>): Buffer {
  const locals: Buffer[] = [];
  const centrals: Buffer[] = [];
  let offset = 0;
  for (const [name, text] of Object.entries(files)) {
    const data = Buffer.from(text, 'utf8');
    const fileName = Buffer.from(name, 'utf8');
    const crc = crc32(data);
    const local = Buffer.alloc(30);
    local.writeUInt32LE(0x04034b50, 0);
    local.writeUInt16LE(20, 4);
    local.writeUInt32LE(crc, 14);
    local.writeUInt32LE(data.length, 18);
    local.writeUInt32LE(data.length, 22);
    local.writeUInt16LE(fileName.length, 26);
    const central = Buffer.alloc(46);
    central.writeUInt32LE(0x02014b50, 0);
    central.writeUInt16LE(20, 4);
    central.writeUInt16LE(20, 6);
    central.writeUInt32LE(crc, 16);
    central.writeUInt32LE(data.length, 20);
    central.writeUInt32LE(data.length, 24);
    central.writeUInt16LE(fileName.length, 28);
    central.writeUInt32LE(offset, 42);
    locals.push(local, fileName, data);
    centrals.push(central, fileName);
    offset += local.length + fileName.length + data.length;
  }
  const directory = Buffer.concat(centrals);
  const end = Buffer.alloc(22);
  end.writeUInt32LE(0x06054b50, 0);
  end.writeUInt16LE(Object.keys(files).length, 8);
  end.writeUInt16LE(Object.keys(files).length, 10);
  end.writeUInt32LE(directory.length, 12);
  end.writeUInt32LE(offset, 16);
  return Buffer.concat([...locals, directory, end]);
}

/** A one-sheet workbook (ECMA-376 Part 1) whose sheet XML starts with `doctype`. */
function workbook(doctype: string, cells: [string, string]): Buffer {
  const ns = 'http://schemas.openxmlformats.org/spreadsheetml/2006/main';
  const rel = 'http://schemas.openxmlformats.org/officeDocument/2006/relationships';
  return storedZip({
    '[Content_Types].xml': `<?xml version="1.0" encoding="UTF-8"?><Types xmlns="http://schemas.openxmlformats.org/package/2006/content-types"><Default Extension="rels" ContentType="application/vnd.openxmlformats-package.relationships+xml"/><Default Extension="xml" ContentType="application/xml"/><Override PartName="/xl/workbook.xml" ContentType="application/vnd.openxmlformats-officedocument.spreadsheetml.sheet.main+xml"/><Override PartName="/xl/worksheets/sheet1.xml" ContentType="application/vnd.openxmlformats-officedocument.spreadsheetml.worksheet+xml"/></Types>`,
    '_rels/.rels': `<?xml version="1.0" encoding="UTF-8"?><Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships"><Relationship Id="rId1" Type="${rel}/officeDocument" Target="xl/workbook.xml"/></Relationships>`,
    'xl/workbook.xml': `<?xml version="1.0" encoding="UTF-8"?><workbook xmlns="${ns}" xmlns:r="${rel}"><sheets><sheet name="S" sheetId="1" r:id="rId1"/></sheets></workbook>`,
    'xl/_rels/workbook.xml.rels': `<?xml version="1.0" encoding="UTF-8"?><Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships"><Relationship Id="rId1" Type="${rel}/worksheet" Target="worksheets/sheet1.xml"/></Relationships>`,
    'xl/worksheets/sheet1.xml': `<?xml version="1.0" encoding="UTF-8"?>${doctype}<worksheet xmlns="${ns}"><sheetData><row r="1"><c r="A1" t="inlineStr"><is><t>id</t></is></c><c r="B1" t="inlineStr"><is><t>answer</t></is></c></row><row r="2"><c r="A2" t="inlineStr"><is><t>${cells[0]}</t></is></c><c r="B2" t="inlineStr"><is><t>${cells[1]}</t></is></c></row></sheetData></worksheet>`,
  });
}

/** The table read from bytes, or the InputError they caused; anything else fails the test. */
async function readOrRefuse(bytes: Buffer): Promise<string> {
  try {
    const t = await readTable(bytes, 'hostile.xlsx');
    return JSON.stringify([t.columns, t.rows]);
  } catch (error) {
    if (error instanceof InputError) return `InputError: ${error.message}`;
    throw error;
  }
}

describe('XML entities in uploaded workbooks', () => {
  const dir = mkdtempSync(join(tmpdir(), 'themata-xxe-'));
  const secret = join(dir, 'secret.txt');
  writeFileSync(secret, 'SECRET-ON-THE-SERVER-7f3a');
  afterAll(() => rmSync(dir, { recursive: true, force: true }));

  it('reads the hand-built workbook when it is harmless (the builder is right)', async () => {
    expect(await readOrRefuse(workbook('', ['1', 'plain answer']))).toBe(JSON.stringify([['id', 'answer'], [['1', 'plain answer']]]));
  });

  it('V5.3.10, V5.5.2: never puts a file of the server into the table through an external entity', async () => {
    for (const target of [`file://${secret}`, secret]) {
      const result = await readOrRefuse(workbook(`<!DOCTYPE worksheet [<!ENTITY xxe SYSTEM "${target}">]>`, ['1', '&xxe;']));
      expect(result, target).not.toContain("SECRET-ON-THE-SERVER");
    }
  });

  it('V5.5.2: refuses or reads nested internal entities without expanding them a billion times', async () => {
    const levels = Array.from({ length: 9 }, (_, i) => `<!ENTITY l${i + 1} "${`&l${i};`.repeat(10)}">`).join('');
    const result = await readOrRefuse(workbook(`<!DOCTYPE worksheet [<!ENTITY l0 "lol">${levels}]>`, ['1', '&l9;']));
    expect(result.length).toBeLessThan(100_000);
  });
});
