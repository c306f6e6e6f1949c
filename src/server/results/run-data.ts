// A finished run's results held in memory for the results pages: the fitted model (services'
// loadRunModel), overall shares, language balance, top words, and — read when first needed —
// each fitted answer's text and metadata. Results of a finished run do not change (labels are
// patched in place), so a small cache keeps page latency low on large studies; contrasts are
// cached per covariate.
import { runContrastCovariates, loadRunModel, overallShares, runContrasts, themeWords, type RunModel, type ThemeWord } from '../../services/index.js';
import type { ContrastResult } from '../../stats/index.js';
import { contrastKey } from '../../jobs/index.js';
import { documentIdsOf, documentWeights, getDocument, getRun, questionCountOf, getThemeLabels, iterateDocuments, loadJsonResult, type DocumentRecord, type Store } from '../../store/index.js';

export interface FittedAnswer {
  readonly id: number;
  readonly rowId: string;
  readonly question: string;
  readonly text: string;
  readonly language: string;
  readonly covariates: Record<string, string | number | null>;
  readonly weight: number;
}

export interface RunData {
  readonly model: RunModel;
  /** Per corpus document d (the order of model.documentIds). */
  readonly answers: FittedAnswer[];
  /** Per corpus document: 1 for an answer, 0 for a glossary's term list (or a document since deleted). */
  readonly isAnswer: Uint8Array;
  readonly docLanguage: Int32Array;
  readonly weights: Float64Array;
  /** Weighted overall share per theme. */
  readonly shares: Float64Array;
  /** K×L: share of each theme's weight coming from answers in each language (rows sum to 1). */
  readonly balance: Float64Array;
  /** Dominant theme per corpus document. */
  readonly dominant: Int32Array;
  readonly covariateNames: string[];
  /** One fitted answer (corpus document d) with its text, without reading every answer. */
  answer(d: number): FittedAnswer;
  /** How many questions (text columns) the fitted answers answer. */
  questions(): number;
  topWords(k: number, language: string, n: number): ThemeWord[];
  /** Group contrasts: stored by the fit worker, else computed now (and kept). */
  contrast(by: string): ContrastResult;
  /** Categorical covariates and their values among the fitted answers (up to 50 each). */
  levels(): { name: string; values: string[] }[];
  /** Rendered pages, keyed by the caller; emptied when labels change. */
  readonly pages: Map<string, string>;
}

/** A fitted answer as the pages show it, in the language of the vocabulary it was fitted with. */
function fittedAnswer(doc: DocumentRecord): FittedAnswer {
  return { id: doc.id, rowId: doc.rowId, question: doc.question, text: doc.text, language: doc.vocabularyLanguage ?? doc.language ?? '', covariates: doc.covariates, weight: doc.weight };
}

/** An answer deleted since the fit: no text, no metadata. */
function missingAnswer(id: number): FittedAnswer {
  return { id, rowId: '', question: '', text: '', language: '', covariates: {}, weight: 1 };
}

/** Draws for contrasts computed while a page waits (runs fitted outside the workbench). */
const ON_DEMAND_DRAWS = 200;
const MAX_PAGES = 500; // common practice: bounded memory for cached pages per run
/** Answers read one at a time (a theme's examples) kept per run before the cache is emptied. */
const MAX_SINGLE_ANSWERS = 5000;

const MAX_CACHED = 4; // common practice: a few runs open at once on a lab server

export class RunDataCache {
  private readonly entries = new Map<number, RunData>();

  constructor(private readonly store: Store) {}

  get(runId: number): RunData | undefined {
    // A deleted run's pages (answer text among them) leave memory at the next visit to any run.
    for (const id of [...this.entries.keys()]) if (!getRun(this.store, id)) this.entries.delete(id);
    const hit = this.entries.get(runId);
    if (hit) {
      this.entries.delete(runId);
      this.entries.set(runId, hit);
      return hit;
    }
    const data = this.load(runId);
    if (!data) return undefined;
    this.entries.set(runId, data);
    while (this.entries.size > MAX_CACHED) this.entries.delete(this.entries.keys().next().value!);
    return data;
  }

  /** Whether this run's results are held in memory (for tests of forgetting). */
  holds(runId: number): boolean {
    return this.entries.has(runId);
  }

  /** Re-read labels after a rename. */
  refreshLabels(runId: number): void {
    const data = this.entries.get(runId);
    if (!data) return;
    const labels = getThemeLabels(this.store, runId);
    const arr = data.model.labels as string[];
    for (let k = 0; k < arr.length; k++) arr[k] = labels.get(k) ?? `Theme ${k + 1}`;
    data.pages.clear();
  }

  /** Remember a rendered page of this run. */
  remember(runId: number, key: string, html: string): void {
    const data = this.entries.get(runId);
    if (!data) return;
    if (data.pages.size >= MAX_PAGES) data.pages.clear();
    data.pages.set(key, html);
  }

  forget(runId: number): void {
    this.entries.delete(runId);
  }

