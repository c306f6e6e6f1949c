// Checks: is the model any good? Likelihood trace, held-out perplexity (beside the study's other
// runs), coherence, alignment across languages (retrieval of translations, and per theme and
// language pair), stability across seeds, and the fitted hyperparameters.
import { IntervalChart, LineChart } from '../charts/index.js';
import { count, Notice, percent } from '../components.js';
import { Layout, type PageFrame } from '../layout.js';
import { TiesNotice, type TiesFacts } from '../ties-notice.js';

export interface ThemeAlignmentTable {
  readonly minPairs: number;
  readonly languagePairs: { pair: string; pairs: number; agreement: number; chance: number }[];
  readonly rows: { theme: string; pair: string; involving: number; agreeing: number; agreement: number; chance: number; low: number; correlation: number; status: string }[];
  readonly notAligned: string[];
}

export interface ChecksPageProps {
  readonly frame: PageFrame;
  readonly trace: number[];
  readonly facts: { label: string; value: string; help: string }[];
  readonly coherence: { label: string; value: number }[];
  readonly alignment: { pair: string; queries: number; candidates: number; precisionAt1: number; chance: number; mrr: number; chanceMrr: number }[];
  readonly heldOutThemes: ThemeAlignmentTable | null;
  readonly glossaryThemes: ThemeAlignmentTable | null;
  readonly runs: { name: string; href: string; current: boolean; themes: number; holdout: number; seed: number; perplexity?: number; coherence?: number }[];
  readonly stability: { label: string; value: number }[];
  readonly alpha: { label: string; value: number }[];
  readonly beta: { language: string; value: number }[];
  readonly lambda: { feature: string; values: number[] }[];
  readonly labels: string[];
  readonly missing: string[];
  readonly links: TiesFacts;
}

const fixed = (v: number | undefined, digits: number) => (v === undefined || !Number.isFinite(v) ? '—' : v.toFixed(digits));

function ThemeAlignment(props: { id: string; title: string; intro: string; table: ThemeAlignmentTable }) {
  const t = props.table;
  return (
    <section id={props.id}>
      <h3>{props.title}</h3>
      <p class="hint">{props.intro}</p>
      <table class="list compact">
        <thead>
          <tr><th scope="col">Languages</th><th scope="col" class="num">Pairs</th><th scope="col" class="num">Same leading theme</th><th scope="col" class="num">Expected by chance</th></tr>
        </thead>
        <tbody>
          {t.languagePairs.map((p) => (
            <tr><td>{p.pair}</td><td class="num">{count(p.pairs)}</td><td class="num">{percent(p.agreement, 0)}</td><td class="num">{percent(p.chance, 0)}</td></tr>
          ))}
        </tbody>
      </table>
      {t.notAligned.length > 0 && <Notice kind="error">{`Not aligned across languages: ${t.notAligned.join('; ')}.`}</Notice>}
      <details class="numbers" open={t.notAligned.length > 0}>
        <summary>Per theme and language pair</summary>
        <table class="list compact">
          <thead>
            <tr>
              <th scope="col">Theme</th>
              <th scope="col">Languages</th>
              <th scope="col" class="num" title="Pairs in which either text is led by this theme">Pairs led by it</th>
              <th scope="col" class="num" title="Pairs in which both texts are led by this theme">Both led by it</th>
              <th scope="col" class="num">Agreement</th>
              <th scope="col" class="num" title="Agreement if texts were paired at random">Expected by chance</th>
              <th scope="col" class="num" title="Lower end of the 95% Wilson interval of the agreement">Agreement, at least (95%)</th>
              <th scope="col" class="num" title="Correlation of the theme's share between the two texts of a pair">Share correlation</th>
              <th scope="col">Verdict</th>
            </tr>
          </thead>
          <tbody>
            {t.rows.map((r) => (
              <tr class={r.status === 'not aligned' ? 'flagged' : undefined}>
                <td>{r.theme}</td><td>{r.pair}</td><td class="num">{count(r.involving)}</td><td class="num">{count(r.agreeing)}</td>
                <td class="num">{percent(r.agreement, 0)}</td><td class="num">{percent(r.chance, 0)}</td><td class="num">{percent(r.low, 0)}</td>
                <td class="num">{fixed(r.correlation, 2)}</td><td>{r.status}</td>
              </tr>
            ))}
          </tbody>
        </table>
        <p class="hint">
          Rule: a theme is aligned for a pair of languages when the lower end of the 95% interval of its agreement (Wilson 1927) is above what chance gives; it is flagged
          "not aligned" when that fails for any pair of languages; with fewer than {t.minPairs} pairs led by it, there is too little evidence to judge.
        </p>
      </details>
    </section>
  );
}

