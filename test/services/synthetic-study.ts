// A study written straight into the store (no text pipeline): two languages with their own
// invented vocabularies, three planted themes, some linked pairs, a region covariate whose
// "North" level writes mostly about theme 0. For fit, checks and resume tests.
import { Xoshiro128 } from '../../src/model/rng.js';
import * as S from '../../src/store/index.js';

export function syntheticStudy(store: S.Store, options: { documents?: number; seed?: number } = {}): number {
  const D = options.documents ?? 240;
  const rng = Xoshiro128.fromSeed(options.seed ?? 3);
  const V = 30; // per language: theme k owns words 10k..10k+9
  const study = S.createStudy(store, { name: 'Synthetic', languages: ['en', 'fr'] });
  const imp = S.insertImport(store, { studyId: study.id, fileName: 'synthetic.csv', format: 'csv', bytes: new Uint8Array([1, 2, 3]), encoding: 'UTF-8', mapping: { text: ['answer'], covariates: [{ column: 'region', type: 'categorical' }] } });
  const docs: S.NewDocument[] = [];
  const tokens: Int32Array[] = [];
  for (let d = 0; d < D; d++) {
    const region = d % 2 === 0 ? 'North' : 'South';
    const main = region === 'North' && rng.nextDouble() < 0.7 ? 0 : rng.nextInt(3);
    const language = d % 3 === 0 ? 'fr' : 'en';
    const linked = d % 10 === 1;
    const make = () => Int32Array.from({ length: 12 }, () => (rng.nextDouble() < 0.85 ? main : rng.nextInt(3)) * 10 + rng.nextInt(10));
    docs.push({ rowId: `d${d}`, question: 'answer', text: `doc ${d}`, language, languageSource: 'declared', confidence: 1, linkKey: linked ? `L${d}` : null, covariates: { region }, weight: 1 + (d % 3) });
    tokens.push(make());
    if (linked) {
      docs.push({ rowId: `d${d}-fr`, question: 'answer', text: `doc ${d} fr`, language: language === 'fr' ? 'en' : 'fr', languageSource: 'declared', confidence: 1, linkKey: `L${d}`, covariates: { region }, weight: 1 });
      tokens.push(make());
    }
  }
  const ids = S.insertDocuments(store, study.id, imp, docs);
  S.setDocumentTokens(store, ids.map((id, i) => ({ id, vocabularyLanguage: docs[i].language, tokens: tokens[i], excluded: null })));
  const vocab = (language: string, prefix: string) => {
    const counts = new Int32Array(V);
    const docCounts = new Int32Array(V);
    docs.forEach((doc, i) => {
      if (doc.language !== language) return;
      const seen = new Set<number>();
      for (const w of tokens[i]) {
        counts[w]++;
        seen.add(w);
      }
      for (const w of seen) docCounts[w]++;
    });
    const stems = Array.from({ length: V }, (_, w) => `${prefix}${Math.floor(w / 10)}w${w % 10}`);
    return { language, stems, surfaces: stems.map((s) => `${s}s`), counts, docCounts };
  };
  S.replaceVocabularies(store, study.id, [vocab('en', 'e'), vocab('fr', 'f')]);
  return study.id;
}
