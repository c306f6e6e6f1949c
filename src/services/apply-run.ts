// Apply: code a new file with a saved run (DESIGN §7–8). The file is read and mapped like an
// import, each answer's language decided among the run's languages, its words stemmed with the
// study's pipeline settings and matched to the run's vocabulary by stem, and its mixture found
// by fold-in with the run's theme-word distributions fixed. Nothing is written to any study.
import type { ColumnMapping } from '../text/types.js';
import { InputError } from '../text/types.js';
import { answersTable, type AnswerRow } from './answers-table.js';
import type { RunBundle } from './bundle.js';
import { csvBytes } from './csv.js';
import type { ExportedFile } from './export-run.js';
import { alphaForCovariates, foldInDocuments } from './fold-in.js';
import { decideLanguages, mapInputColumns, prepareDocuments, readInputTable } from './text-pipeline.js';
import { createEncoder } from '../text/vocabulary/index.js';

export interface ApplyOptions {
  bytes: Uint8Array;
  fileName: string;
  /** Column mapping of the new file; defaults to the mapping the study was imported with. */
  mapping?: ColumnMapping;
  sheet?: string;
  seed?: number;
}

export interface ApplySummary {
  readonly rows: number;
  readonly answers: number;
  /** Answers that received a mixture. */
  readonly coded: number;
  /** Answers in a language the run does not have, or whose language is undetermined. */
  readonly otherLanguage: number;
  /** Answers left out by the text pipeline, per reason (non-answer, too short…). */
  readonly excluded: Record<string, number>;
  /** Answers with no word the run knows. */
  readonly noKnownWords: number;
  /** Share of the new answers' words that the run's vocabulary does not contain. */
  readonly unknownWordShare: number;
  readonly perLanguage: Record<string, number>;
}

export async function applyRun(bundle: RunBundle, options: ApplyOptions): Promise<{ file: ExportedFile; summary: ApplySummary }> {
  const mapping = options.mapping ?? bundle.mapping;
  if (!mapping) throw new InputError('Say which columns hold the text (--text COL); the run has no saved column mapping.', options.fileName);
  const table = await readInputTable(options.bytes, options.fileName, options.sheet);
  const docs = mapInputColumns(table, mapping, bundle.languages);
  if (docs.length === 0) throw new InputError(`No answers to code: every cell of ${mapping.text.join(', ')} is empty.`, options.fileName);
  const decisions = decideLanguages(docs.map((d) => d.text), bundle.languages, docs.map((d) => d.declaredLanguage), true).map((o) => o.decision);
  // Keep every word the new answers have: pruning is the fitted vocabulary's business.
  const prepared = prepareDocuments(
    docs.map((d, i) => ({ language: decisions[i].language !== null && bundle.languages.includes(decisions[i].language!) ? decisions[i].language : null, text: d.text })),
    { ...bundle.pipeline, minCount: 1, maxDocShare: 1, minTokens: 1, collocationNpmi: null },
  );
  // Words are matched to the run's vocabulary by the study's own encoder: same tokens, stop words
  // and stems, and adjacent words joined where the run's vocabulary has their collocation.
  const encoders = bundle.vocabularies.map((v, l) =>
    createEncoder({ language: bundle.languages[l], stems: v.stems, surfaces: v.surfaces, counts: new Int32Array(0), docCounts: new Int32Array(0) }, bundle.pipeline),
  );
  const K = bundle.K;
  const jobs: { doc: number; language: number; tokens: Int32Array }[] = [];
  let otherLanguage = 0;
  let totalWords = 0;
  let unknown = 0;
  let noKnown = 0;
  const perLanguage: Record<string, number> = {};
  const excluded: Record<string, number> = {};
  prepared.documents.forEach((p, i) => {
    const decided = decisions[i].language;
    if (decided === null || !bundle.languages.includes(decided)) {
      otherLanguage++;
      return;
    }
    const vocab = p.vocabulary >= 0 ? prepared.vocabularies[p.vocabulary] : undefined;
    const l = vocab ? bundle.languages.indexOf(vocab.language) : -1;
    if (p.excluded || l < 0) {
      const reason = p.excluded ?? 'no words';
      excluded[reason] = (excluded[reason] ?? 0) + 1;
      return;
    }
    perLanguage[vocab!.language] = (perLanguage[vocab!.language] ?? 0) + 1;
    const encoded = encoders[l](docs[i].text);
    totalWords += encoded.tokens.length + encoded.unknown;
    unknown += encoded.unknown;
    if (encoded.tokens.length === 0) noKnown++;
    else jobs.push({ doc: i, language: l, tokens: encoded.tokens });
  });
  const res = foldInDocuments(bundle.phi, K, jobs.map((j) => ({ language: j.language, tokens: j.tokens, alpha: alphaForCovariates(bundle.lambda, bundle.encoding, K, docs[j.doc].covariates) })), { sweeps: 50, burnIn: 20, seed: options.seed ?? 1 });
  const mixtures: (ArrayLike<number> | null)[] = new Array(docs.length).fill(null);
  jobs.forEach((j, i) => {
    mixtures[j.doc] = res.theta.subarray(i * K, (i + 1) * K);
  });
  const rows: AnswerRow[] = docs.map((d, i) => ({
    rowId: d.rowId,
    question: d.question,
    covariates: d.covariates,
    language: decisions[i].language,
    linkKey: d.linkKey ?? null,
    weight: d.weight,
    mixture: mixtures[i],
  }));
  const table2 = answersTable(rows, mapping.covariates.map((c) => c.column), bundle.labels, mapping.id);
  return {
    file: { name: 'answers-by-theme.csv', mediaType: 'text/csv; charset=utf-8', bytes: csvBytes(table2.header, table2.rows) },
    summary: {
      rows: table.rows.length,
      answers: docs.length,
      coded: mixtures.filter((m) => m !== null).length,
      otherLanguage,
      excluded,
      noKnownWords: noKnown,
      unknownWordShare: totalWords ? unknown / totalWords : 0,
      perLanguage,
    },
  };
}
