// From decided documents to per-language vocabularies and token-id arrays (docs/design.md §3, §5):
// non-answers and undetermined documents set aside with their reason, tokens cut, stop words
// removed, words stemmed, optional collocations joined, rare and ubiquitous stems pruned, short
// documents excluded. Word ids are ordered by frequency (id 0 is a language's most frequent stem).
import { languageInfo, languageKey } from '../language/languages.js';
import { countScripts } from '../language/scripts.js';
import { isNonAnswer } from '../tokens/non-answer.js';
import { stemmerFor } from '../tokens/stemmer.js';
import { stopWordSet } from '../tokens/stop-words.js';
import { scanTokens } from '../tokens/tokenize.js';
import type { LanguageVocabulary, PipelineSettings, PreparedText } from '../types.js';
import { findCollocations, GAP, joinCollocations } from './collocations.js';

export type ExclusionReason = 'empty' | 'non-answer' | 'undetermined' | 'too short';

/** The share-of-documents pruning needs this many documents in a language to mean anything (common practice). */
const MIN_DOCUMENTS_FOR_SHARE = 20;
const PROGRESS_EVERY = 1000;
// Japanese: one or two hiragana alone are particles and inflection endings cut off by the word
// segmenter ("は", "かっ", "た"), not content words (common practice).
const KANA_PARTICLE = /^[\u3040-\u309f]{1,2}$/u;

interface LanguageState {
  readonly language: string;
  readonly stemIds: Map<string, number>;
  readonly stems: string[];
  /** Normal (lower-cased, unstemmed) form → [stem id, count]. */
  readonly normals: Map<string, [number, number]>;
  readonly stop: Set<string>;
  /** Stop words of the study's other languages written in another script (see foreignStopWords). */
  readonly foreignStop: Set<string>;
  readonly stem: (word: string) => string;
  readonly docs: number[];
}

/**
 * Prepare the text of a whole study. `docs[i].language` is a BCP 47 subtag or null (undetermined).
 * A `reference` document (a glossary term list, docs/design.md §3) is cut, stopped and stemmed like an
 * answer and gets the same word ids, but it neither counts towards the vocabulary (pruning,
 * surface forms, collocations) nor is judged a non-answer: the answers alone decide the
 * vocabulary, and a reference word no answer uses is dropped.
 */
