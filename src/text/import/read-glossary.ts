// A researcher's glossary as a table: one row per concept, one column per language (docs/design.md §3).
// Each header names a language of the study (a tag such as `es` or a name such as `Español`,
// as normalizeLanguageTag reads them); a cell may hold several synonyms separated by ";", "/"
// or a line break (spreadsheets' Alt+Enter), common practice in term lists.
// Pure: a Table in, rows of terms out, or an InputError naming the file, columns and row.

import { normalizeLanguageTag } from '../language-tags.js';
import { InputError, type Table } from '../types.js';

export interface GlossaryColumn {
  /** The header as written in the file. */
  readonly column: string;
  /** Its language (BCP 47 primary subtag). */
  readonly language: string;
}

export interface GlossaryRow {
  /** Data row number in the file, from 1 (the header row is not counted). */
  readonly row: number;
  /** Terms per language, only for languages with at least one term; in column order. */
  readonly terms: { readonly language: string; readonly terms: string[] }[];
}

export interface GlossaryTable {
  readonly columns: GlossaryColumn[];
  /** Rows with terms in at least two languages: each becomes a link group. */
  readonly rows: GlossaryRow[];
  /** Data rows with terms in only one language (they link nothing, so they are left out). */
  readonly singleLanguageRows: number[];
  /** Data rows with no term at all. */
  readonly emptyRows: number;
}

/** Characters that separate synonyms inside one cell. */
const SYNONYM_SEPARATORS = /[;/\n\r]+/;

/** The synonyms of one cell, trimmed, without empties or repeats (first spelling kept). */
export function splitSynonyms(cell: string): string[] {
  const out: string[] = [];
  const seen = new Set<string>();
  for (const part of cell.split(SYNONYM_SEPARATORS)) {
    const term = part.replace(/\s+/g, ' ').trim();
    const key = term.toLocaleLowerCase('und');
    if (term && !seen.has(key)) (seen.add(key), out.push(term));
  }
  return out;
}

function quoted(names: readonly string[]): string {
  return names.map((n) => `"${n}"`).join(', ');
}

/**
 * Read a glossary table against the study's languages. InputError when a column is not one of
 * the study's languages, when two columns name the same language, when fewer than two language
 * columns remain, or when no row has terms in two languages.
 */
export function readGlossaryTable(table: Table, studyLanguages: readonly string[]): GlossaryTable {
  const file = table.fileName;
  const languages = studyLanguages.join(', ') || 'none yet';
  const columns: (GlossaryColumn | null)[] = [];
  const notLanguages: string[] = [];
  const otherLanguages: string[] = [];
  table.columns.forEach((raw, j) => {
    const name = raw.trim();
    // A column with neither a header nor any cell (a trailing delimiter) is no column at all.
    if (!name && table.rows.every((r) => !r[j]?.trim())) return void columns.push(null);
    const language = name ? normalizeLanguageTag(name) : null;
    if (language === null) notLanguages.push(name || `column ${j + 1} (no header)`);
    else if (!studyLanguages.includes(language)) otherLanguages.push(`${name} (${language})`);
    columns.push(language === null ? null : { column: name, language });
  });
  if (notLanguages.length || otherLanguages.length) {
    const parts = [
      notLanguages.length && `${quoted(notLanguages)} ${notLanguages.length === 1 ? 'is not a language' : 'are not languages'}`,
      otherLanguages.length && `${quoted(otherLanguages)} ${otherLanguages.length === 1 ? 'is not a language' : 'are not languages'} of this study`,
    ].filter(Boolean);
    throw new InputError(
      `${file}: ${parts.join('; ')}. Every column of a glossary names one of the study's languages (${languages}), ` +
        'by its tag (such as en) or its name (such as English or Español); rename or remove the other columns.',
      file,
      undefined,
      notLanguages[0] ?? otherLanguages[0]?.replace(/ \([^)]*\)$/, ''),
    );
  }
  const used = columns.filter((c): c is GlossaryColumn => c !== null);
  for (const c of used) {
    const twin = used.find((d) => d !== c && d.language === c.language);
    if (twin) throw new InputError(`${file}: columns "${c.column}" and "${twin.column}" both name the language ${c.language}. Put all terms of one language in one column.`, file, undefined, twin.column);
  }
  if (used.length < 2) {
    throw new InputError(
      `${file}: a glossary needs at least two language columns (one row per concept, one column per language); this file has ${used.length === 0 ? 'none' : `only "${used[0].column}"`}. The study's languages: ${languages}.`,
      file,
    );
  }
  const rows: GlossaryRow[] = [];
  const singleLanguageRows: number[] = [];
  let emptyRows = 0;
  table.rows.forEach((cells, i) => {
    const terms: GlossaryRow['terms'][number][] = [];
    columns.forEach((c, j) => {
      if (!c) return;
      const found = splitSynonyms(cells[j] ?? '');
      if (found.length) terms.push({ language: c.language, terms: found });
    });
    if (terms.length >= 2) rows.push({ row: i + 1, terms });
    else if (terms.length === 1) singleLanguageRows.push(i + 1);
    else emptyRows++;
  });
  if (rows.length === 0) {
    throw new InputError(
      `${file}: the glossary is empty: no row has terms in two languages (${table.rows.length} data rows read${singleLanguageRows.length ? `, ${singleLanguageRows.length} with terms in one language only` : ''}). ` +
        'Put one concept per row and its term in each language in that language\'s column.',
      file,
    );
  }
  return { columns: used, rows, singleLanguageRows, emptyRows };
}
