import { describe, expect, it } from 'vitest';
import { mapColumns, mapColumnsWithReport } from '../../../src/text/import/index.js';
import { InputError, type ColumnMapping, type Table } from '../../../src/text/types.js';

// Invented survey rows.
function table(columns: string[], rows: string[][]): Table {
  return { fileName: 'wave1.csv', format: 'csv', columns, rows, assumed: { encoding: 'UTF-8' } };
}

const SURVEY = table(
  ['resp', 'q_likes', 'q_dislikes', 'lang', 'pair', 'region', 'age', 'w'],
  [
    ['r1', 'The staff', 'Waiting times', 'en-GB', 'p1', 'North', '34', '1.5'],
    ['r2', 'El personal', '', 'Spanish', 'p1', 'South', '', '0,75'],
    ['r3', '  ', 'Nada', 'spa', '', '', '51', '2'],
    ['r4', 'Le prix', 'La file', 'Klingon', '', 'North', '29.5', '1'],
  ],
);

const MAPPING: ColumnMapping = {
  id: 'resp',
  text: ['q_likes', 'q_dislikes'],
  language: 'lang',
  link: 'pair',
  covariates: [
    { column: 'region', type: 'categorical' },
    { column: 'age', type: 'numeric' },
  ],
  weight: 'w',
};

function thrown(fn: () => unknown): InputError {
  try {
    fn();
  } catch (err) {
    if (err instanceof InputError) return err;
    throw err;
  }
  throw new Error('expected an InputError');
}

describe('mapColumns', () => {
  it('makes one document per non-empty text cell with its question, language, link, covariates and weight', () => {
    const docs = mapColumns(SURVEY, MAPPING, {});
    expect(docs.map((d) => [d.rowId, d.question, d.text])).toEqual([
      ['r1', 'q_likes', 'The staff'],
      ['r1', 'q_dislikes', 'Waiting times'],
      ['r2', 'q_likes', 'El personal'],
      ['r3', 'q_dislikes', 'Nada'],
      ['r4', 'q_likes', 'Le prix'],
      ['r4', 'q_dislikes', 'La file'],
    ]);
    expect(docs[0]).toEqual({
      rowId: 'r1',
      question: 'q_likes',
      text: 'The staff',
      declaredLanguage: 'en',
      linkKey: 'p1',
      covariates: { region: 'North', age: 34 },
      weight: 1.5,
    });
    expect(docs[2]).toMatchObject({ declaredLanguage: 'es', linkKey: 'p1', covariates: { region: 'South', age: null }, weight: 0.75 });
    expect(docs[3]).toMatchObject({ declaredLanguage: 'es', covariates: { region: null, age: 51 }, weight: 2 });
    expect(docs[3].linkKey).toBeUndefined();
    expect(docs[4].declaredLanguage).toBeUndefined();
  });

  it('reports unknown language values and empty cells instead of failing', () => {
    const { report } = mapColumnsWithReport(SURVEY, MAPPING, {});
    expect(report).toMatchObject({ rows: 4, documents: 6, emptyTextCells: 2 });
    expect(report.unknownLanguages).toEqual([{ value: 'Klingon', count: 1, firstRow: 4 }]);
  });

  it('leaves languages outside the study undeclared and counts them', () => {
    const { documents, report } = mapColumnsWithReport(SURVEY, MAPPING, { languages: ['en', 'fr'] });
    expect(documents.filter((d) => d.declaredLanguage === 'en')).toHaveLength(2);
    expect(documents.filter((d) => d.declaredLanguage === 'es')).toHaveLength(0);
    expect(report.outsideStudyLanguages).toEqual([{ language: 'es', count: 2 }]);
  });

  it('numbers rows from 1 when there is no id column', () => {
    const docs = mapColumns(SURVEY, { text: ['q_likes'], covariates: [] }, {});
    expect(docs.map((d) => d.rowId)).toEqual(['1', '2', '4']);
    expect(docs.every((d) => d.weight === 1)).toBe(true);
  });

  it('names a missing column and lists the available ones', () => {
    const err = thrown(() => mapColumns(SURVEY, { ...MAPPING, text: ['q_likes', 'q_hopes'] }, {}));
    expect(err.message).toContain('no column "q_hopes"');
    expect(err.message).toContain('"resp", "q_likes", "q_dislikes"');
    expect(err.column).toBe('q_hopes');
  });

  it('refuses a text column chosen twice', () => {
    const err = thrown(() => mapColumns(SURVEY, { text: ['q_likes', 'q_likes'], covariates: [] }, {}));
    expect(err.message).toContain('"q_likes" is chosen twice');
  });

  it('refuses a mapping without text columns', () => {
    expect(thrown(() => mapColumns(SURVEY, { text: [], covariates: [] }, {})).message).toContain('at least one text column');
  });

  it('names both rows of a duplicate id', () => {
    const t = table(['id', 'a'], [['x', 'hi'], ['y', 'ho'], ['x', 'hu']]);
    const err = thrown(() => mapColumns(t, { id: 'id', text: ['a'], covariates: [] }, {}));
    expect(err.message).toBe('wave1.csv: data row 3, column "id": id "x" is already used by data row 1; ids must be unique.');
    expect([err.row, err.column]).toEqual([3, 'id']);
  });

  it.each([['0'], ['-1'], ['abc'], [''], ['1e999'], ['2,000']])('refuses the weight %j', (w) => {
    const t = table(['a', 'w'], [['hi', '1'], ['ho', w]]);
    const err = thrown(() => mapColumns(t, { text: ['a'], covariates: [], weight: 'w' }, {}));
    expect(err.message).toContain('data row 2, column "w"');
    expect(err.message).toContain('positive');
    expect(err.row).toBe(2);
  });

  it('refuses a numeric covariate that is not a number and counts the other bad rows', () => {
    const t = table(['a', 'age'], [['hi', '30'], ['ho', 'thirty'], ['hu', '?'], ['ha', '']]);
    const err = thrown(() => mapColumns(t, { text: ['a'], covariates: [{ column: 'age', type: 'numeric' }] }, {}));
    expect(err.message).toContain('data row 2, column "age": "thirty" is not a number');
    expect(err.message).toContain('1 more row of this column');
  });

  it('refuses an unknown study language', () => {
    expect(thrown(() => mapColumns(SURVEY, MAPPING, { languages: ['en', 'elvish'] })).message).toContain('"elvish"');
  });
});
