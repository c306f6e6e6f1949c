// The answers-by-theme table (DESIGN §8), shared by Export and Apply so both files have the same
// columns: the original id column (under its name in the imported file), question, the metadata
// columns (under their original names), language, link key, weight, one share column per theme
// named from its label, dominant theme.
import type { CsvCell } from './csv.js';
import { round6 } from './csv.js';
import { dominantTheme } from './run-model.js';

export interface AnswerRow {
  readonly rowId: string;
  readonly question: string;
  readonly covariates: Record<string, string | number | null>;
  readonly language: string | null;
  readonly linkKey: string | null;
  readonly weight: number;
  /** null when the answer has no mixture (excluded, undetermined, no known words). */
  readonly mixture: ArrayLike<number> | null;
}

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

/**
 * The table's header and rows. `idColumn` is the name of the id column in the imported file
 * ('id' when no id column was mapped: the ids are then row numbers).
 */
export function answersTable(rows: Iterable<AnswerRow>, covariateNames: readonly string[], labels: readonly string[], idColumn = 'id'): { header: string[]; rows: CsvCell[][] } {
  const fixed = [idColumn.trim() || 'id', 'question', ...covariateNames, 'language', 'link key', 'weight'];
  const header = [...fixed, ...shareColumns(labels, [...fixed, 'dominant theme']), 'dominant theme'];
  const out: CsvCell[][] = [];
  for (const r of rows) {
    const cells: CsvCell[] = [r.rowId, r.question, ...covariateNames.map((c) => r.covariates[c] ?? null), r.language ?? '', r.linkKey ?? '', r.weight];
    if (r.mixture) {
      for (let k = 0; k < labels.length; k++) cells.push(round6(r.mixture[k]));
      cells.push(labels[dominantTheme(r.mixture)]);
    } else {
      for (let k = 0; k <= labels.length; k++) cells.push('');
    }
    out.push(cells);
  }
  return { header, rows: out };
}
