// Suggesting what each column of an uploaded table is for, from its name and values. Only a
// suggestion shown on the mapping step: the researcher confirms or changes every choice.
import type { ColumnMapping, Table } from '../text/index.js';

export type ColumnRole = 'ignore' | 'text' | 'id' | 'language' | 'link' | 'categorical' | 'numeric' | 'weight';

export const ROLE_LABELS: Record<ColumnRole, string> = {
  ignore: 'Not used',
  text: 'Answer text',
  id: 'Respondent id',
  language: 'Language of the answer',
  link: 'Link key (translations / same respondent)',
  categorical: 'Group (categories)',
  numeric: 'Number (e.g. age)',
  weight: 'Survey weight',
};

export interface ColumnProfile {
  readonly name: string;
  readonly role: ColumnRole;
  readonly filled: number;
  readonly distinct: number;
  readonly numericShare: number;
  readonly meanLength: number;
  readonly examples: string[];
}

/** Rows looked at: enough to tell a text column from a code (common practice). */
export const PROFILE_ROWS = 2000;

export function profileColumns(table: Table): ColumnProfile[] {
  const rows = table.rows.slice(0, PROFILE_ROWS);
  const profiles = table.columns.map((name, j) => {
    const values = rows.map((r) => (r[j] ?? '').trim()).filter((v) => v !== '');
    const distinct = new Set(values).size;
    const numeric = values.filter((v) => /^[-+]?(\d+([.,]\d*)?|[.,]\d+)([eE][-+]?\d+)?$/.test(v)).length;
    const meanLength = values.length ? values.reduce((s, v) => s + v.length, 0) / values.length : 0;
    const examples = [...new Set(values)].slice(0, 3).map((v) => (v.length > 40 ? `${v.slice(0, 37)}…` : v));
    return { name, filled: values.length, distinct, numericShare: values.length ? numeric / values.length : 0, meanLength, examples, role: 'ignore' as ColumnRole };
  });
  const taken = new Set<ColumnRole>();
  const guess = (p: (typeof profiles)[number]): ColumnRole => {
    const n = p.name.toLowerCase();
    if (p.filled === 0) return 'ignore';
    if (/(^|_|\b)(lang|language|idioma|langue|sprache)/.test(n) && p.distinct <= 50 && !taken.has('language')) return 'language';
    if (/(^|_|\b)(weight|wt|wgt|peso|poids|gewicht)($|_|\b)/.test(n) && p.numericShare > 0.95 && !taken.has('weight')) return 'weight';
    if (/(^|_|\b)(link|pair|group_key|translation)/.test(n) && !taken.has('link')) return 'link';
    if (/(^|_|\b)(id|respondent|resp_id|case|row_id|uuid)($|_|\b)/.test(n) && p.distinct >= 0.95 * p.filled && !taken.has('id')) return 'id';
    if (p.numericShare > 0.95 && p.distinct > 12) return 'numeric';
    if (p.meanLength >= 40 || (p.meanLength >= 20 && p.distinct > 0.3 * p.filled)) return 'text';
    if (p.distinct <= Math.max(30, 0.05 * p.filled)) return 'categorical';
    return 'ignore';
  };
  return profiles.map((p) => {
    const role = guess(p);
    if (role !== 'text' && role !== 'categorical' && role !== 'numeric') taken.add(role);
    return { ...p, role };
  });
}

/** Roles chosen on the mapping form → the importer's ColumnMapping, or an error message. */
export function mappingFromRoles(columns: readonly string[], roles: readonly ColumnRole[]): ColumnMapping | string {
  const mapping: ColumnMapping = { text: [], covariates: [] };
  for (let j = 0; j < columns.length; j++) {
    const c = columns[j];
    switch (roles[j]) {
      case 'text': mapping.text.push(c); break;
      case 'categorical': mapping.covariates.push({ column: c, type: 'categorical' }); break;
      case 'numeric': mapping.covariates.push({ column: c, type: 'numeric' }); break;
      case 'id':
      case 'language':
      case 'link':
      case 'weight': {
        if (mapping[roles[j] as 'id'] !== undefined) return `Only one column can be the ${ROLE_LABELS[roles[j]].toLowerCase()}; "${mapping[roles[j] as 'id']}" and "${c}" were both chosen.`;
        mapping[roles[j] as 'id'] = c;
        break;
      }
      default: break;
    }
  }
  if (mapping.text.length === 0) return 'Choose at least one column as "Answer text".';
  return mapping;
}