export function prepareText(
  docs: readonly { language: string | null; text: string; reference?: boolean }[],
  settings: PipelineSettings,
  onProgress?: (done: number, total: number) => void,
): PreparedText {
  const reference = Uint8Array.from(docs, (d) => (d.reference ? 1 : 0));
  const states = new Map<string, LanguageState>();
  const sequences: (Int32Array | null)[] = new Array(docs.length).fill(null);
  const excluded: (ExclusionReason | null)[] = new Array(docs.length).fill(null);
  const owner: (LanguageState | null)[] = new Array(docs.length).fill(null);
  const keys = new Map<string, string>();
  const scratch: number[] = [];

  const keyOf = (raw: string | null): string | null => {
    if (raw === null || raw.trim() === '') return null;
    let language = keys.get(raw);
    if (language === undefined) {
      language = languageKey(raw);
      keys.set(raw, language);
    }
    return language;
  };
  // The study's languages are those its documents were decided to be in: a very short answer
  // is also checked against their non-answer phrases (it may have been put in the wrong one).
  const studyLanguages = new Set<string>();
  for (const doc of docs) {
    const language = keyOf(doc.language);
    if (language !== null) studyLanguages.add(language);
  }
  const study = [...studyLanguages].sort();

  for (let i = 0; i < docs.length; i++) {
    const { text } = docs[i];
    const language = keyOf(docs[i].language);
    const counted = reference[i] === 0;
    // An empty answer stays a document so it is listed as left out, never silently dropped.
    if (text.trim() === '') excluded[i] = 'empty';
    else if (counted && isNonAnswer(text, language, study)) excluded[i] = 'non-answer';
    else if (language === null) excluded[i] = 'undetermined';
    else {
      const state = stateFor(states, language, settings, study);
      scratch.length = 0;
      scanTokens(text, language, (kind, _surface, normal) => {
        if (
          kind !== 'word' ||
          state.stop.has(normal) ||
          (state.foreignStop.has(normal) && isForeignScript(normal, language)) ||
          (language === 'ja' && KANA_PARTICLE.test(normal))
        ) {
          if (scratch.length > 0 && scratch[scratch.length - 1] !== GAP) scratch.push(GAP);
          return;
        }
        scratch.push(idOf(state, normal, counted));
      });
      sequences[i] = Int32Array.from(scratch);
      owner[i] = state;
      state.docs.push(i);
    }
    if (onProgress !== undefined && (i + 1) % PROGRESS_EVERY === 0) onProgress(i + 1, docs.length);
  }

  const ordered = [...states.values()].sort((a, b) => (a.language < b.language ? -1 : a.language > b.language ? 1 : 0));
  const vocabularies: LanguageVocabulary[] = [];
  const tokens: Int32Array[] = new Array(docs.length).fill(new Int32Array(0));
  const vocabularyOf = new Map<LanguageState, number>();
  for (const state of ordered) {
    vocabularyOf.set(state, vocabularies.length);
    vocabularies.push(buildVocabulary(state, sequences, tokens, settings, reference));
  }

  if (onProgress !== undefined) onProgress(docs.length, docs.length);
  return {
    vocabularies,
    documents: docs.map((_, i) => {
      const state = owner[i];
      let reason: string | null = excluded[i];
      if (reason === null && tokens[i].length < settings.minTokens) reason = 'too short';
      return { vocabulary: state === null ? -1 : (vocabularyOf.get(state) as number), tokens: tokens[i], excluded: reason };
    }),
  };
}

function stateFor(states: Map<string, LanguageState>, language: string, settings: PipelineSettings, study: readonly string[]): LanguageState {
  let state = states.get(language);
  if (state === undefined) {
    state = {
      language,
      stemIds: new Map(),
      stems: [],
      normals: new Map(),
      stop: stopWordSet(language, settings.extraStopWords),
      foreignStop: foreignStopWords(language, study, settings),
      stem: stemmerFor(language, settings),
      docs: [],
    };
    states.set(language, state);
  }
  return state;
}

// Mixed-language answers ("司書 and スタッフ", "the カフェ"): a word of another study language
// written in another script is that language's word, so that language's stop list applies to it.
// Words in the document language's own script(s) are never judged by a foreign list (a Chinese
// function character can be a Japanese content word). Common practice.
const SCRIPT_FAMILY: Readonly<Record<string, readonly string[]>> = { Kana: ['Kana', 'Han'], Hangul: ['Hangul', 'Han'] };

function foreignStopWords(language: string, study: readonly string[], settings: PipelineSettings): Set<string> {
  const own = languageInfo(language)?.script;
  const out = new Set<string>();
  if (own === undefined) return out;
  for (const other of study) {
    const script = languageInfo(other)?.script;
    if (other === language || script === undefined || script === own || (SCRIPT_FAMILY[own] ?? [own]).includes(script)) continue;
    for (const word of stopWordSet(other, settings.extraStopWords)) out.add(word);
  }
  return out;
}

/** True when no letter of the word belongs to the script(s) the language is written in. */
function isForeignScript(word: string, language: string): boolean {
  const own = languageInfo(language)?.script;
  if (own === undefined) return false;
  const { counts, letters } = countScripts(word);
  if (letters === 0) return false;
  return (SCRIPT_FAMILY[own] ?? [own]).every((script) => (counts[script as keyof typeof counts] ?? 0) === 0);
}

function idOf(state: LanguageState, normal: string, counted: boolean): number {
  const seen = state.normals.get(normal);
  if (seen !== undefined) {
    if (counted) seen[1]++;
    return seen[0];
  }
  const stem = state.stem(normal);
  let id = state.stemIds.get(stem);
  if (id === undefined) {
    id = state.stems.length;
    state.stems.push(stem);
    state.stemIds.set(stem, id);
  }
  state.normals.set(normal, [id, counted ? 1 : 0]);
  return id;
}

