// What Apply does with covariates the fit never saw, said in the result instead of done silently
// (issue 14). The run's prior for an answer is α = exp(λ·x) with x from the fitted feature
// encoding (src/model/features.ts): a categorical level never seen in the fit (a new wave, a new
// region) has all its indicators 0, so it gets the prior of the reference level (the first level
// in code-point order); a numeric covariate that is missing gets the fitted mean. Both are
// reported per covariate (for the page and the command line) and per answer (for the file).
import type { FeatureEncoding } from '../model/index.js';
import { MISSING_LEVEL } from '../model/index.js';

export interface CovariateNote {
  readonly covariate: string;
  /** 'absent': the file has no such column; 'new levels': values the fit never saw. */
  readonly kind: 'absent' | 'new levels';
  /** The new levels (the first 20), as written in the file. */
  readonly levels: string[];
  /** Distinct new levels in all. */
  readonly levelCount: number;
  /** Answers affected. */
  readonly answers: number;
  /** What their prior was taken from, in words. */
  readonly codedAs: string;
}

const LISTED_LEVELS = 20;

function levelOf(v: string | number | null | undefined): string {
  if (v === null || v === undefined) return MISSING_LEVEL;
  const s = String(v).trim();
  return s === '' ? MISSING_LEVEL : s;
}

function roundMean(x: number): string {
  return String(Math.round(x * 100) / 100);
}

/**
 * Notes on the covariates of new answers under a fitted encoding. `present` says which
 * covariate columns the new file has.
 */
export function covariateNotes(
  encoding: FeatureEncoding | null,
  rows: readonly Record<string, string | number | null>[],
  present: ReadonlySet<string>,
): { notes: CovariateNote[]; perRow: (string | null)[] } {
  const perRow: (string[] | null)[] = rows.map(() => null);
  const notes: CovariateNote[] = [];
  if (!encoding) return { notes, perRow: perRow.map(() => null) };
  encoding.specs.forEach((spec, j) => {
    const levels = encoding.levels[j];
    if (!present.has(spec.column)) {
      // Every value is missing: the fit's "(missing)" level where it had one, else as above.
      const codedAs = !levels
        ? `the fit's mean (${roundMean(encoding.means[j])})`
        : levels.includes(MISSING_LEVEL)
          ? `the prior of the level "${MISSING_LEVEL}"`
          : `the prior of the reference level "${levels[0]}"`;
      notes.push({ covariate: spec.column, kind: 'absent', levels: [], levelCount: 0, answers: rows.length, codedAs });
      rows.forEach((_, i) => (perRow[i] ??= []).push(`${spec.column} not in the file: ${codedAs}`));
      return;
    }
    if (!levels) return;
    const known = new Set(levels);
    const fresh = new Map<string, number>();
    let answers = 0;
    rows.forEach((r, i) => {
      const lv = levelOf(r[spec.column]);
      if (known.has(lv)) return;
      answers++;
      fresh.set(lv, (fresh.get(lv) ?? 0) + 1);
      (perRow[i] ??= []).push(`${spec.column} "${lv}" not seen in the fit: prior of the reference level "${levels[0]}"`);
    });
    if (answers > 0) {
      notes.push({
        covariate: spec.column,
        kind: 'new levels',
        levels: [...fresh.keys()].slice(0, LISTED_LEVELS),
        levelCount: fresh.size,
        answers,
        codedAs: `the prior of the reference level "${levels[0]}"`,
      });
    }
  });
  return { notes, perRow: perRow.map((p) => (p ? p.join('; ') : null)) };
}

/** One line per note, for the page and the command line. */
export function describeCovariateNote(n: CovariateNote): string {
  if (n.kind === 'absent') return `${n.covariate}: not in the file; ${n.answers} answers coded with ${n.codedAs}.`;
  const more = n.levelCount > n.levels.length ? ` … and ${n.levelCount - n.levels.length} more` : '';
  const list = n.levels.map((l) => `"${l.length > 60 ? `${l.slice(0, 59)}…` : l}"`).join(', ') + more;
  return `${n.covariate}: ${n.levelCount === 1 ? 'level' : 'levels'} ${list} never seen in the fit; ${n.answers} answers coded with ${n.codedAs}.`;
}
