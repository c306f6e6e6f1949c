// Public surface of the importers: bytes → Table → mapped documents (docs/design.md §3, §5).
export { readTable, READ_TABLE_DEFAULTS, type ReadTableOptions } from './read-table.js';
export {
  mapColumns,
  mapColumnsWithReport,
  type MapColumnsOptions,
  type MappingReport,
  type MappedTable,
} from './map-columns.js';
export { suggestColumnTypes, type SuggestedType } from './suggest-column-types.js';
export { parseNumber, type ParsedNumber } from './parse-number.js';
export { normalizeLanguageTag, toIso6393, fromIso6393, knownLanguageSubtags } from '../language-tags.js';
export { listNames } from './input-limits.js';
export { readGlossaryTable, splitSynonyms, type GlossaryColumn, type GlossaryRow, type GlossaryTable } from './read-glossary.js';
