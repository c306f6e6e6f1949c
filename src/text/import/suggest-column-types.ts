// A first guess at each column's role, shown pre-selected in the column mapping form.
// Heuristics (common practice; the user always confirms):
//   language    — nearly all values are language tags or names, few distinct values;
//   weight      — positive numbers in a column whose name says weight;
//   id          — every row has a value, all distinct, short and without spaces, or the name says id;
//   link        — the name says link/pair/group/key and values repeat;
//   numeric     — nearly all values are numbers (integers with ≤ 5 levels → categorical);
//   text        — long or many-word values that are mostly distinct;
//   categorical — few distinct values, and the fallback.

import { normalizeLanguageTag } from '../language-tags.js';
import type { Table } from '../types.js';
import { parseNumber } from './parse-number.js';

export type SuggestedType = 'text' | 'id' | 'language' | 'categorical' | 'numeric' | 'weight' | 'link';

const SAMPLE_ROWS = 5000;
const WEIGHT_NAME = /(^|[^a-z])(weight|wgt|wt|gewicht|poids|peso|ponderaci[oó]n|pond)([^a-z]|$)/i;
const ID_NAME = /(^|[^a-z])(id|uuid|respondent|resp_?id|case_?id|record)([^a-z]|$)/i;
const LINK_NAME = /(^|[^a-z])(link|pair|paired|group|concept|key|translation_?of)([^a-z]|$)/i;
const LANGUAGE_NAME = /(^|[^a-z])(lang|language|locale|idioma|sprache|langue)([^a-z]|$)/i;
// Country codes (DE, FR, ES) look like language codes; a column named for countries is not one.
const COUNTRY_NAME = /(^|[^a-z])(country|countries|nation|land|pa[ií]s|pays)([^a-z]|$)/i;

export function suggestColumnTypes(table: Table): { column: string; suggested: SuggestedType }[] {
  const step = Math.max(1, Math.floor(table.rows.length / SAMPLE_ROWS));
  const sample: string[][] = [];
  for (let r = 0; r < table.rows.length && sample.length < SAMPLE_ROWS; r += step) sample.push(table.rows[r]);
  return table.columns.map((column, c) => ({
    column,
    suggested: suggestOne(column, sample.map((row) => row[c].trim())),
  }));
}

function suggestOne(name: string, cells: string[]): SuggestedType {
  const values = cells.filter((v) => v !== '');
  if (values.length === 0) return 'categorical';
  const distinct = new Set(values);
  const distinctShare = distinct.size / values.length;
  const allFilled = values.length === cells.length;

  const languageHits = [...distinct].filter((v) => v.length <= 40 && normalizeLanguageTag(v) !== null).length;
  if (!COUNTRY_NAME.test(name) && distinct.size <= 60 && languageHits >= 0.9 * distinct.size && (LANGUAGE_NAME.test(name) || distinct.size >= 2)) {
    return 'language';
  }

  const numbers = values.map(parseNumber);
  const numericShare = numbers.filter((p) => p.ok).length / values.length;
  if (numericShare >= 0.95) {
    const nums = numbers.flatMap((p) => (p.ok ? [p.value] : []));
    if (WEIGHT_NAME.test(name) && nums.every((n) => n > 0)) return 'weight';
    const integers = nums.every((n) => Number.isInteger(n));
    if (integers && allFilled && distinctShare === 1 && (ID_NAME.test(name) || values.length >= 20 && isMostlyConsecutive(nums))) return 'id';
    if (integers && distinct.size <= 5) return 'categorical';
    return 'numeric';
  }

  const meanLength = values.reduce((s, v) => s + v.length, 0) / values.length;
  const meanWords = values.reduce((s, v) => s + v.split(/\s+/).length, 0) / values.length;
  const noSpaces = values.every((v) => !/\s/.test(v));
  if (allFilled && distinctShare === 1 && (ID_NAME.test(name) || (noSpaces && meanLength <= 40 && values.length >= 5))) {
    return 'id';
  }
  if (LINK_NAME.test(name) && distinctShare < 1) return 'link';
  if ((meanLength >= 20 || meanWords >= 3) && distinctShare >= 0.5) return 'text';
  if (distinct.size <= Math.max(20, 0.05 * values.length)) return 'categorical';
  return meanLength >= 12 ? 'text' : 'categorical';
}

function isMostlyConsecutive(nums: number[]): boolean {
  const sorted = [...nums].sort((a, b) => a - b);
  // A row counter (1..n with few gaps), not a measurement that happens to be distinct.
  return sorted[sorted.length - 1] - sorted[0] + 1 <= 1.1 * sorted.length;
}
