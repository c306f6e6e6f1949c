// Reading a glossary table (docs/design.md §3): headers are languages of the study, cells hold synonyms.
import { describe, expect, it } from 'vitest';
import { readGlossaryTable, splitSynonyms } from '../../../src/text/import/index.js';
import { InputError, type Table } from '../../../src/text/types.js';

function table(columns: string[], rows: string[][]): Table {
  return { fileName: 'terms.csv', format: 'csv', columns, rows, assumed: { encoding: 'UTF-8' } };
}

function error(f: () => unknown): InputError {
  try {
    f();
  } catch (e) {
    expect(e).toBeInstanceOf(InputError);
    return e as InputError;
  }
  throw new Error('expected an InputError');
}

describe('splitSynonyms', () => {
  it('splits on ";", "/" and line breaks, trims, and drops empties and repeats', () => {
    expect(splitSynonyms(' neutral / skeptical;Neutral\n\nwary ;; ')).toEqual(['neutral', 'skeptical', 'wary']);
    expect(splitSynonyms('   ')).toEqual([]);
  });
});

describe('readGlossaryTable', () => {
  it('maps tags, names and autonyms to the study\'s languages and keeps rows with two languages', () => {
    const g = readGlossaryTable(table(['English', 'es', 'Deutsch', ''], [['apple', 'manzana', 'Apfel', ''], ['pear', '', '', ''], ['', '', '', ''], ['', 'uva', 'Traube', '']]), ['en', 'es', 'de']);
    expect(g.columns).toEqual([{ column: 'English', language: 'en' }, { column: 'es', language: 'es' }, { column: 'Deutsch', language: 'de' }]);
    expect(g.rows.map((r) => [r.row, r.terms.map((t) => t.language)])).toEqual([[1, ['en', 'es', 'de']], [4, ['es', 'de']]]);
    expect(g.singleLanguageRows).toEqual([2]);
    expect(g.emptyRows).toBe(1);
  });

  it('names columns that are no language or not one of the study\'s, with the study\'s languages', () => {
    const e = error(() => readGlossaryTable(table(['en', 'fr', 'concept'], [['a', 'b', 'c']]), ['en', 'es']));
    expect(e.message).toContain('"concept" is not a language');
    expect(e.message).toContain('"fr (fr)" is not a language of this study');
    expect(e.message).toContain('(en, es)');
    expect(e.column).toBe('concept');
  });

  it('refuses a header-less column that has terms, two columns of one language, one column, and no linking row', () => {
    expect(error(() => readGlossaryTable(table(['en', ''], [['a', 'b']]), ['en'])).message).toContain('"column 2 (no header)" is not a language');
    expect(error(() => readGlossaryTable(table(['en', 'eng'], [['a', 'b']]), ['en'])).message).toContain('both name the language en');
    expect(error(() => readGlossaryTable(table(['en'], [['a']]), ['en', 'es'])).message).toContain('at least two language columns');
    expect(error(() => readGlossaryTable(table(['en', 'es'], []), ['en', 'es'])).message).toContain('the glossary is empty');
  });
});
