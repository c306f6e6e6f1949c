// The one place services call the text pipeline (src/text), so the rest of the services layer
// depends on a small, stable shape: read → map → identify → prepare.
import {
  DECLARED_PRIOR,
  defaultPipelineSettings,
  identifyLanguages,
  mapColumns,
  normalizeLanguageTag,
  prepareText,
  readTable,
} from '../text/index.js';
import { InputError, type ColumnMapping, type LanguageDecision, type MappedDocument, type PipelineSettings, type PreparedText, type Table } from '../text/index.js';

export { InputError };

export async function readInputTable(bytes: Uint8Array, fileName: string, sheet?: string): Promise<Table> {
  return readTable(bytes, fileName, sheet === undefined ? {} : { sheet });
}

/** `keepEmpty`: empty text cells come back too, with text '' (an import keeps them as left out). */
export function mapInputColumns(table: Table, mapping: ColumnMapping, languages: string[], keepEmpty = false): MappedDocument[] {
  const mapped = mapColumns(table, mapping, { languages, keepEmpty }) as unknown;
  if (Array.isArray(mapped)) return mapped as MappedDocument[];
  return (mapped as { documents: MappedDocument[] }).documents;
}

/** Normalise user-given language tags; an unknown tag is an InputError naming it. */
export function normalizeLanguages(tags: readonly string[], source = '--languages'): string[] {
  const out: string[] = [];
  for (const raw of tags) {
    const tag = raw.trim();
    if (!tag) continue;
    const norm = normalizeLanguageTag(tag);
    if (!norm) throw new InputError(`"${tag}" in ${source} is not a language tag Themata knows. Use ISO 639-1 codes such as en, es, fr, de, ja.`);
    if (!out.includes(norm)) out.push(norm);
  }
  return out;
}

export interface LanguageOutcome {
  /** The decision kept: the written language, with the declared one as a strong prior (or trusted, when asked). */
  readonly decision: LanguageDecision;
  /** The language the text is written in, judged from the text alone (null: too little evidence). */
  readonly written: string | null;
}

/**
 * Decide each answer's language (docs/design.md §5): the declared (questionnaire) language is a strong
 * prior, not the truth (DECLARED_PRIOR of the mass, src/text/language/declared-prior.ts), so
 * confident detection of the written language wins and too little evidence keeps the
 * declaration; the declared language itself is stored beside the decision. With
 * `trustDeclared` the declaration always wins (the written language is still judged, so the
 * disagreements can be reviewed).
 */
export function decideLanguages(texts: string[], languages: string[], declared: (string | undefined)[], trustDeclared = false): LanguageOutcome[] {
  const byText = identifyLanguages(texts, { languages, declared, declaredPrior: DECLARED_PRIOR });
  return byText.map((d, i) => {
    const written = d.written !== undefined ? d.written : d.language;
    const tag = declared[i]?.trim();
    const decision: LanguageDecision = trustDeclared && tag ? { language: normalizeLanguageTag(tag) ?? tag, source: 'declared', confidence: 1 } : d;
    return { decision, written };
  });
}

/** The study's pipeline settings: defaults, overridden by the study's saved `pipeline` settings. */
export function pipelineSettings(saved: unknown, extraStopWords: Record<string, string[]>): PipelineSettings {
  const base = defaultPipelineSettings();
  const patch = saved && typeof saved === 'object' ? (saved as Partial<PipelineSettings>) : {};
  return { ...base, ...patch, extraStopWords: { ...base.extraStopWords, ...extraStopWords } };
}

export function prepareDocuments(
  docs: { language: string | null; text: string; reference?: boolean }[],
  settings: PipelineSettings,
  onProgress?: (done: number, total: number) => void,
): PreparedText {
  return prepareText(docs, settings, onProgress);
}

/** Languages offered when a study declares none and the file has no language column (common practice). */
export const DEFAULT_LANGUAGES = ['en', 'es', 'fr', 'de', 'it', 'pt', 'nl', 'ja', 'zh'];
