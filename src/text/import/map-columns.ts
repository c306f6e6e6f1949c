// Table + the user's column mapping → one MappedDocument per non-empty text cell (docs/design.md §3).
//
// Several text columns give several documents per row, each with `question` = its column name.
// The whole table is checked before anything is returned, so a bad row never leaves half a
// study: the first problem is reported with its data row and column (plus how many other rows
// of that column have a problem), and nothing is mapped.
//
// Declared languages: a cell that is not a known language tag or name, or a language outside
// the study's languages, does not fail the import; the document gets no declared language (so
// language identification decides it) and the value is counted in the report.

import { normalizeLanguageTag } from '../language-tags.js';
import { InputError, type ColumnMapping, type MappedDocument, type Table } from '../types.js';
import { clip, INPUT_LIMITS, listNames, type InputLimits } from './input-limits.js';
import { parseNumber } from './parse-number.js';

export interface MapColumnsOptions {
  /** The study's languages (any form normalizeLanguageTag accepts). */
  languages?: string[];
  /** Bounds on answers (default INPUT_LIMITS). */
  limits?: InputLimits;
  /** Also return empty text cells, as documents with text '', so an import can list them as left out. */
  keepEmpty?: boolean;
}

/** Distinct unknown language values kept in the report (the rest are only counted). */
const REPORTED_VALUES = 20;

export interface MappingReport {
  readonly rows: number;
  readonly documents: number;
  /** Text cells skipped because they were empty or only white space. */
  readonly emptyTextCells: number;
  /** Declared-language cells that are not a known tag or name: value (clipped), how often, first data row; the first 20 values. */
  readonly unknownLanguages: { value: string; count: number; firstRow: number }[];
  /** Distinct unknown values beyond those listed. */
  readonly moreUnknownLanguages: number;
  /** Valid declared languages that are not among the study's languages. */
  readonly outsideStudyLanguages: { language: string; count: number }[];
}

export interface MappedTable {
  readonly documents: MappedDocument[];
  readonly report: MappingReport;
}

export function mapColumns(table: Table, mapping: ColumnMapping, options: MapColumnsOptions = {}): MappedDocument[] {
  return mapColumnsWithReport(table, mapping, options).documents;
}

export function mapColumnsWithReport(table: Table, mapping: ColumnMapping, options: MapColumnsOptions = {}): MappedTable {
  const file = table.fileName;
  const col = columnIndexer(table);
  const limits = options.limits ?? INPUT_LIMITS;
  if (mapping.text.length === 0) {
    throw new InputError(`${file}: choose at least one text column (the answers to analyse).`, file);
  }
  const twice = mapping.text.find((c, i) => mapping.text.indexOf(c) !== i);
  if (twice !== undefined) {
    throw new InputError(`${file}: the column "${clip(twice)}" is chosen twice as a text column; choose it once.`, file, undefined, twice);
  }
  const textCols = mapping.text.map((c) => col(c, 'text'));
  const idCol = mapping.id === undefined ? -1 : col(mapping.id, 'id');
  const langCol = mapping.language === undefined ? -1 : col(mapping.language, 'language');
  const linkCol = mapping.link === undefined ? -1 : col(mapping.link, 'link');
  const weightCol = mapping.weight === undefined ? -1 : col(mapping.weight, 'weight');
  const covariates = mapping.covariates.map((c) => ({ ...c, index: col(c.column, 'covariate') }));
  col.throwIfMissing();
  const study = studyLanguages(options.languages, file);

  const problems = new ProblemLog(file);
  const seenIds = new Map<string, number>();
  const unknown = new Map<string, { count: number; firstRow: number }>();
  const moreUnknown = new Set<string>();
  const outside = new Map<string, number>();
  const documents: MappedDocument[] = [];
  let emptyTextCells = 0;
  // A language column holds a handful of distinct values; normalize each once.
  const tagCache = new Map<string, string | null>();

  table.rows.forEach((row, r) => {
    const rowNo = r + 1;
    let rowId = String(rowNo);
    if (idCol >= 0) {
      rowId = row[idCol].trim();
      const first = seenIds.get(rowId);
      if (rowId === '') problems.add(mapping.id!, rowNo, 'the id is empty; every row needs an id');
      else if (first !== undefined) problems.add(mapping.id!, rowNo, `id "${clip(rowId)}" is already used by data row ${first}; ids must be unique`);
      else seenIds.set(rowId, rowNo);
    }
    let weight = 1;
    if (weightCol >= 0) {
      const cell = row[weightCol];
      const parsed = parseNumber(cell);
      if (!parsed.ok) problems.add(mapping.weight!, rowNo, `weight "${clip(cell)}" ${cell.trim() === '' ? 'is empty' : parsed.reason}; weights must be positive numbers`);
      else if (!(parsed.value > 0)) problems.add(mapping.weight!, rowNo, `weight ${clip(cell.trim())} is not positive; weights must be positive numbers`);
      else weight = parsed.value;
    }
    const values: Record<string, string | number | null> = {};
    for (const c of covariates) {
      const cell = row[c.index].trim();
      if (cell === '') values[c.column] = null;
      else if (c.type === 'categorical') values[c.column] = cell;
      else {
        const parsed = parseNumber(cell);
        if (parsed.ok) values[c.column] = parsed.value;
        else problems.add(c.column, rowNo, `"${clip(cell)}" ${parsed.reason}, but the column is a numeric covariate (map it as categorical, or fix the cell; empty cells are allowed)`);
      }
    }
    let declaredLanguage: string | undefined;
    if (langCol >= 0) {
      const cell = row[langCol].trim();
      if (cell !== '') {
        let tag = tagCache.get(cell);
        if (tag === undefined) {
          tag = normalizeLanguageTag(cell);
          tagCache.set(cell, tag);
        }
        if (tag === null) {
          const u = unknown.get(cell) ?? { count: 0, firstRow: rowNo };
          u.count++;
          if (u.count === 1 && unknown.size >= REPORTED_VALUES) moreUnknown.add(cell);
          else unknown.set(cell, u);
        } else if (study !== null && !study.has(tag)) {
          outside.set(tag, (outside.get(tag) ?? 0) + 1);
        } else declaredLanguage = tag;
      }
    }
    const linkCell = linkCol >= 0 ? row[linkCol].trim() : '';
    for (let t = 0; t < textCols.length; t++) {
      const text = row[textCols[t]].trim();
      if (text === '') {
        emptyTextCells++;
        if (!options.keepEmpty) continue;
      }
      if (text.length > limits.maxAnswerChars) {
        problems.add(
          mapping.text[t],
          rowNo,
          `the answer is ${text.length.toLocaleString('en')} characters long, over the limit of ${limits.maxAnswerChars.toLocaleString('en')} for one answer (split it into several answers, or check that this is the answer column)`,
        );
        continue;
      }
      documents.push({
        rowId,
        question: mapping.text[t],
        text,
        ...(declaredLanguage !== undefined ? { declaredLanguage } : {}),
        ...(linkCell !== '' ? { linkKey: linkCell } : {}),
        covariates: { ...values },
        weight,
      });
    }
  });
  problems.throwIfAny();

  return {
    documents,
    report: {
      rows: table.rows.length,
      documents: documents.length,
      emptyTextCells,
      unknownLanguages: [...unknown].map(([value, u]) => ({ value: clip(value), ...u })),
      moreUnknownLanguages: moreUnknown.size,
      outsideStudyLanguages: [...outside].map(([language, count]) => ({ language, count })),
    },
  };
}

