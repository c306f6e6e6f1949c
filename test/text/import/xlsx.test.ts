import ExcelJS from 'exceljs';
import { describe, expect, it } from 'vitest';
import { readTable } from '../../../src/text/import/index.js';
import { inputError } from './helpers/read.js';

async function workbook(build: (wb: ExcelJS.Workbook) => void): Promise<Buffer> {
  const wb = new ExcelJS.Workbook();
  build(wb);
  return Buffer.from(await wb.xlsx.writeBuffer());
}

const twoSheets = () =>
  workbook((wb) => {
    const a = wb.addWorksheet('Wave 1');
    a.addRow(['id', 'answer', 'when', 'score', 'link']);
    a.addRow([1, { richText: [{ text: 'Muy ', font: { bold: true } }, { text: 'bien' }] }, new Date(Date.UTC(2024, 2, 5)), 0.1 + 0.2, { text: 'site', hyperlink: 'https://example.org' }]);
    a.addRow([2, 'Très bien', new Date(Date.UTC(2024, 2, 5, 14, 30, 0)), { formula: '2*3', result: 6 }, null]);
    a.addRow([3, { formula: 'NA()', result: { error: '#N/A' } }, null, true, null]);
    const b = wb.addWorksheet('Wave 2');
    b.addRow([]);
    b.addRow(['id', 'answer']);
    b.addRow(['x1', 'Gut']);
    b.addRow([]);
  });

describe('XLSX', () => {
  it('reads the first sheet by default and lists all sheets', async () => {
    const t = await readTable(await twoSheets(), 'survey.xlsx');
    expect(t.format).toBe('xlsx');
    expect(t.assumed).toMatchObject({ sheet: 'Wave 1', sheets: ['Wave 1', 'Wave 2'] });
    expect(t.columns).toEqual(['id', 'answer', 'when', 'score', 'link']);
    expect(t.rows).toEqual([
      ['1', 'Muy bien', '2024-03-05', '0.3', 'site'],
      ['2', 'Très bien', '2024-03-05 14:30:00', '6', ''],
      ['3', '', '', 'TRUE', ''],
    ]);
  });

  it('reads the chosen sheet, starting at its first non-empty row', async () => {
    const t = await readTable(await twoSheets(), 'survey.xlsx', { sheet: 'Wave 2' });
    expect(t.assumed.sheet).toBe('Wave 2');
    expect(t.columns).toEqual(['id', 'answer']);
    expect(t.rows).toEqual([['x1', 'Gut']]);
  });

  it('lists the sheet names when the chosen sheet is missing', async () => {
    const err = await inputError(readTable(await twoSheets(), 'survey.xlsx', { sheet: 'Wave 3' }));
    expect(err.message).toContain('no sheet named "Wave 3"');
    expect(err.message).toContain('"Wave 1", "Wave 2"');
  });

  it('names cells right of the header and pads short rows', async () => {
    const buf = await workbook((wb) => {
      const s = wb.addWorksheet('S');
      s.addRow(['id', 'answer']);
      s.addRow([1, 'a', 'stray']);
      s.addRow([2]);
    });
    const t = await readTable(buf, 'w.xlsx');
    expect(t.columns).toEqual(['id', 'answer', 'column_3']);
    expect(t.rows).toEqual([['1', 'a', 'stray'], ['2', '', '']]);
  });

  it('refuses a header-only sheet', async () => {
    const buf = await workbook((wb) => wb.addWorksheet('S').addRow(['id', 'answer']));
    expect((await inputError(readTable(buf, 'h.xlsx'))).message).toContain('no data rows');
  });

  // Zip bomb guard: the central directory's uncompressed sizes (PKWARE APPNOTE 6.3.10, 4.3.12).
  it('refuses a workbook that would unpack beyond maxUnpackedBytes, before loading it', async () => {
    const buf = await workbook((wb) => {
      const s = wb.addWorksheet('S');
      s.addRow(['id', 'answer']);
      for (let i = 0; i < 3000; i++) s.addRow([i, 'the same long answer repeated over and over again']);
    });
    expect(buf.length).toBeLessThan(200_000);
    const err = await inputError(readTable(buf, 'bomb.xlsx', { maxUnpackedBytes: 200_000 }));
    expect(err.message).toContain('would unpack to');
    expect(err.message).toContain('more than the limit of 195 KB');
  });

  it('refuses a workbook whose parts unpack to more than their declared sizes', async () => {
    const buf = await workbook((wb) => {
      const s = wb.addWorksheet('S');
      s.addRow(['id', 'answer']);
      for (let i = 0; i < 200; i++) s.addRow([i, 'an answer']);
    });
    // Make the central directory understate the sheet's size (APPNOTE 4.3.12: offset 24).
    const name = Buffer.from('xl/worksheets/sheet1.xml');
    let patched = 0;
    for (let p = 0; p + 46 < buf.length; p++) {
      if (buf.readUInt32LE(p) !== 0x02014b50) continue;
      const len = buf.readUInt16LE(p + 28);
      if (buf.subarray(p + 46, p + 46 + len).equals(name)) {
        buf.writeUInt32LE(100, p + 24);
        patched++;
      }
    }
    expect(patched).toBe(1);
    const err = await inputError(readTable(buf, 'lying.xlsx'));
    expect(err.message).toContain('unpacks to more than the size it declares');
  });

  // Worksheet <dimension ref> (ECMA-376 Part 1, 18.3.1.35) read from the first bytes of the sheet.
  it('refuses a sheet that declares more rows than maxRows', async () => {
    const buf = await workbook((wb) => {
      const s = wb.addWorksheet('S');
      s.addRow(['id']);
      for (let i = 0; i < 50; i++) s.addRow([i]);
    });
    const err = await inputError(readTable(buf, 'rows.xlsx', { maxRows: 20 }));
    expect(err.message).toContain("declares 51 rows");
    await expect(readTable(buf, 'rows.xlsx', { maxRows: 50 })).resolves.toBeDefined();
  });

  it('refuses a damaged workbook and an old .xls file with clear messages', async () => {
    const good = await twoSheets();
    const damaged = Buffer.concat([good.subarray(0, 200), Buffer.alloc(100)]);
    expect((await inputError(readTable(damaged, 'cut.xlsx'))).message).toContain('cut.xlsx');
    const ole = Buffer.from([0xd0, 0xcf, 0x11, 0xe0, 0xa1, 0xb1, 0x1a, 0xe1, 0, 0, 0, 0]);
    expect((await inputError(readTable(ole, 'old.xls'))).message).toContain('.xls');
  });
});
