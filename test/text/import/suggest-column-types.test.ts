import { describe, expect, it } from 'vitest';
import { suggestColumnTypes } from '../../../src/text/import/index.js';
import type { Table } from '../../../src/text/types.js';

// Invented survey of 40 rows with one column of each kind.
const answers = [
  'The staff were kind and quick to help',
  'Waiting times are far too long in the morning',
  'El personal fue muy amable conmigo',
  'Le prix est trop élevé pour ce service',
  'Nothing to add, all good',
];
const rows = Array.from({ length: 40 }, (_, i) => [
  `R-${1000 + i}`,
  `${answers[i % answers.length]} (${i})`,
  ['en', 'es', 'fr'][i % 3],
  ['North', 'South', 'East'][i % 3],
  String(18 + ((i * 7) % 60)),
  (0.5 + (i % 4) * 0.25).toFixed(2),
  `pair-${Math.floor(i / 2)}`,
  String((i % 5) + 1),
]);
const TABLE: Table = {
  fileName: 's.csv',
  format: 'csv',
  columns: ['respondent', 'answer', 'language', 'region', 'age', 'weight', 'link_key', 'satisfaction'],
  rows,
  assumed: { encoding: 'UTF-8' },
};

describe('suggestColumnTypes', () => {
  it('suggests a role for each kind of column', () => {
    expect(suggestColumnTypes(TABLE)).toEqual([
      { column: 'respondent', suggested: 'id' },
      { column: 'answer', suggested: 'text' },
      { column: 'language', suggested: 'language' },
      { column: 'region', suggested: 'categorical' },
      { column: 'age', suggested: 'numeric' },
      { column: 'weight', suggested: 'weight' },
      { column: 'link_key', suggested: 'link' },
      { column: 'satisfaction', suggested: 'categorical' },
    ]);
  });

  it('does not take country codes for languages when the column is named for countries', () => {
    const t: Table = { ...TABLE, columns: ['country'], rows: rows.map((_, i) => [['DE', 'FR', 'ES'][i % 3]]) };
    expect(suggestColumnTypes(t)).toEqual([{ column: 'country', suggested: 'categorical' }]);
  });

  it('treats an all-empty column as categorical', () => {
    const t: Table = { ...TABLE, columns: ['blank'], rows: rows.map(() => ['']) };
    expect(suggestColumnTypes(t)[0].suggested).toBe('categorical');
  });
});
