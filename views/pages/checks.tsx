// Checks: is the model any good? Likelihood trace, held-out perplexity, coherence, alignment
// across languages, stability across seeds, and the fitted hyperparameters.
import { IntervalChart, LineChart } from '../charts/index.js';
import { Notice } from '../components.js';
import { Layout, type PageFrame } from '../layout.js';

export interface ChecksPageProps {
  readonly frame: PageFrame;
  readonly trace: number[];
  readonly facts: { label: string; value: string; help: string }[];
  readonly coherence: { label: string; value: number }[];
  readonly alignment: { pair: string; precisionAt1: number; chance: number; mrr: number; chanceMrr: number }[];
  readonly stability: { label: string; value: number }[];
  readonly alpha: { label: string; value: number }[];
  readonly beta: { language: string; value: number }[];
  readonly lambda: { feature: string; values: number[] }[];
  readonly labels: string[];
  readonly missing: string[];
}

export function ChecksPage(props: ChecksPageProps) {
  return (
    <Layout {...props.frame}>
      <h1>Checks</h1>
      <dl class="facts wide">
        {props.facts.map((f) => (
          <div><dt title={f.help}>{f.label}</dt><dd>{f.value}</dd></div>
        ))}
      </dl>
      {props.missing.length > 0 && <Notice>{`Not computed for this run: ${props.missing.join('; ')}.`}</Notice>}
      <LineChart
        caption="Log-likelihood per word after each sweep. A flat end means the sampler has settled; a curve still rising means more sweeps would help."
        xLabel="Sweep"
        yLabel="Log-likelihood per word"
        series={[{ name: 'log-likelihood', points: props.trace.map((v, i) => [i + 1, v] as const) }]}
      />
      {props.coherence.length > 0 && (
        <IntervalChart caption="Coherence of each theme (NPMI of its top words, mean over languages; −1 to 1, higher is better)." valueLabel="NPMI" rows={props.coherence.map((c) => ({ label: c.label, value: c.value }))} />
      )}
      {props.alignment.length > 0 && (
        <section>
          <h2>Do themes line up across languages?</h2>
          <p class="hint">For held-out answers that have a translation, the theme mix of each is computed separately; then we check whether each answer's closest mix in the other language is its own translation.</p>
          <table class="list">
            <thead><tr><th scope="col">Languages</th><th scope="col" class="num">Partner found first</th><th scope="col" class="num">By chance</th><th scope="col" class="num">Mean reciprocal rank</th><th scope="col" class="num">By chance</th></tr></thead>
            <tbody>
              {props.alignment.map((a) => (
                <tr><td>{a.pair}</td><td class="num">{a.precisionAt1.toFixed(2)}</td><td class="num">{a.chance.toFixed(2)}</td><td class="num">{a.mrr.toFixed(2)}</td><td class="num">{a.chanceMrr.toFixed(2)}</td></tr>
              ))}
            </tbody>
          </table>
        </section>
      )}
      {props.stability.length > 0 && (
        <IntervalChart caption="Stability: similarity of each theme to its best match in runs with other seeds (0 to 1)." valueLabel="Cosine similarity" rows={props.stability.map((s) => ({ label: s.label, value: s.value }))} colour={2} />
      )}
      <h2>Hyperparameters</h2>
      <IntervalChart caption="Prior weight of each theme (α, for answers with typical metadata). Larger α: the theme is expected in more answers." valueLabel="α" rows={props.alpha.map((a) => ({ label: a.label, value: a.value }))} colour={4} />
      <table class="list">
        <thead><tr><th scope="col">Language</th><th scope="col" class="num">β (word smoothing)</th></tr></thead>
        <tbody>{props.beta.map((b) => <tr><td>{b.language}</td><td class="num">{b.value.toPrecision(3)}</td></tr>)}</tbody>
      </table>
      {props.lambda.length > 0 && (
        <details class="numbers">
          <summary>Covariate weights (λ): how each group feature shifts each theme's prior, on the log scale</summary>
          <div class="scroll">
            <table>
              <thead><tr><th scope="col">Feature</th>{props.labels.map((l) => <th scope="col">{l}</th>)}</tr></thead>
              <tbody>{props.lambda.map((r) => <tr><td>{r.feature}</td>{r.values.map((v) => <td class="num">{v.toFixed(2)}</td>)}</tr>)}</tbody>
            </table>
          </div>
        </details>
      )}
    </Layout>
  );
}
