// Re-running the token step over a whole study: after an import, a language override, a change
// of pruning settings or of the study's own stop words. Word ids change, so every document's
// tokens and every vocabulary are replaced together, in one transaction. The token step itself
// can run before the transaction (planVocabulary), so the write lock is held only for writing.
import {
  getStudy,
  getStudyWordLists,
  inTransaction,
  listDocumentTexts,
  replaceVocabularies,
  setDocumentTokens,
  studyChangeStamp,
  touchStudy,
  type Store,
} from '../store/index.js';
import type { PreparedText } from '../text/index.js';
import { pipelineSettings, prepareDocuments } from './text-pipeline.js';

export interface VocabularyRebuild {
  /** Vocabulary size per language. */
  readonly vocabularySizes: Record<string, number>;
  /** Excluded documents per reason, over the whole study. */
  readonly excluded: Record<string, number>;
  readonly includedDocuments: number;
}

/** The token step's result for a study's documents (plus documents about to be added). */
export interface VocabularyPlan {
  /** Ids of the study's documents the plan covers, in order (the added ones follow). */
  readonly existingIds: Int32Array;
  /** Decided language per planned document (existing, then added). */
  readonly languages: (string | null)[];
  readonly prepared: PreparedText;
  /** Study state the plan was made from: still valid when these have not changed. */
  readonly stamp: string;
}

/** What changes when a study's documents or settings change (count, newest id, last update). */
export function studyStamp(store: Store, studyId: number | null): string {
  if (studyId === null) return 'new';
  return studyChangeStamp(store, studyId);
}

/** Run the token step over the study's documents and `added` (not yet stored). Reads only. */
export function planVocabulary(
  store: Store,
  studyId: number | null,
  added: readonly { language: string | null; text: string; reference?: boolean }[] = [],
  onProgress?: (done: number, total: number) => void,
): VocabularyPlan {
  const study = studyId === null ? undefined : getStudy(store, studyId);
  if (studyId !== null && !study) throw new Error(`No study with id ${studyId}.`);
  const stamp = studyStamp(store, studyId);
  const docs = studyId === null ? { ids: new Int32Array(0), languages: [], texts: [], glossary: new Uint8Array(0) } : listDocumentTexts(store, studyId);
  const settings = pipelineSettings(study?.settings.pipeline, studyId === null ? {} : getStudyWordLists(store, studyId));
  const languages = [...docs.languages, ...added.map((d) => d.language)];
  const prepared = prepareDocuments(
    // Glossary documents take the answers' word ids but do not shape the vocabulary (docs/design.md §3).
    [...docs.texts.map((text, i) => ({ language: docs.languages[i], text, reference: docs.glossary[i] === 1 })), ...added],
    settings,
    onProgress,
  );
  return { existingIds: docs.ids, languages, prepared, stamp };
}

/** Write a plan: tokens of every planned document (`addedIds` for the added ones) and the vocabularies. */
export function applyVocabulary(store: Store, studyId: number, plan: VocabularyPlan, addedIds: readonly number[] = []): VocabularyRebuild {
  const ids = [...plan.existingIds, ...addedIds];
  if (ids.length !== plan.prepared.documents.length) throw new Error('The vocabulary plan does not match the documents.');
  return inTransaction(store, () => {
    const excluded: Record<string, number> = {};
    let included = 0;
    const updates = ids.map((id, i) => {
      const p = plan.prepared.documents[i];
      const vocab = p.vocabulary >= 0 ? plan.prepared.vocabularies[p.vocabulary] : undefined;
      const reason = p.excluded ?? (vocab ? null : plan.languages[i] === null ? 'undetermined' : 'no words');
      if (reason) excluded[reason] = (excluded[reason] ?? 0) + 1;
      else included++;
      return { id, vocabularyLanguage: vocab?.language ?? null, tokens: reason ? null : p.tokens, excluded: reason };
    });
    setDocumentTokens(store, updates);
    replaceVocabularies(store, studyId, plan.prepared.vocabularies);
    touchStudy(store, studyId);
    return {
      vocabularySizes: Object.fromEntries(plan.prepared.vocabularies.map((v) => [v.language, v.stems.length])),
      excluded,
      includedDocuments: included,
    };
  });
}

/** Re-run the token step over the whole study and store the result (one transaction). */
export function rebuildVocabulary(store: Store, studyId: number, onProgress?: (done: number, total: number) => void): VocabularyRebuild {
  return inTransaction(store, () => applyVocabulary(store, studyId, planVocabulary(store, studyId, [], onProgress)));
}