export function ChecksPage(props: ChecksPageProps) {
  const negative = props.coherence.filter((c) => c.value < 0);
  return (
    <Layout {...props.frame}>
      <h1>Checks</h1>
      <TiesNotice links={props.links} studyId={props.frame.study?.id ?? 0} when="after" />
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
      <section id="perplexity">
        <h2>Held-out perplexity</h2>
        <p class="hint">
          How well the themes predict words of answers the fit never saw: half of each held-out answer's words give its theme mix, and perplexity says how well that mix
          predicts the other half (document completion; Wallach, Murray, Salakhutdinov &amp; Mimno, ICML 2009). It is the number of equally likely words the model is in
          effect choosing between for each word: lower is better. It means something only beside other runs of the same study; runs with another seed or held-out share
          are tested on other answers, so small differences say little.
        </p>
        <table class="list compact" id="perplexity-runs">
          <thead>
            <tr><th scope="col">Run</th><th scope="col" class="num">Themes</th><th scope="col" class="num">Held-out share</th><th scope="col" class="num">Seed</th><th scope="col" class="num">Held-out perplexity</th><th scope="col" class="num">Mean coherence</th></tr>
          </thead>
          <tbody>
            {props.runs.map((r) => (
              <tr class={r.current ? 'current' : undefined}>
                <td>{r.current ? r.name : <a href={r.href}>{r.name}</a>}{r.current && <span class="tag">this run</span>}</td>
                <td class="num">{r.themes}</td>
                <td class="num">{percent(r.holdout, 0)}</td>
                <td class="num">{r.seed}</td>
                <td class="num">{r.perplexity !== undefined ? r.perplexity.toFixed(1) : r.holdout > 0 ? <a href={r.href}>open its Checks</a> : 'none held out'}</td>
                <td class="num">{fixed(r.coherence, 3)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </section>
      <section id="coherence">
        <h2>Coherence</h2>
        <p class="hint">
          How often each theme's top words appear in the same answers, against chance: NPMI (Bouma 2009; Lau, Newman &amp; Baldwin, EACL 2014) from −1 (never together)
          through 0 (as often as chance) to 1 (always together), the mean over languages. Readable themes usually score above about 0.05; a negative score means the words
          rarely share an answer.
        </p>
        {negative.length > 0 && <Notice kind="error">{`Negative coherence: ${negative.map((c) => c.label).join('; ')}. Read these themes' answers before trusting their labels.`}</Notice>}
        {props.coherence.length > 0 && (
          <IntervalChart caption="Coherence of each theme (NPMI of its top words, mean over languages; −1 to 1, higher is better)." valueLabel="NPMI" rows={props.coherence.map((c) => ({ label: c.label, value: c.value }))} />
        )}
      </section>
      <section id="alignment">
        <h2>Do themes line up across languages?</h2>
        {props.alignment.length === 0 && !props.heldOutThemes && !props.glossaryThemes && (
          <p class="hint">No held-out translations and no glossary rows: nothing here can test whether a theme means the same thing in each language.</p>
        )}
        {props.alignment.length > 0 && (
          <>
            <p class="hint">
              For held-out answers that have a translation, the theme mix of each is computed separately; then we check whether each answer's closest mix in the other
              language is its own translation, among all held-out answers of that language.
            </p>
            <table class="list compact" id="retrieval">
              <thead>
                <tr>
                  <th scope="col">Languages</th>
                  <th scope="col" class="num" title="Held-out answers with a translation in the other language">Answers compared</th>
                  <th scope="col" class="num" title="Held-out answers of the other language each is compared with">Candidates each</th>
                  <th scope="col" class="num">Translation ranked first</th>
                  <th scope="col" class="num">Ranked first by chance</th>
                  <th scope="col" class="num" title="Mean of 1 / the translation's rank">Mean reciprocal rank</th>
                  <th scope="col" class="num">Mean reciprocal rank by chance</th>
                </tr>
              </thead>
              <tbody>
                {props.alignment.map((a) => (
                  <tr><td>{a.pair}</td><td class="num">{count(a.queries)}</td><td class="num">{count(a.candidates)}</td><td class="num">{a.precisionAt1.toFixed(2)}</td><td class="num">{a.chance.toFixed(2)}</td><td class="num">{a.mrr.toFixed(2)}</td><td class="num">{a.chanceMrr.toFixed(2)}</td></tr>
                ))}
              </tbody>
            </table>
          </>
        )}
        {props.heldOutThemes && (
          <ThemeAlignment
            id="theme-alignment"
            title="Per theme, from held-out translations"
            intro="Each pair is two held-out answers of one link group in two languages, each folded in on its own: are both led by the same theme?"
            table={props.heldOutThemes}
          />
        )}
        {props.glossaryThemes && (
          <ThemeAlignment
            id="glossary-alignment"
            title="Per theme, from the glossary"
            intro="Each pair is the terms of one glossary row in two languages: is the theme most likely to use the terms the same in both? The glossary took part in the fit, so this says how well it held, not how the themes do on unseen answers."
            table={props.glossaryThemes}
          />
        )}
      </section>
      {props.stability.length > 0 && (
        <IntervalChart caption="Stability: similarity of each theme to its best match in runs with other seeds (0 to 1)." valueLabel="Cosine similarity" rows={props.stability.map((s) => ({ label: s.label, value: s.value }))} colour={2} />
      )}
      <h2>Hyperparameters</h2>
      <IntervalChart caption="Prior weight of each theme (α, for answers with typical metadata). Larger α: the theme is expected in more answers." valueLabel="α" rows={props.alpha.map((a) => ({ label: a.label, value: a.value }))} colour={4} />
      <table class="list compact">
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
