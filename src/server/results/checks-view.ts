// The Checks page's plain props from a run's stored checks and fitted hyperparameters.
import type { RunChecks } from '../../services/index.js';
import type { RunData } from './run-data.js';

export function checksProps(data: RunData, checks: RunChecks) {
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
  const coherence = model.labels.map((label, k) => {
    const v = checks.coherence.themes.filter((t) => t.theme === k && Number.isFinite(t.npmi)).map((t) => t.npmi);
    return { label: `${k + 1}. ${label}`, value: v.length ? v.reduce((a, b) => a + b, 0) / v.length : NaN };
  });
  const alignment = (checks.alignment?.pairs ?? []).map((p) => ({ pair: `${p.from} → ${p.to}`, precisionAt1: p.precisionAt1, chance: p.chancePrecisionAt1, mrr: p.meanReciprocalRank, chanceMrr: p.chanceMeanReciprocalRank }));
  const stability = checks.stability ? model.labels.map((label, k) => ({ label: `${k + 1}. ${label}`, value: checks.stability!.perTheme[k] })) : [];
  const P = model.alpha.length / K;
  const alpha = model.labels.map((label, k) => {
    let s = 0;
    for (let p = 0; p < P; p++) s += model.alpha[p * K + k];
    return { label: `${k + 1}. ${label}`, value: s / Math.max(1, P) };
  });
  const beta = model.languages.map((language, l) => ({ language, value: model.beta[l] }));
  const F = model.lambda ? model.lambda.length / K : 0;
  const lambda = model.lambda
    ? Array.from({ length: F }, (_, f) => ({ feature: model.features.names[f] ?? `feature ${f}`, values: Array.from({ length: K }, (_, k) => model.lambda![k * F + f]) }))
    : [];
  const missing = [...checks.notes];
  return { trace: d.trace, facts, coherence: coherence.filter((x) => Number.isFinite(x.value)), alignment, stability, alpha, beta, lambda, labels: model.labels, missing };
}
