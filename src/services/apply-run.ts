// Apply: code a new file with a saved run (docs/design.md §7–8). The file is read and mapped like an
// import, each answer's language decided among the run's languages, its words stemmed with the
// study's pipeline settings and matched to the run's vocabulary by stem, and its mixture found
// by fold-in with the run's theme-word distributions fixed. Nothing is written to any study.
//
// Only the text column is required: the id, language, link key, weight and covariate columns
// of the mapping are used when the new file has them and listed as missing otherwise. Every
// answer without shares says why, and covariate levels the fit never saw are reported with what
// their prior was taken from (apply-covariates.ts).
import type { ColumnMapping, Table } from '../text/index.js';
import { InputError } from '../text/index.js';
import { listNames } from '../text/index.js';
import { covariateNotes, type CovariateNote } from './apply-covariates.js';
import { answersTable, blankReasonFor, type AnswerRow } from './answers-table.js';
import type { RunBundle } from './bundle.js';
import { csvBytes } from './csv.js';
import type { ExportedFile } from './export-run.js';
import { alphaForCovariates, foldInDocuments } from './fold-in.js';
import { decideLanguages, mapInputColumns, prepareDocuments, readInputTable } from './text-pipeline.js';
import { createEncoder } from '../text/index.js';

export interface ApplyOptions {
  bytes: Uint8Array;
  fileName: string;
  /** Column mapping of the new file; defaults to the mapping the study was imported with. */
  mapping?: ColumnMapping;
  sheet?: string;
  seed?: number;
  /** Write each answer's text in the coded file (default true). */
  answerText?: boolean;
}

/** A mapped column the new file does not have (it is then not used). */
export interface MissingColumn {
  readonly column: string;
  readonly role: 'text' | 'id' | 'language' | 'link key' | 'weight' | 'covariate';
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
  /** Mapped columns the file lacks (not used). */
  readonly missingColumns: MissingColumn[];
  /** Covariates of the run's prior that the file lacks, or whose levels the fit never saw. */
  readonly covariateNotes: CovariateNote[];
}

/**
 * The mapping restricted to the columns the file has. The text columns are required: when none
 * is present, every one is named at once with the file's columns.
 */
export function presentMapping(mapping: ColumnMapping, table: Table, encoding: RunBundle['encoding']): { mapping: ColumnMapping; missing: MissingColumn[] } {
  const has = new Set(table.columns);
  const missing: MissingColumn[] = [];
  const keep = (column: string | undefined, role: MissingColumn['role']): string | undefined => {
    if (column === undefined) return undefined;
    if (has.has(column)) return column;
    missing.push({ column, role });
    return undefined;
  };
  const text = mapping.text.filter((c) => keep(c, 'text') !== undefined);
  if (text.length === 0) {
    const names = mapping.text.map((c) => `"${c}"`).join(', ');
    throw new InputError(
      `${table.fileName}: the answers must be in ${mapping.text.length === 1 ? 'a column' : 'one of the columns'} ${names} (the run's text ${mapping.text.length === 1 ? 'column' : 'columns'}), ` +
        `but the file has none of them. Its columns are: ${listNames(table.columns)}. Rename the answer column, or say which column holds the text (--text COL).`,
      table.fileName,
      undefined,
      mapping.text[0],
    );
  }
  const covariates = mapping.covariates.filter((c) => keep(c.column, 'covariate') !== undefined);
  // The run's prior may use a covariate the mapping does not list (another import's): take it when the file has it.
  for (const spec of encoding?.specs ?? []) if (has.has(spec.column) && !covariates.some((c) => c.column === spec.column)) covariates.push({ column: spec.column, type: spec.type });
  const out: ColumnMapping = { text, covariates };
  const id = keep(mapping.id, 'id');
  const language = keep(mapping.language, 'language');
  const link = keep(mapping.link, 'link key');
  const weight = keep(mapping.weight, 'weight');
  if (id !== undefined) out.id = id;
  if (language !== undefined) out.language = language;
  if (link !== undefined) out.link = link;
  if (weight !== undefined) out.weight = weight;
  return { mapping: out, missing };
}

export async function applyRun(bundle: RunBundle, options: ApplyOptions): Promise<{ file: ExportedFile; summary: ApplySummary }> {
  const asked = options.mapping ?? bundle.mapping;
  if (!asked) throw new InputError('Say which columns hold the text (--text COL); the run has no saved column mapping.', options.fileName);
  const table = await readInputTable(options.bytes, options.fileName, options.sheet);
  const { mapping, missing } = presentMapping(asked, table, bundle.encoding);
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
  // Why each answer that gets no shares has none (answers-table.ts words).
  const reasons: (string | null)[] = new Array(docs.length).fill(null);
  prepared.documents.forEach((p, i) => {
    const decided = decisions[i].language;
    // A non-answer ("n/a", "nothing") is one whatever language it is judged to be in.
    if (p.excluded === 'non-answer' || p.excluded === 'empty') {
      excluded[p.excluded] = (excluded[p.excluded] ?? 0) + 1;
      reasons[i] = p.excluded;
      return;
    }
    if (decided === null || !bundle.languages.includes(decided)) {
      otherLanguage++;
      reasons[i] = decided === null ? 'language undetermined' : 'language not in this run';
      return;
    }
    const vocab = p.vocabulary >= 0 ? prepared.vocabularies[p.vocabulary] : undefined;
    const l = vocab ? bundle.languages.indexOf(vocab.language) : -1;
    if (p.excluded || l < 0) {
      const reason = p.excluded ?? 'no words';
      excluded[reason] = (excluded[reason] ?? 0) + 1;
      reasons[i] = p.excluded ? blankReasonFor(p.excluded) : 'no words after filtering';
      return;
    }
    perLanguage[vocab!.language] = (perLanguage[vocab!.language] ?? 0) + 1;
    const encoded = encoders[l](docs[i].text);
    totalWords += encoded.tokens.length + encoded.unknown;
    unknown += encoded.unknown;
    if (encoded.tokens.length === 0) {
      noKnown++;
      reasons[i] = 'no word the run knows';
    } else jobs.push({ doc: i, language: l, tokens: encoded.tokens });
  });
  const priors = covariateNotes(bundle.encoding, docs.map((d) => d.covariates), new Set(mapping.covariates.map((c) => c.column)));
  const res = foldInDocuments(bundle.phi, K, jobs.map((j) => ({ language: j.language, tokens: j.tokens, alpha: alphaForCovariates(bundle.lambda, bundle.encoding, K, docs[j.doc].covariates) })), { sweeps: 50, burnIn: 20, seed: options.seed ?? 1 });
  const mixtures: (ArrayLike<number> | null)[] = new Array(docs.length).fill(null);
  jobs.forEach((j, i) => {
    mixtures[j.doc] = res.theta.subarray(i * K, (i + 1) * K);
  });
  const rows: AnswerRow[] = docs.map((d, i) => ({
    rowId: d.rowId,
    question: d.question,
    text: d.text,
    covariates: d.covariates,
    language: decisions[i].language,
    linkKey: d.linkKey ?? null,
    weight: d.weight,
    mixture: mixtures[i],
    reason: mixtures[i] ? null : reasons[i],
    note: priors.perRow[i],
  }));
  const table2 = answersTable(rows, mapping.covariates.map((c) => c.column), bundle.labels, {
    idColumn: mapping.id,
    questions: mapping.text.length > 1,
    text: options.answerText ?? true,
    notes: priors.notes.length > 0,
  });
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
      missingColumns: missing,
      covariateNotes: priors.notes,
    },
  };
}
