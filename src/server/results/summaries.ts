// Figures of finished runs for the Runs list and the K comparison, from their stored diagnostics.
import { loadJsonResult, type Run, type Store } from '../../store/index.js';

export interface RunSummary {
  logLikelihoodPerToken?: number;
  perplexity?: number;
  coherence?: number;
  stability?: number;
}

function num(v: unknown): number | undefined {
  return typeof v === 'number' && Number.isFinite(v) ? v : undefined;
}

export function runSummaries(store: Store, runs: readonly Run[]): Map<number, RunSummary> {
  const out = new Map<number, RunSummary>();
  for (const r of runs) {
    if (r.status !== 'finished') continue;
    const d = loadJsonResult<Record<string, unknown>>(store, r.id, 'diagnostics') ?? {};
    const checks = loadJsonResult<Record<string, unknown>>(store, r.id, 'checks') ?? {};
    const coherence = checks.coherence as { npmi?: unknown; meanNpmi?: unknown } | number | undefined;
    out.set(r.id, {
      logLikelihoodPerToken: num(d.logLikelihoodPerToken),
      perplexity: num(checks.perplexity) ?? num((checks.perplexity as { perplexity?: unknown } | undefined)?.perplexity) ?? num(d.perplexity),
      coherence: typeof coherence === 'number' ? coherence : num(coherence?.meanNpmi) ?? num(coherence?.npmi) ?? num(d.coherence),
      stability: num(checks.stability) ?? num((checks.stability as { overall?: unknown } | undefined)?.overall),
    });
  }
  return out;
}
