// The Checks page's plain props from a run's stored checks and fitted hyperparameters, the other
// runs of the study (for held-out perplexity side by side) and the theme names.
import type { ThemeAlignmentResult } from '../../eval/index.js';
import type { RunChecks } from '../../services/index.js';
import type { Run } from '../../store/index.js';
import type { RunData } from './run-data.js';
import type { RunSummary } from './summaries.js';
import { numbered, type ThemeName } from './theme-names.js';

function alignmentTable(result: ThemeAlignmentResult | null | undefined, names: readonly ThemeName[]) {
  if (!result) return null;
  return {
    minPairs: result.minPairs,
    languagePairs: result.languagePairs.map((p) => ({ pair: `${p.languageA} – ${p.languageB}`, pairs: p.pairs, agreement: p.agreement, chance: p.chance })),
    rows: result.cells.map((c) => ({
      theme: numbered(names[c.theme] ?? { k: c.theme, text: `Theme ${c.theme + 1}` }),
      pair: `${c.languageA} – ${c.languageB}`,
      involving: c.involving,
      agreeing: c.agreeing,
      agreement: c.agreement,
      chance: c.chance,
      low: c.low,
      correlation: c.correlation,
      status: c.status,
    })),
    notAligned: result.themes.filter((t) => t.status === 'not aligned').map((t) => numbered(names[t.theme] ?? { k: t.theme, text: `Theme ${t.theme + 1}` })),
  };
}

export function checksProps(data: RunData, checks: RunChecks, names: readonly ThemeName[], peers: readonly { run: Run; summary: RunSummary | undefined }[]) {
  const { model } = data;
  const K = model.K;
  const d = model.diagnostics;
  const facts = [
    { label: 'Themes', value: String(K), help: 'Number of themes of this run' },
    { label: 'Answers fitted', value: d.documents.toLocaleString('en-GB'), help: 'Answers used to fit the model' },
    { label: 'Held out', value: d.heldOutDocuments.toLocaleString('en-GB'), help: 'Answers kept aside for the checks' },
    { label: 'Words', value: d.tokens.toLocaleString('en-GB'), help: 'Word occurrences in the fitted answers' },
    { label: 'Sweeps', value: String(d.sweeps), help: 'Passes of the sampler over every word' },
    { label: 'Sampler', value: d.sampler, help: 'Which Gibbs sampler ran' },
    { label: 'Fit time', value: `${d.seconds.toFixed(1)} s`, help: 'Wall-clock time of the fit' },
    { label: 'Held-out perplexity', value: checks.perplexity ? checks.perplexity.perplexity.toFixed(1) : '—', help: 'Document-completion perplexity on held-out answers (Wallach et al., ICML 2009); lower is better' },
    { label: 'Mean coherence (NPMI)', value: Number.isFinite(checks.coherence.meanNpmi) ? checks.coherence.meanNpmi.toFixed(3) : '—', help: 'Mean NPMI of top words over themes and languages (Lau, Newman & Baldwin 2014)' },
    { label: 'Stability', value: checks.stability ? checks.stability.overall.toFixed(2) : '—', help: 'Mean similarity of matched themes across seeds (Greene, O’Callaghan & Cunningham 2014)' },
  ];
  const coherence = names.map((name, k) => {
    const v = checks.coherence.themes.filter((t) => t.theme === k && Number.isFinite(t.npmi)).map((t) => t.npmi);
    return { label: numbered(name), value: v.length ? v.reduce((a, b) => a + b, 0) / v.length : NaN };
  });
  const alignment = (checks.alignment?.pairs ?? []).map((p) => ({
    pair: `${p.from} → ${p.to}`,
    queries: p.queries,
    candidates: p.candidates,
    precisionAt1: p.precisionAt1,
    chance: p.chancePrecisionAt1,
    mrr: p.meanReciprocalRank,
    chanceMrr: p.chanceMeanReciprocalRank,
  }));
  const stability = checks.stability ? names.map((name, k) => ({ label: numbered(name), value: checks.stability!.perTheme[k] })) : [];
  const P = model.alpha.length / K;
  const alpha = names.map((name, k) => {
    let s = 0;
    for (let p = 0; p < P; p++) s += model.alpha[p * K + k];
    return { label: numbered(name), value: s / Math.max(1, P) };
  });
  const beta = model.languages.map((language, l) => ({ language, value: model.beta[l] }));
  const F = model.lambda ? model.lambda.length / K : 0;
  const lambda = model.lambda
    ? Array.from({ length: F }, (_, f) => ({ feature: model.features.names[f] ?? `feature ${f}`, values: Array.from({ length: K }, (_, k) => model.lambda![k * F + f]) }))
    : [];
  const runs = peers.map(({ run, summary }) => ({
    name: run.name,
    href: `/studies/${run.studyId}/runs/${run.id}/checks`,
    current: run.id === model.run.id,
    themes: run.settings.themes,
    holdout: run.settings.holdout,
    seed: run.settings.seed,
    perplexity: run.id === model.run.id ? checks.perplexity?.perplexity : summary?.perplexity,
    coherence: run.id === model.run.id ? checks.coherence.meanNpmi : summary?.coherence,
  }));
  const missing = [...checks.notes];
  return {
    trace: d.trace,
    facts,
    coherence: coherence.filter((x) => Number.isFinite(x.value)),
    alignment,
    heldOutThemes: alignmentTable(checks.themeAlignment?.heldOut, names),
    glossaryThemes: alignmentTable(checks.themeAlignment?.glossary, names),
    runs,
    stability,
    alpha,
    beta,
    lambda,
    labels: names.map((n) => n.text),
    missing,
  };
}
