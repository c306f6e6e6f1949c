// Header cells → usable, unique column names.
//
// Choice (documented for users in the Data screen): names are trimmed; an empty header cell
// becomes `column_N` (N = its 1-based position); a repeated name gets a suffix `_2`, `_3`, …
// in order of appearance, so no column is lost and every column can be mapped by name.
// Spreadsheet programs allow both, so refusing the file would only make people edit it by hand.

export interface ColumnNaming {
  readonly columns: string[];
  /** Human-readable notes about renamed columns, e.g. 'header cell 3 was empty: named "column_3"'. */
  readonly renamed: string[];
}

export function uniqueColumnNames(header: readonly string[]): ColumnNaming {
  const columns: string[] = [];
  const renamed: string[] = [];
  const taken = new Set<string>();
  header.forEach((cell, index) => {
    let name = cell.replace(/^\uFEFF/, '').trim();
    if (name === '') {
      name = `column_${index + 1}`;
      renamed.push(`header cell ${index + 1} was empty: named "${name}"`);
    }
    if (taken.has(name)) {
      let k = 2;
      while (taken.has(`${name}_${k}`)) k++;
      renamed.push(`column name "${name}" repeats (cell ${index + 1}): named "${name}_${k}"`);
      name = `${name}_${k}`;
    }
    taken.add(name);
    columns.push(name);
  });
  return { columns, renamed };
}
