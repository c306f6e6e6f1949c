// JSON Lines (one JSON object per line, https://jsonlines.org) → header + rows.
// Columns are the union of the objects' keys in first-seen order. Strings stay as they are,
// numbers and booleans become their JSON text, null becomes '' (missing). A nested array or
// object is refused with its line and field: stored as JSON text it would be analysed as an
// answer full of braces and quotes without anyone noticing (issue 14). A `.json` file holding
// one array of objects is read the same way. Columns, names and cells are bounded as for every
// format (input-limits.ts), checked object by object.

import { InputError } from '../types.js';
import { checkCell, checkColumnCount, checkHeader, clip, INPUT_LIMITS, type InputLimits } from './input-limits.js';

export interface JsonlResult {
  readonly columns: string[];
  readonly rows: string[][];
}

export function readJsonl(text: string, fileName: string, maxRows: number, limits: InputLimits = INPUT_LIMITS): JsonlResult {
  const objects: { value: Record<string, unknown>; line: number }[] = [];
  const trimmed = text.trimStart();
  const unit = trimmed.startsWith('[') ? 'item' : 'line';
  if (trimmed.startsWith('[')) {
    let parsed: unknown;
    try {
      parsed = JSON.parse(text);
    } catch (err) {
      throw new InputError(
        `${fileName}: the file starts with "[" but is not valid JSON (${clip((err as Error).message, 200)}).`,
        fileName,
      );
    }
    if (!Array.isArray(parsed)) throw new InputError(`${fileName}: expected an array of objects.`, fileName);
    parsed.forEach((value, i) => objects.push({ value: asObject(value, fileName, i + 1, 'item'), line: i + 1 }));
  } else {
    const lines = text.split(/\r\n|\n|\r/);
    for (let i = 0; i < lines.length; i++) {
      const line = lines[i].trim();
      if (line === '') continue;
      let value: unknown;
      try {
        value = JSON.parse(line);
      } catch (err) {
        throw new InputError(
          `${fileName}: line ${i + 1} is not valid JSON (${clip((err as Error).message, 200)}). Each line must ` +
            'hold one complete JSON object, such as {"id": 1, "answer": "…"}.',
          fileName,
          objects.length + 1,
        );
      }
      objects.push({ value: asObject(value, fileName, i + 1, 'line'), line: i + 1 });
      if (objects.length > maxRows) break;
    }
  }
  if (objects.length === 0) {
    throw new InputError(`${fileName}: the file has no JSON objects (it is empty or blank).`, fileName);
  }
  if (objects.length > maxRows) {
    throw new InputError(
      `${fileName}: the file has more than ${maxRows.toLocaleString('en')} rows, the limit for one ` +
        'import. Split it into several files and import each.',
      fileName,
      maxRows + 1,
    );
  }

  const index = new Map<string, number>();
  for (const { value, line } of objects) {
    for (const key of Object.keys(value)) if (!index.has(key)) index.set(key, index.size);
    if (index.size > limits.maxColumns) checkColumnCount(index.size, fileName, `${unit} ${line.toLocaleString('en')} (with the ${unit}s before it)`, limits);
  }
  const columns = [...index.keys()];
  if (columns.length === 0) {
    throw new InputError(`${fileName}: every object is empty ({}), so there are no columns.`, fileName);
  }
  checkHeader(columns, fileName, limits);
  const rows = objects.map(({ value, line }, r) => {
    const row = new Array<string>(columns.length).fill('');
    for (const [key, cell] of Object.entries(value)) {
      const text = cellText(cell, fileName, unit, line, key);
      if (text.length > limits.maxCellChars) checkCell(text, fileName, r + 1, key, limits);
      row[index.get(key)!] = text;
    }
    return row;
  });
  return { columns, rows };
}

function asObject(value: unknown, fileName: string, where: number, unit: 'line' | 'item'): Record<string, unknown> {
  if (value !== null && typeof value === 'object' && !Array.isArray(value)) return value as Record<string, unknown>;
  const kind = value === null ? 'null' : Array.isArray(value) ? 'an array' : `a ${typeof value}`;
  throw new InputError(
    `${fileName}: ${unit} ${where} holds ${kind}, not a JSON object. Each ${unit} must be an object ` +
      'whose keys are the column names.',
    fileName,
  );
}

function cellText(cell: unknown, fileName: string, unit: string, line: number, key: string): string {
  if (cell === null || cell === undefined) return '';
  if (typeof cell === 'string') return cell;
  if (typeof cell === 'number' || typeof cell === 'boolean') return String(cell);
  const kind = Array.isArray(cell) ? 'a list ([…])' : 'a nested object ({…})';
  throw new InputError(
    `${fileName}: ${unit} ${line.toLocaleString('en')}, field "${clip(key)}" holds ${kind}, not a text or a number. ` +
      'Each field must hold one value: put the answer text itself in the field, or move nested values to fields of their own ' +
      '(e.g. "answer_text", "answer_language").',
    fileName,
    undefined,
    key,
  );
}
