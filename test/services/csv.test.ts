import { describe, expect, it } from 'vitest';
import { csvBytes, guardCell, toCsv } from '../../src/services/csv.js';
import { answersTable, shareColumns } from '../../src/services/answers-table.js';

describe('CSV writing', () => {
  it('quotes commas, quotes and line breaks as RFC 4180 §2 rules 6–7 require', () => {
    // RFC 4180 (2005) §2: fields with commas, double quotes or CRLF are enclosed in double quotes;
    // a double quote inside is escaped by a preceding double quote.
    expect(toCsv(['a', 'b'], [['x,y', 'say "hi"'], ['line\r\nbreak', 3]])).toBe('a,b\r\n"x,y","say ""hi"""\r\n"line\r\nbreak",3\r\n');
  });

  it('prefixes a single quote to cells that start with = + - @ tab or CR (formula injection)', () => {
    for (const bad of ['=HYPERLINK("http://x")', '+1', '-2+3', '@SUM(A1)', '\tx', '\rx']) expect(guardCell(bad)).toBe(`'${bad}`);
    expect(guardCell('fine = ok')).toBe('fine = ok');
    expect(guardCell(-0.5)).toBe('-0.5'); // numbers are data, not text a spreadsheet evaluates
    expect(guardCell(null)).toBe('');
    expect(guardCell(NaN)).toBe('');
  });

  it('starts the file with the UTF-8 byte-order mark', () => {
    const bytes = csvBytes(['ü'], [['é']]);
    expect([...bytes.subarray(0, 3)]).toEqual([0xef, 0xbb, 0xbf]);
    expect(new TextDecoder().decode(bytes.subarray(3))).toBe('ü\r\né\r\n');
  });
});

describe('answers-by-theme table', () => {
  it('names share columns from labels, distinct from each other and from fixed columns', () => {
    expect(shareColumns(['Hours', 'hours', 'language', ''], ['id', 'language'])).toEqual(['Hours', 'hours (2)', 'language (2)', 'Theme']);
  });

  it('writes id, question, covariates, language, link key, weight, shares, the dominant theme and why shares are blank', () => {
    const t = answersTable(
      [
        { rowId: '7', question: 'q1', covariates: { region: 'North' }, language: 'en', linkKey: null, weight: 2, mixture: [0.2, 0.8] },
        { rowId: '8', question: 'q1', covariates: { region: null }, language: null, linkKey: 'L1', weight: 1, mixture: null, reason: 'language undetermined' },
      ],
      ['region'],
      ['Hours', 'Wifi'],
    );
    expect(t.header).toEqual(['id', 'question', 'region', 'language', 'link key', 'weight', 'Hours', 'Wifi', 'dominant theme', 'left out because']);
    expect(t.rows[0]).toEqual(['7', 'q1', 'North', 'en', '', 2, 0.2, 0.8, 'Wifi', '']);
    expect(t.rows[1]).toEqual(['8', 'q1', null, '', 'L1', 1, '', '', '', 'language undetermined']);
  });

  it('heads the id column with the name it has in the imported file', () => {
    const t = answersTable([], ['Région'], ['id'], { idColumn: 'Respondent no.' });
    expect(t.header).toEqual(['Respondent no.', 'question', 'Région', 'language', 'link key', 'weight', 'id', 'dominant theme', 'left out because']);
  });

  it('writes the answer text after the id and leaves the question column out when asked', () => {
    const t = answersTable([{ rowId: '1', question: 'q', text: '=SUM(A1)', covariates: { answer: 'x' }, language: 'en', linkKey: null, weight: 1, mixture: [1] }], ['answer'], ['T'], { questions: false, text: true });
    // A covariate already called "answer": the text column is "answer text".
    expect(t.header).toEqual(['id', 'answer text', 'answer', 'language', 'link key', 'weight', 'T', 'dominant theme', 'left out because']);
    expect(t.rows[0].slice(0, 2)).toEqual(['1', '=SUM(A1)']);
  });
});