  private load(runId: number): RunData | undefined {
    const store = this.store;
    const model = loadRunModel(store, runId);
    if (!model) return undefined;
    const { K } = model;
    const D = model.documentIds.length;
    const index = new Map<number, number>();
    model.documentIds.forEach((id, d) => index.set(id, d));
    const docLanguage = new Int32Array(D).fill(-1);
    const weights = new Float64Array(D).fill(0);
    const isAnswer = new Uint8Array(D);
    const langIndex = new Map(model.languages.map((l, i) => [l, i]));
    // Weights and languages only — stored with the run, or for an older run read from its
    // answers: the texts and metadata are read when a page first needs them (a theme's answers,
    // the Answers page), so the Themes page of a large run opens quickly.
    if (model.fitted) {
      // Answers deleted since the fit (and glossary term lists) count as no answer, as below.
      const kept = new Set(documentIdsOf(store, model.run.studyId));
      for (let d = 0; d < D; d++) {
        if (!model.fitted.isAnswer[d] || !kept.has(model.documentIds[d])) continue;
        docLanguage[d] = model.fitted.language[d];
        const w = model.fitted.weight[d];
        weights[d] = Number.isFinite(w) && w >= 0 ? w : 0;
        isAnswer[d] = 1;
      }
    } else {
      const fitted = documentWeights(store, model.run.studyId);
      for (let i = 0; i < fitted.ids.length; i++) {
        const d = index.get(fitted.ids[i]);
        if (d === undefined) continue;
        docLanguage[d] = langIndex.get(fitted.languages[i]) ?? -1;
        const w = fitted.weights[i];
        weights[d] = Number.isFinite(w) && w >= 0 ? w : 0;
        isAnswer[d] = 1;
      }
    }
    let answers: FittedAnswer[] | undefined;
    const readAnswers = (): FittedAnswer[] => {
      const out = new Array<FittedAnswer>(D);
      for (const doc of iterateDocuments(store, model.run.studyId)) {
        const d = index.get(doc.id);
        if (d === undefined) continue;
        out[d] = fittedAnswer(doc);
      }
      for (let d = 0; d < D; d++) out[d] ??= missingAnswer(model.documentIds[d]);
      return out;
    };
    const weightMap = new Map<number, number>();
    model.documentIds.forEach((id, d) => weightMap.set(id, weights[d]));
    const shares = overallShares(model, weightMap);
    const L = model.languages.length;
    const balance = new Float64Array(K * L);
    const dominant = new Int32Array(D);
    const theta = model.thetaGroups;
    for (let d = 0; d < D; d++) {
      const base = model.docGroup[d] * K;
      const l = docLanguage[d];
      let best = 0;
      for (let k = 0; k < K; k++) {
        if (l >= 0) balance[k * L + l] += weights[d] * theta[base + k];
        if (theta[base + k] > theta[base + best]) best = k;
      }
      dominant[d] = best;
    }
    for (let k = 0; k < K; k++) {
      let s = 0;
      for (let l = 0; l < L; l++) s += balance[k * L + l];
      if (s > 0) for (let l = 0; l < L; l++) balance[k * L + l] /= s;
    }
    const words = new Map<string, ThemeWord[]>();
    const contrasts = new Map<string, ContrastResult>();
    let covariateNames: string[] | undefined;
    let questionCount: number | undefined;
    const single = new Map<number, FittedAnswer>();
    let levels: { name: string; values: string[] }[] | undefined;
    const data: RunData = {
      model,
      get answers() {
        return (answers ??= readAnswers());
      },
      isAnswer,
      docLanguage,
      weights,
      shares,
      balance,
      dominant,
      get covariateNames() {
        return (covariateNames ??= runContrastCovariates(store, model.run));
      },
      answer(d) {
        if (answers) return answers[d];
        let a = single.get(d);
        if (!a) {
          const doc = getDocument(store, model.documentIds[d]);
          a = doc ? fittedAnswer(doc) : missingAnswer(model.documentIds[d]);
          if (single.size >= MAX_SINGLE_ANSWERS) single.clear();
          single.set(d, a);
        }
        return a;
      },
      questions() {
        return (questionCount ??= questionCountOf(store, model.run.studyId));
      },
      pages: new Map(),
      topWords(k, language, n) {
        const key = `${k}|${language}`;
        let list = words.get(key);
        if (!list || list.length < n) words.set(key, (list = themeWords(model, k, language, Math.max(n, 30))));
        return list.slice(0, n);
      },
      contrast(by) {
        let res = contrasts.get(by);
        if (!res) {
          res = loadJsonResult<ContrastResult>(store, runId, contrastKey(by)) ?? runContrasts(store, model, { by, draws: ON_DEMAND_DRAWS });
          contrasts.set(by, res);
        }
        return res;
      },
      levels() {
        if (levels) return levels;
        const found = new Map<string, Set<string>>();
        const numeric = new Set<string>();
        for (const a of data.answers) {
          for (const [name, v] of Object.entries(a.covariates)) {
            if (v === null || v === '') continue;
            if (typeof v === 'number') numeric.add(name);
            let set = found.get(name);
            if (!set) found.set(name, (set = new Set()));
            if (set.size < 50) set.add(String(v));
          }
        }
        levels = [...found.entries()]
          .filter(([name]) => !numeric.has(name))
          .map(([name, set]) => ({ name, values: [...set].sort((x, y) => x.localeCompare(y, undefined, { numeric: true })) }));
        return levels;
      },
    };
    return data;
  }
}
