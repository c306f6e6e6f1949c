// Contrasts: how much each group of respondents talks about each theme, and the difference
// between two groups, with intervals, n and effective n.
import { IntervalChart } from '../charts/index.js';
import { Cautions, count, Notice, percent } from '../components.js';
import { Layout, type PageFrame } from '../layout.js';

export interface GridCell {
  readonly share: number;
  readonly low: number;
  readonly high: number;
}

export interface ContrastsPageProps {
  readonly frame: PageFrame;
  readonly base: string;
  readonly covariates: string[];
  readonly by: string;
  readonly labels: string[];
  readonly levels: { level: string; n: number; effectiveN: number }[];
  /** levels × themes */
  readonly grid: GridCell[][];
  readonly a: string;
  readonly b: string;
  readonly differences: { theme: string; difference: number; low: number; high: number; p: number; pAdjusted: number; discovery: boolean }[];
  readonly notes: string[];
  readonly excluded: number;
  readonly draws: number;
}

function shade(v: number, max: number): string {
  const step = max > 0 ? Math.min(8, Math.floor((9 * v) / max)) : 0;
  return `shade-${step}`;
}

export function ContrastsPage(props: ContrastsPageProps) {
  const max = Math.max(0, ...props.grid.flat().map((c) => c.share));
  return (
    <Layout {...props.frame}>
      <h1>Contrasts</h1>
      <Cautions />
      <form method="get" action={`${props.base}/contrasts`} class="row" id="contrast-form">
        <label>
          Compare groups by
          <select name="by">
            {props.covariates.map((c) => <option value={c} selected={c === props.by}>{c}</option>)}
          </select>
        </label>
        <button type="submit">Show</button>
      </form>
      {props.notes.map((n) => <Notice>{n}</Notice>)}
      {props.excluded > 0 && <p class="hint">{count(props.excluded)} answers have no value for {props.by} and are left out.</p>}
      <h2>Share of each theme in each group</h2>
      <p class="hint">Each cell: the survey-weighted share of the group's answers given to the theme; darker = larger. Hover or open the numbers for 95% intervals. Effective n (Kish) is smaller than n when weights vary: it is the sample size the intervals really rest on.</p>
      <div class="scroll">
        <table class="list grid" id="contrast-grid">
          <thead>
            <tr>
              <th scope="col">{props.by}</th>
              <th scope="col" class="num">n</th>
              <th scope="col" class="num">Effective n</th>
              {props.labels.map((l, k) => <th scope="col" class="theme-head"><a href={`${props.base}/themes/${k}`}>{`${k + 1}. ${l}`}</a></th>)}
            </tr>
          </thead>
          <tbody>
            {props.levels.map((lv, i) => (
              <tr>
                <th scope="row">{lv.level}</th>
                <td class="num">{count(lv.n)}</td>
                <td class="num">{count(Math.round(lv.effectiveN))}</td>
                {props.grid[i].map((cell) => (
                  <td class={`num ${shade(cell.share, max)}`} title={`95% interval ${percent(cell.low)} to ${percent(cell.high)}`}>{percent(cell.share)}</td>
                ))}
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      <details class="numbers">
        <summary>Numbers with intervals</summary>
        <table>
          <thead><tr><th scope="col">{props.by}</th><th scope="col">Theme</th><th scope="col">Share</th><th scope="col">Low (95%)</th><th scope="col">High (95%)</th></tr></thead>
          <tbody>
            {props.levels.flatMap((lv, i) => props.grid[i].map((c, k) => (
              <tr><td>{lv.level}</td><td>{props.labels[k]}</td><td class="num">{percent(c.share)}</td><td class="num">{percent(c.low)}</td><td class="num">{percent(c.high)}</td></tr>
            )))}
          </tbody>
        </table>
      </details>
      {props.levels.length >= 2 && (
        <>
          <h2>Difference between two groups</h2>
          <form method="get" action={`${props.base}/contrasts`} class="row" id="pair-form">
            <input type="hidden" name="by" value={props.by} />
            <label>Group <select name="a">{props.levels.map((l) => <option value={l.level} selected={l.level === props.a}>{l.level}</option>)}</select></label>
            <span>minus</span>
            <label>group <select name="b">{props.levels.map((l) => <option value={l.level} selected={l.level === props.b}>{l.level}</option>)}</select></label>
            <button type="submit">Compare</button>
          </form>
          <IntervalChart
            caption={`Share in ${props.a} minus share in ${props.b}, per theme, with 95% intervals. Intervals crossing zero: no clear difference.`}
            valueLabel="Difference in share"
            mark="point"
            percent
            colour={3}
            rows={props.differences.map((d) => ({ label: d.theme, value: d.difference, low: d.low, high: d.high, extra: [d.p.toFixed(3), Number.isFinite(d.pAdjusted) ? d.pAdjusted.toFixed(3) : '—', d.discovery ? 'yes' : 'no'] }))}
            extraColumns={['p', 'p adjusted (Benjamini–Hochberg)', 'Holds at 5% false discovery rate']}
          />
          <p class="hint">
            Many themes are compared at once, so some differences look clear by chance. The adjusted p-values control the false discovery rate (Benjamini &amp; Hochberg,
            1995) over all pairs of groups of {props.by}. Intervals come from {count(props.draws)} draws.
          </p>
        </>
      )}
    </Layout>
  );
}
