// truth.json layout: the summary pretty-printed with short lists kept on one line, then one row
// object per line, so the file is readable and diffs stay small.
import type { DemoTruth } from './types.js';

/** Arrays of strings or numbers only (no objects or nested arrays) go on one line. */
const FLAT_ARRAY = /\[\n\s+([^\[\]{}]*?)\n\s+\]/g;

export function demoTruthJson(truth: DemoTruth): string {
  const { rows, ...head } = truth;
  const headText = JSON.stringify(head, null, 2).replace(FLAT_ARRAY, (_, items: string) => `[${items.split(/,\n\s+/).join(', ')}]`);
  const body = rows === null ? 'null' : rows.length === 0 ? '[]' : `[\n${rows.map((r) => '    ' + JSON.stringify(r)).join(',\n')}\n  ]`;
  return `${headText.slice(0, -2)},\n  "rows": ${body}\n}\n`;
}
