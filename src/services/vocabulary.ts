// Re-running the token step over a whole study: after an import, a language override, a change
// of pruning settings or of the study's own stop words. Word ids change, so every document's
// tokens and every vocabulary are replaced together, in one transaction.
import {
  getStudy,
  getStudyWordLists,
  inTransaction,
  iterateDocuments,
  replaceVocabularies,
  setDocumentTokens,
  touchStudy,
  type Store,
} from '../store/index.js';
import { pipelineSettings, prepareDocuments } from './text-pipeline.js';

export interface VocabularyRebuild {
  /** Vocabulary size per language. */
  readonly vocabularySizes: Record<string, number>;
  /** Excluded documents per reason, over the whole study. */
  readonly excluded: Record<string, number>;
  readonly includedDocuments: number;
}

export function rebuildVocabulary(store: Store, studyId: number, onProgress?: (done: number, total: number) => void): VocabularyRebuild {
  const study = getStudy(store, studyId);
  if (!study) throw new Error(`No study with id ${studyId}.`);
  return inTransaction(store, () => {
    const docs = [...iterateDocuments(store, studyId)];
    const settings = pipelineSettings(study.settings.pipeline, getStudyWordLists(store, studyId));
    const prepared = prepareDocuments(
      docs.map((d) => ({ language: d.language, text: d.text })),
      settings,
      onProgress,
    );
    const excluded: Record<string, number> = {};
    let included = 0;
    const updates = docs.map((d, i) => {
      const p = prepared.documents[i];
      const vocab = p.vocabulary >= 0 ? prepared.vocabularies[p.vocabulary] : undefined;
      const reason = p.excluded ?? (vocab ? null : d.language === null ? 'undetermined' : 'no words');
      if (reason) excluded[reason] = (excluded[reason] ?? 0) + 1;
      else included++;
      return { id: d.id, vocabularyLanguage: vocab?.language ?? null, tokens: reason ? null : p.tokens, excluded: reason };
    });
    setDocumentTokens(store, updates);
    replaceVocabularies(store, studyId, prepared.vocabularies);
    touchStudy(store, studyId);
    return {
      vocabularySizes: Object.fromEntries(prepared.vocabularies.map((v) => [v.language, v.stems.length])),
      excluded,
      includedDocuments: included,
    };
  });
}
