// Shared contracts of the text pipeline (docs/design.md §3, §5). Plain data only: the pipeline takes
// bytes and strings and returns tables, decisions and typed arrays; it never touches disk.

/** An error a user can cause and fix: names the file, row and column where it can. */
export class InputError extends Error {
  constructor(
    message: string,
    readonly file?: string,
    readonly row?: number,
    readonly column?: string,
  ) {
    super(message);
    this.name = 'InputError';
  }
}

export type TableFormat = 'csv' | 'tsv' | 'jsonl' | 'xlsx' | 'sav';

/** A parsed file: header names and string cells, plus what was assumed while reading it. */
export interface Table {
  readonly fileName: string;
  readonly format: TableFormat;
  readonly columns: string[];
  /** Each row has exactly columns.length cells; missing values are ''. */
  readonly rows: string[][];
  /** What was assumed: encoding name (e.g. 'UTF-8', 'windows-1252'), delimiter, sheet. */
  readonly assumed: { encoding: string; encodingConfidence?: number; delimiter?: string; sheet?: string; sheets?: string[]; encodingNotes?: EncodingNote[] };
  /** SPSS value labels already applied: the columns that came from labelled values. */
  readonly labelledColumns?: string[];
}

/** A warning about the file's encoding (src/text/import/encoding-notes.ts), shown before and after import. */
export interface EncodingNote {
  readonly kind: 'mixed-lines' | 'damaged-utf8' | 'mojibake-fixed' | 'mojibake';
  /** One or two sentences naming the rows and what to do. */
  readonly message: string;
  /** Rows concerned: data rows from 1, 0 for the header row. */
  readonly rows: number[];
}

export type CovariateType = 'categorical' | 'numeric';

export interface ColumnMapping {
  id?: string;
  text: string[];
  language?: string;
  link?: string;
  covariates: { column: string; type: CovariateType }[];
  weight?: string;
}

/** One text cell of the input, ready for the language and token steps. */
export interface MappedDocument {
  /** The row's id (the id column, or the 1-based row number). */
  readonly rowId: string;
  /** The text column this cell came from (the `question` covariate). */
  readonly question: string;
  readonly text: string;
  /** Declared language as a BCP 47 subtag, if a language column was mapped and the cell is valid. */
  readonly declaredLanguage?: string;
  readonly linkKey?: string;
  readonly covariates: Record<string, string | number | null>;
  readonly weight: number;
}

export type LanguageSource = 'declared' | 'detected' | 'adapted' | 'overridden' | 'undetermined';

/**
 * How a decision relates to the declared (questionnaire) language, when there is one:
 * 'confirmed' — the text is written in the declared language; 'kept' — too little evidence
 * against the declaration, which stands as the prior; 'overruled' — the text is confidently
 * written in another language, which wins.
 */
export type DeclaredCheck = 'confirmed' | 'kept' | 'overruled';

export interface LanguageDecision {
  /** BCP 47 subtag, or null when undetermined. */
  readonly language: string | null;
  readonly source: LanguageSource;
  /** 0..1 */
  readonly confidence: number;
  /** With a declared language taken as a prior: what the text said about it. */
  readonly declaredCheck?: DeclaredCheck;
  /** The language the text is written in by the text alone (null: too little evidence). */
  readonly written?: string | null;
  /** An answer written in two languages: the minority language and its share of the words. */
  readonly mixed?: { readonly language: string; readonly share: number };
}

export interface PipelineSettings {
  /** Stem with Snowball (Porter for English) or keep lower-cased words. */
  stemming: boolean;
  /** Fold diacritics after stemming. */
  foldDiacritics: boolean;
  /** Drop stems seen fewer times than this (per language). */
  minCount: number;
  /** Drop stems in more than this share of a language's documents. */
  maxDocShare: number;
  /** Join frequent adjacent pairs whose NPMI exceeds this; null = off. */
  collocationNpmi: number | null;
  collocationMinCount: number;
  /** The study's own extra stop words, per language ('*' = all languages). */
  extraStopWords: Record<string, string[]>;
  /** Documents with fewer tokens than this after filtering are excluded as 'too short'. */
  minTokens: number;
}

export interface LanguageVocabulary {
  readonly language: string;
  /** Stem per word id. */
  readonly stems: string[];
  /** Most frequent surface form per word id. */
  readonly surfaces: string[];
  /** Token count per word id. */
  readonly counts: Int32Array;
  /** Number of documents per word id. */
  readonly docCounts: Int32Array;
}

/** Result of the token step over a whole study. */
export interface PreparedText {
  readonly vocabularies: LanguageVocabulary[];
  /** Per input document: vocabulary index (into vocabularies) or -1, word ids, exclusion reason. */
  readonly documents: { vocabulary: number; tokens: Int32Array; excluded: string | null }[];
}
