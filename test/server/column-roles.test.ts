import { describe, expect, it } from 'vitest';
import { mappingFromRoles, profileColumns } from '../../src/server/column-roles.js';
import type { Table } from '../../src/text/types.js';

const table: Table = {
  fileName: 'survey.csv',
  format: 'csv',
  columns: ['respondent_id', 'comment', 'lang', 'district', 'age', 'weight', 'empty'],
  rows: Array.from({ length: 40 }, (_, i) => [
    `R${i}`,
    `This is a longer free-text answer number ${i} about the park`,
    i % 2 ? 'es' : 'en',
    ['North', 'South'][i % 2],
    String(18 + i),
    (0.5 + i / 100).toFixed(2),
    '',
  ]),
  assumed: { encoding: 'UTF-8' },
};

describe('column role suggestions', () => {
  it('suggests id, text, language, group, number and weight from names and values', () => {
    expect(profileColumns(table).map((p) => p.role)).toEqual(['id', 'text', 'language', 'categorical', 'numeric', 'weight', 'ignore']);
  });

  it('turns chosen roles into an import mapping, and explains a missing text column or a duplicate', () => {
    expect(mappingFromRoles(table.columns, ['id', 'text', 'language', 'categorical', 'numeric', 'weight', 'ignore'])).toEqual({
      id: 'respondent_id',
      text: ['comment'],
      language: 'lang',
      covariates: [
        { column: 'district', type: 'categorical' },
        { column: 'age', type: 'numeric' },
      ],
      weight: 'weight',
    });
    expect(mappingFromRoles(table.columns, ['id', 'ignore', 'ignore', 'ignore', 'ignore', 'ignore', 'ignore'])).toMatch(/Answer text/);
    expect(mappingFromRoles(table.columns, ['id', 'text', 'id', 'ignore', 'ignore', 'ignore', 'ignore'])).toMatch(/Only one column/);
  });
});