/** Surfaces, collocations, counts and pruning for one language; fills `tokens` for its documents. */
function buildVocabulary(
  state: LanguageState,
  sequences: (Int32Array | null)[],
  tokens: Int32Array[],
  settings: PipelineSettings,
  reference: Uint8Array,
): LanguageVocabulary {
  // Most frequent surface form per stem (docs/design.md §5: every stem shown by its commonest word).
  const stems = state.stems.slice();
  const surfaces: string[] = new Array(stems.length).fill('');
  const best = new Float64Array(stems.length);
  for (const [normal, [id, count]] of state.normals) {
    if (count > best[id] || (count === best[id] && normal < surfaces[id])) {
      best[id] = count;
      surfaces[id] = normal;
    }
  }

  let docSeqs = state.docs.map((i) => sequences[i] as Int32Array);
  if (settings.collocationNpmi !== null) {
    const typeCount = stems.length;
    const chosen = findCollocations(docSeqs.filter((_, d) => reference[state.docs[d]] === 0), typeCount, settings.collocationMinCount, settings.collocationNpmi);
    const joined = new Map<number, number>();
    const joinedId = (a: number, b: number): number => {
      const key = a * typeCount + b;
      let id = joined.get(key);
      if (id === undefined) {
        id = stems.length;
        stems.push(`${stems[a]}_${stems[b]}`);
        surfaces.push(`${surfaces[a]}_${surfaces[b]}`);
        joined.set(key, id);
      }
      return id;
    };
    docSeqs = docSeqs.map((seq) => joinCollocations(seq, typeCount, chosen, joinedId));
  } else docSeqs = docSeqs.map((seq) => seq.filter((id) => id !== GAP));

  const counts = new Int32Array(stems.length);
  const docCounts = new Int32Array(stems.length);
  const lastDoc = new Int32Array(stems.length).fill(-1);
  let documents = 0;
  docSeqs.forEach((seq, d) => {
    if (reference[state.docs[d]] === 1) return;
    documents++;
    for (const id of seq) {
      counts[id]++;
      if (lastDoc[id] !== d) {
        lastDoc[id] = d;
        docCounts[id]++;
      }
    }
  });

  const useShare = documents >= MIN_DOCUMENTS_FOR_SHARE;
  const kept: number[] = [];
  for (let id = 0; id < stems.length; id++) {
    if (counts[id] < settings.minCount || counts[id] === 0) continue;
    if (useShare && docCounts[id] / documents > settings.maxDocShare) continue;
    kept.push(id);
  }
  kept.sort((a, b) => counts[b] - counts[a] || (stems[a] < stems[b] ? -1 : stems[a] > stems[b] ? 1 : 0));
  const remap = new Int32Array(stems.length).fill(-1);
  kept.forEach((id, rank) => (remap[id] = rank));

  const finalCounts = new Int32Array(kept.length);
  const finalDocCounts = new Int32Array(kept.length);
  docSeqs.forEach((seq, d) => {
    const out: number[] = [];
    for (const id of seq) if (remap[id] >= 0) out.push(remap[id]);
    const arr = Int32Array.from(out);
    tokens[state.docs[d]] = arr;
    // Documents about to be excluded as too short do not count towards the vocabulary.
    if (arr.length < settings.minTokens || reference[state.docs[d]] === 1) return;
    const seen = new Set<number>();
    for (const id of arr) {
      finalCounts[id]++;
      if (!seen.has(id)) {
        seen.add(id);
        finalDocCounts[id]++;
      }
    }
  });

  return {
    language: state.language,
    stems: kept.map((id) => stems[id]),
    surfaces: kept.map((id) => surfaces[id]),
    counts: finalCounts,
    docCounts: finalDocCounts,
  };
}
