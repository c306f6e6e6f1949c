// Cross-language agreement of a fitted run on a corpus of concepts written in several languages
// (emoji-study.ts): for every concept without a link, and every pair of languages in which it
// was fitted, is the dominant theme of its two texts the same? Chance is Σ_k p_a(k)·p_b(k) with
// p_ℓ the share of texts of language ℓ whose dominant theme is k. Purity against the known
// categories: the share of texts whose dominant theme's majority category is their own
// (Manning, Raghavan & Schütze, "Introduction to Information Retrieval", 2008, §16.3).
import { importFile } from '../../src/services/import-file.js';
import { iterateDocuments, type Store } from '../../src/store/index.js';
import type { ConceptText } from './emoji-study.js';
import { Xoshiro128 } from '../../src/model/rng.js';

export interface AlignmentStudy {
  readonly csv: string;
  /** Concepts whose texts share a link key. */
  readonly linked: Set<string>;
}

function csvCell(s: string): string {
  return /[",\n\r]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}

/** The concepts as a CSV of answers; a seeded share of concepts gets a link key. */
export function alignmentStudy(concepts: readonly ConceptText[], linkShare: number, seed: number): AlignmentStudy {
  const rng = Xoshiro128.fromSeed(seed, 104729);
  const ids = [...new Set(concepts.map((c) => c.concept))];
  const linked = new Set(ids.filter(() => rng.nextDouble() < linkShare));
  const lines = ['answer_id,language,link,answer'];
  for (const c of concepts) lines.push([`${c.concept}-${c.language}`, c.language, linked.has(c.concept) ? c.concept : '', csvCell(c.text)].join(','));
  return { csv: lines.join('\n') + '\n', linked };
}

export async function importAlignmentStudy(store: Store, study: AlignmentStudy, name: string): Promise<number> {
  const summary = await importFile(store, {
    study: name,
    bytes: new TextEncoder().encode(study.csv),
    fileName: 'concepts.csv',
    mapping: { id: 'answer_id', text: ['answer'], language: 'language', link: 'link', covariates: [] },
  });
  return summary.studyId;
}

export interface AlignmentFigures {
  /** Dominant theme agrees across a language pair, concepts without a link. */
  readonly agreement: number;
  readonly chance: number;
  readonly pairs: number;
  readonly purity: number;
  /** Wall time of the fit job (corpus, start, sweeps, storing) and the sampler's own time, seconds. */
  readonly wallSeconds: number;
  readonly samplerSeconds: number;
}

/** What the measurement needs of a finished run (a subset of the services' RunModel). */
export interface FittedRun {
  readonly K: number;
  readonly languages: string[];
  readonly documentIds: Int32Array;
  readonly docGroup: Int32Array;
  readonly thetaGroups: Float64Array;
  readonly samplerSeconds: number;
}

export async function fitAndMeasure(
  store: Store,
  studyId: number,
  concepts: readonly ConceptText[],
  linked: Set<string>,
  fit: () => Promise<FittedRun>,
): Promise<AlignmentFigures> {
  const began = performance.now();
  const model = await fit();
  const wallSeconds = (performance.now() - began) / 1000;
  const K = model.K;
  const rowOf = new Map<number, string>();
  for (const d of iterateDocuments(store, studyId)) rowOf.set(d.id, d.rowId);
  const category = new Map(concepts.map((c) => [`${c.concept}-${c.language}`, c.category]));
  // Dominant theme per (concept, language).
  const dominant = new Map<string, Map<string, number>>();
  const counts = new Map<string, Float64Array>();
  const byTheme: Map<number, number>[] = Array.from({ length: K }, () => new Map());
  let texts = 0;
  for (let d = 0; d < model.documentIds.length; d++) {
    const row = rowOf.get(model.documentIds[d]);
    if (!row) continue;
    const cut = row.lastIndexOf('-');
    const concept = row.slice(0, cut);
    const language = row.slice(cut + 1);
    const g = model.docGroup[d];
    let best = 0;
    for (let k = 1; k < K; k++) if (model.thetaGroups[g * K + k] > model.thetaGroups[g * K + best]) best = k;
    if (!dominant.has(concept)) dominant.set(concept, new Map());
    dominant.get(concept)!.set(language, best);
    if (!counts.has(language)) counts.set(language, new Float64Array(K));
    counts.get(language)![best]++;
    const cat = category.get(row)!;
    byTheme[best].set(cat, (byTheme[best].get(cat) ?? 0) + 1);
    texts++;
  }
  let agree = 0;
  let pairs = 0;
  let chance = 0;
  for (const [concept, langs] of dominant) {
    if (linked.has(concept)) continue;
    const entries = [...langs];
    for (let i = 0; i < entries.length; i++) {
      for (let j = i + 1; j < entries.length; j++) {
        pairs++;
        if (entries[i][1] === entries[j][1]) agree++;
        const pa = counts.get(entries[i][0])!;
        const pb = counts.get(entries[j][0])!;
        const na = pa.reduce((a, b) => a + b, 0);
        const nb = pb.reduce((a, b) => a + b, 0);
        let c = 0;
        for (let k = 0; k < K; k++) c += (pa[k] / na) * (pb[k] / nb);
        chance += c;
      }
    }
  }
  let pure = 0;
  for (const m of byTheme) pure += Math.max(0, ...m.values());
  return {
    agreement: pairs ? agree / pairs : NaN,
    chance: pairs ? chance / pairs : NaN,
    pairs,
    purity: texts ? pure / texts : NaN,
    wallSeconds,
    samplerSeconds: model.samplerSeconds,
  };
}
