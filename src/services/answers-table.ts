// The answers-by-theme table (docs/design.md §8), shared by Export and Apply so both files have the same
// columns: the original id column (under its name in the imported file), question (only when
// the file had several text columns: with one it would say the same on every row), the answer
// text (optional), the metadata columns (under their original names), language, link key,
// weight, one share column per theme named from its label, dominant theme, and why an answer
// has no shares when it has none (a blank row with no reason reads as a bug).
import type { CsvCell } from './csv.js';
import { round6 } from './csv.js';
import { dominantTheme } from './run-model.js';

/** Why an answer has no theme shares, in the words the files and pages use. */
export type BlankReason =
  | 'non-answer'
  | 'too short'
  | 'language undetermined'
  | 'language not in this run'
  | 'no word the run knows'
  | 'no words after filtering';

/** The study's exclusion reasons (src/text/vocabulary/prepare.ts) → the file's wording. */
export function blankReasonFor(excluded: string): BlankReason | string {
  return excluded === 'undetermined' ? 'language undetermined' : excluded;
}

export interface AnswerRow {
  readonly rowId: string;
  readonly question: string;
  readonly text?: string;
  readonly covariates: Record<string, string | number | null>;
  readonly language: string | null;
  readonly linkKey: string | null;
  readonly weight: number;
  /** null when the answer has no mixture (excluded, undetermined, no known words). */
  readonly mixture: ArrayLike<number> | null;
  /** Why the mixture is null (empty when it is not). */
  readonly reason?: BlankReason | string | null;
  /** How the answer's prior was formed when the fit had no level for it (Apply). */
  readonly note?: string | null;
}

export interface AnswersTableOptions {
  /** Name of the id column in the imported file ('id' when none was mapped: ids are row numbers). */
  idColumn?: string;
  /** Write the question column (the file had several text columns). Default true. */
  questions?: boolean;
  /** Write the answer text. Default false. */
  text?: boolean;
  /** Write the coding-note column (Apply, when a covariate was absent or had new levels). Default false. */
  notes?: boolean;
}

/** Header of the reason column. */
export const REASON_COLUMN = 'left out because';
/** Header of the note column. */
export const NOTE_COLUMN = 'coding note';

/** Share column names: the labels, made distinct from each other and from the fixed columns. */
export function shareColumns(labels: readonly string[], taken: readonly string[]): string[] {
  const used = new Set(taken.map((t) => t.toLowerCase()));
  return labels.map((label) => {
    let name = label.trim() || 'Theme';
    for (let i = 2; used.has(name.toLowerCase()); i++) name = `${label.trim() || 'Theme'} (${i})`;
    used.add(name.toLowerCase());
    return name;
  });
}

/** The table's header and rows. */
export function answersTable(rows: Iterable<AnswerRow>, covariateNames: readonly string[], labels: readonly string[], options: AnswersTableOptions = {}): { header: string[]; rows: CsvCell[][] } {
  const questions = options.questions ?? true;
  const withText = options.text ?? false;
  const notes = options.notes ?? false;
  const textColumn = covariateNames.some((c) => c.toLowerCase() === 'answer') ? 'answer text' : 'answer';
  const fixed = [(options.idColumn ?? 'id').trim() || 'id', ...(questions ? ['question'] : []), ...(withText ? [textColumn] : []), ...covariateNames, 'language', 'link key', 'weight'];
  const tail = ['dominant theme', REASON_COLUMN, ...(notes ? [NOTE_COLUMN] : [])];
  const header = [...fixed, ...shareColumns(labels, [...fixed, ...tail]), ...tail];
  const out: CsvCell[][] = [];
  for (const r of rows) {
    const cells: CsvCell[] = [r.rowId];
    if (questions) cells.push(r.question);
    if (withText) cells.push(r.text ?? '');
    for (const c of covariateNames) cells.push(r.covariates[c] ?? null);
    cells.push(r.language ?? '', r.linkKey ?? '', r.weight);
    if (r.mixture) {
      for (let k = 0; k < labels.length; k++) cells.push(round6(r.mixture[k]));
      cells.push(labels[dominantTheme(r.mixture)], '');
    } else {
      for (let k = 0; k <= labels.length; k++) cells.push('');
      cells.push(r.reason ?? '');
    }
    if (notes) cells.push(r.note ?? '');
    out.push(cells);
  }
  return { header, rows: out };
}
