// The standalone HTML report of a run (docs/design.md §8): the props of views/pages/report.tsx from the
// run's cached data, its stored checks (when the Checks page has been opened) and the theme
// names, rendered to one HTML text with the workbench's stylesheet and the report's own rules.
import { readFileSync } from 'node:fs';
import { ReportDocument, type ReportProps } from '../../../views/pages/report.js';
import { runTies, type RunChecks } from '../../services/index.js';
import { loadJsonResult, type Store, type Study } from '../../store/index.js';
import type { RunData } from './run-data.js';
import { languageOrder, themeNames } from './theme-names.js';

const APP_CSS = new URL('../../../public/app.css', import.meta.url);
const REPORT_CSS = new URL('../../../public/report.css', import.meta.url);

/** Differences in the summary: the largest clear ones over all covariates (common practice: a page's worth). */
const SUMMARY_DIFFERENCES = 8;
const WORDS = 8;

export function reportProps(store: Store, study: Study, data: RunData, createdAt = new Date().toISOString()): Omit<ReportProps, 'css'> {
  const { model } = data;
  const s = model.run.settings;
  const names = themeNames(store, study, data);
  const languages = languageOrder(study, data);
  const groups = data.covariateNames
    .filter((n) => n !== 'question' || data.questions() > 1)
    .map((covariate) => {
      const res = data.contrast(covariate);
      return {
        covariate,
        levels: [...res.levels],
        rows: res.shares.map((r) => ({ level: r.level, theme: r.theme, share: r.share, low: r.low, high: r.high, n: r.n, effectiveN: r.effectiveN })),
        differences: res.differences.map((d) => ({ levelA: d.levelA, levelB: d.levelB, theme: d.theme, difference: d.difference, low: d.low, high: d.high, discovery: d.discovery, pAdjusted: d.pAdjusted })),
        draws: res.draws,
      };
    });
  // Clear differences: the 95% interval leaves out zero (and, when false-discovery control ran,
  // the difference survives it); largest first, each pair of levels oriented so it is positive.
  const main = groups
    .flatMap((g) => g.differences.map((d) => ({ covariate: g.covariate, ...d })))
    .filter((d) => (d.low > 0 || d.high < 0) && (Number.isNaN(d.pAdjusted) || d.discovery))
    .map((d) => (d.difference >= 0 ? d : { ...d, levelA: d.levelB, levelB: d.levelA, difference: -d.difference, low: -d.high, high: -d.low }))
    .sort((a, b) => b.difference - a.difference)
    // One line per theme and covariate (its largest pair), so one strong effect does not fill the summary.
    .filter((d, i, all) => all.findIndex((e) => e.theme === d.theme && e.covariate === d.covariate) === i)
    .slice(0, SUMMARY_DIFFERENCES);
  const checks = loadJsonResult<RunChecks>(store, model.run.id, 'checks');
  const coherence = new Map<number, number[]>();
  for (const t of checks?.coherence.themes ?? []) if (Number.isFinite(t.npmi)) (coherence.get(t.theme) ?? coherence.set(t.theme, []).get(t.theme)!).push(t.npmi);
  const links = runTies(store, model.run);
  return {
    study: study.name,
    run: model.run.name,
    createdAt,
    settings: `${s.themes} themes, ${s.sweeps} sweeps, seed ${s.seed}${s.covariates.length ? `, prior depending on ${s.covariates.join(', ')}` : ''}.`,
    answers: data.isAnswer.reduce((n, x) => n + x, 0),
    languages,
    themes: names.map((n, k) => {
      const c = coherence.get(k);
      return {
        k,
        label: n.text,
        suggested: n.suggested,
        share: data.shares[k],
        words: Object.fromEntries(model.languages.map((l) => [l, data.topWords(k, l, WORDS).map((w) => w.word)])),
        coherence: c ? c.reduce((a, b) => a + b, 0) / c.length : undefined,
        alignment: checks?.themeAlignment?.heldOut?.themes[k]?.status,
      };
    }),
    groups: groups.map(({ differences: _d, ...g }) => g),
    main: main.map((d) => ({ covariate: d.covariate, theme: d.theme, levelA: d.levelA, levelB: d.levelB, difference: d.difference, low: d.low, high: d.high })),
    checks: checks
      ? { perplexity: checks.perplexity?.perplexity, coherence: checks.coherence.meanNpmi, stability: checks.stability?.overall, heldOut: model.diagnostics.heldOutDocuments }
      : undefined,
    tied: links.languages < 2 || links.answerGroupsAcrossLanguages + links.glossaryRowsAcrossLanguages > 0,
    trace: model.diagnostics.trace,
  };
}

export async function reportHtml(store: Store, study: Study, data: RunData): Promise<string> {
  const css = readFileSync(APP_CSS, 'utf8') + '\n' + readFileSync(REPORT_CSS, 'utf8');
  const node = <ReportDocument {...reportProps(store, study, data)} css={css} />;
  return `<!DOCTYPE html>${await node.toString()}`;
}