/**
 * Finds mapped columns by name. Every column the mapping names but the file lacks is collected,
 * and `throwIfMissing` names them all at once (with a bounded list of the file's columns).
 */
function columnIndexer(table: Table): ((name: string, role: string) => number) & { throwIfMissing(): void } {
  const index = new Map(table.columns.map((c, i) => [c, i] as const));
  const missing: { name: string; role: string }[] = [];
  const find = (name: string, role: string): number => {
    const i = index.get(name);
    if (i !== undefined) return i;
    missing.push({ name, role });
    return -1;
  };
  return Object.assign(find, {
    throwIfMissing(): void {
      if (missing.length === 0) return;
      const what = missing.map((m) => `"${clip(m.name)}" (chosen as ${m.role} column)`);
      const list = what.length > 12 ? `${what.slice(0, 12).join(', ')} … and ${what.length - 12} more` : what.join(', ');
      throw new InputError(
        `${table.fileName}: there ${missing.length === 1 ? 'is no column' : `are no columns`} ${list}. The columns are: ${listNames(table.columns)}.`,
        table.fileName,
        undefined,
        missing[0].name,
      );
    },
  });
}

function studyLanguages(languages: string[] | undefined, file: string): Set<string> | null {
  if (languages === undefined || languages.length === 0) return null;
  const set = new Set<string>();
  for (const l of languages) {
    const tag = normalizeLanguageTag(l);
    if (tag === null) {
      throw new InputError(`"${l}" is not a language Themata knows; use a code such as en, es or zh.`, file);
    }
    set.add(tag);
  }
  return set;
}

/** Remembers the first problem and how many rows of the same column also have one. */
class ProblemLog {
  private first: { column: string; row: number; message: string } | null = null;
  private others = 0;
  constructor(private readonly file: string) {}
  add(column: string, row: number, message: string): void {
    if (this.first === null) this.first = { column, row, message };
    else if (this.first.column === column) this.others++;
  }
  throwIfAny(): void {
    if (this.first === null) return;
    const { column, row, message } = this.first;
    const more = this.others > 0 ? ` (${this.others} more row${this.others === 1 ? '' : 's'} of this column have a problem too)` : '';
    throw new InputError(`${this.file}: data row ${row}, column "${clip(column)}": ${message}${more}.`, this.file, row, column);
  }
}
