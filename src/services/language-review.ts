// Reviewing language decisions from the command line (the Languages page does the same through
// its routes): accept the language an answer is written in instead of the one decided, for some
// answers or all, or set a language by hand. Answers are named by their row id (the file's id
// column); every document of that row changes. The vocabulary is rebuilt after a change.
import { adoptWrittenLanguages, iterateDocuments, languageSummary, overrideLanguages, type Store } from '../store/index.js';
import { normalizeLanguageTag } from '../text/index.js';
import { InputError } from '../text/index.js';
import { rebuildVocabulary } from './vocabulary.js';

/** Document ids of the study's answers per row id; an unknown row id is an InputError naming it. */
function documentIds(store: Store, studyId: number, rowIds: readonly string[], option: string): number[] {
  const wanted = new Set(rowIds.map((r) => r.trim()).filter((r) => r !== ''));
  const found = new Map<string, number[]>();
  for (const d of iterateDocuments(store, studyId)) {
    if (!wanted.has(d.rowId)) continue;
    const list = found.get(d.rowId) ?? [];
    list.push(d.id);
    found.set(d.rowId, list);
  }
  const missing = [...wanted].filter((r) => !found.has(r));
  if (missing.length > 0) {
    throw new InputError(`${option}: no answer has the row id ${missing.slice(0, 5).map((r) => `"${r}"`).join(', ')}${missing.length > 5 ? ` and ${missing.length - 5} more` : ''}. Use the ids of the "id" column of \`themata languages\`.`);
  }
  return [...found.values()].flat();
}

/**
 * Take the written language (judged from the text) for the answers whose decided language
 * differs from it: those of `rowIds`, or all of them. Returns how many changed.
 */
export function acceptWrittenLanguages(store: Store, studyId: number, rowIds?: readonly string[]): number {
  const ids = rowIds === undefined ? undefined : documentIds(store, studyId, rowIds, '--accept-written');
  const changed = adoptWrittenLanguages(store, studyId, ids);
  if (changed > 0) rebuildVocabulary(store, studyId);
  return changed;
}

/** Set the language of the answers of `rowIds` by hand ('-' or 'undetermined': none). */
export function setAnswerLanguages(store: Store, studyId: number, rowIds: readonly string[], language: string, studyLanguages: readonly string[]): number {
  const none = language === '-' || language === 'undetermined';
  const tag = none ? null : normalizeLanguageTag(language);
  const known = new Set([...studyLanguages, ...languageSummary(store, studyId).map((r) => r.language).filter((l): l is string => l !== null)]);
  if (!none && (tag === null || tag === undefined || !known.has(tag))) {
    throw new InputError(`--set: "${language}" is not a language of this study (${[...known].sort().join(', ')}). Give one of them, or "undetermined".`);
  }
  if (rowIds.length === 0) throw new InputError('--set needs --rows with the row ids of the answers to change (comma-separated).');
  const changed = overrideLanguages(store, studyId, documentIds(store, studyId, rowIds, '--rows'), tag ?? null);
  if (changed > 0) rebuildVocabulary(store, studyId);
  return changed;
}
