// Contrasts: how much each group of respondents talks about each theme, and the difference
// between two groups, with intervals, n and effective n. The grid is shaded by each cell's
// difference from the theme's overall share (default), since shading the share itself makes a
// large theme dark in every group and hides the differences that matter; or by the share.
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
  /** Theme names; `suggested` marks a label nobody has accepted yet. */
  readonly themes: { text: string; suggested: boolean }[];
  /** Overall share per theme (all answers, survey-weighted): the reference of the difference shading. */
  readonly overall: number[];
  readonly shading: Shading;
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

export type Shading = 'difference' | 'share';

function shade(v: number, max: number): string {
  const step = max > 0 ? Math.min(8, Math.floor((9 * v) / max)) : 0;
  return `shade-${step}`;
}

const DIFF_STEPS = 4;

/** diff-m4 … diff-m1 (below overall), diff-0, diff-p1 … diff-p4 (above), on a scale of ±max. */
export function diffShade(d: number, max: number): string {
  if (!Number.isFinite(d) || max <= 0) return 'diff-0';
  const step = Math.min(DIFF_STEPS, Math.round((DIFF_STEPS * Math.abs(d)) / max));
  return step === 0 ? 'diff-0' : `diff-${d > 0 ? 'p' : 'm'}${step}`;
}

/** Percentage points, signed: "+3.2 pts". */
function points(d: number): string {
  return `${d > 0 ? '+' : d < 0 ? '−' : '±'}${(100 * Math.abs(d)).toFixed(1)} pts`;
}

function ShadingLegend(props: { shading: Shading; max: number }) {
  if (props.shading === 'share') {
    return (
      <p class="legend" id="shading-legend">
        <span class="swatch shade-0"></span> 0% <span class="swatch shade-4"></span> <span class="swatch shade-8"></span> {percent(props.max)} of the group's answers (darker = larger share)
      </p>
    );
  }
  const steps = Array.from({ length: 2 * DIFF_STEPS + 1 }, (_, i) => i - DIFF_STEPS);
  return (
    <p class="legend" id="shading-legend">
      <span>{points(-props.max)} below the theme's overall share</span>
      {steps.map((s) => <span class={`swatch ${s === 0 ? 'diff-0' : `diff-${s > 0 ? 'p' : 'm'}${Math.abs(s)}`}`} title={points((s * props.max) / DIFF_STEPS)}></span>)}
      <span>{points(props.max)} above</span>
    </p>
  );
}

export function ContrastsPage(props: ContrastsPageProps) {
  const max = Math.max(0, ...props.grid.flat().map((c) => c.share).filter(Number.isFinite));
  const maxDiff = Math.max(0, ...props.grid.flatMap((row) => row.map((c, k) => Math.abs(c.share - props.overall[k]))).filter(Number.isFinite));
  const link = (shading: Shading) => `${props.base}/contrasts?by=${encodeURIComponent(props.by)}&a=${encodeURIComponent(props.a)}&b=${encodeURIComponent(props.b)}${shading === 'share' ? '&shade=share' : ''}`;
  const name = (k: number) => `${k + 1}. ${props.themes[k]?.text ?? ''}`;
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
        {props.shading === 'share' && <input type="hidden" name="shade" value="share" />}
        <button type="submit">Show</button>
      </form>
      {props.notes.map((n) => <Notice>{n}</Notice>)}
      {props.excluded > 0 && <p class="hint">{count(props.excluded)} answers have no value for {props.by} and are left out.</p>}
      <h2>Share of each theme in each group</h2>
      <p class="row" id="shading">
        Shade cells by:{' '}
        <a href={link('difference')} aria-current={props.shading === 'difference' ? 'true' : undefined}>difference from the theme's overall share</a>
        <a href={link('share')} aria-current={props.shading === 'share' ? 'true' : undefined}>share</a>
      </p>
      <p class="hint">
        Each cell: the survey-weighted share of the group's answers given to the theme.{' '}
        {props.shading === 'difference'
          ? "Colour: how far it is from the theme's share over all answers (orange below, blue above); a bold figure's 95% interval leaves out the overall share."
          : 'Colour: darker = larger share.'}{' '}
        Hover or open the numbers for 95% intervals. Effective n (Kish) is smaller than n when weights vary: it is the sample size the intervals really rest on.
      </p>
      <ShadingLegend shading={props.shading} max={props.shading === 'share' ? max : maxDiff} />
      <div class="scroll">
        <table class="list grid" id="contrast-grid">
          <thead>
            <tr>
              <th scope="col">{props.by}</th>
              <th scope="col" class="num">n</th>
              <th scope="col" class="num">Effective n</th>
              {props.themes.map((t, k) => (
                <th scope="col" class="theme-head">
                  <a href={`${props.base}/themes/${k}`} class={t.suggested ? 'suggested' : undefined} title={t.suggested ? 'Suggested label: accept or edit it on the Themes page' : undefined}>{name(k)}</a>
                </th>
              ))}
            </tr>
            {props.shading === 'difference' && (
              <tr class="overall">
                <th scope="row">All answers</th>
                <td class="num"></td>
                <td class="num"></td>
                {props.overall.map((o) => <td class="num">{percent(o)}</td>)}
              </tr>
            )}
          </thead>
          <tbody>
            {props.levels.map((lv, i) => (
              <tr>
                <th scope="row">{lv.level}</th>
                <td class="num">{count(lv.n)}</td>
                <td class="num">{count(Math.round(lv.effectiveN))}</td>
                {props.grid[i].map((cell, k) => {
                  const d = cell.share - props.overall[k];
                  const clear = cell.low > props.overall[k] || cell.high < props.overall[k];
                  return props.shading === 'difference' ? (
                    <td class={`num ${diffShade(d, maxDiff)}${clear ? ' clear' : ''}`} title={`${points(d)} from the overall ${percent(props.overall[k])}; 95% interval ${percent(cell.low)} to ${percent(cell.high)}`}>{percent(cell.share)}</td>
                  ) : (
                    <td class={`num ${shade(cell.share, max)}`} title={`95% interval ${percent(cell.low)} to ${percent(cell.high)}`}>{percent(cell.share)}</td>
                  );
                })}
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      <details class="numbers">
        <summary>Numbers with intervals</summary>
        <table>
          <thead><tr><th scope="col">{props.by}</th><th scope="col">Theme</th><th scope="col">Share</th><th scope="col">Low (95%)</th><th scope="col">High (95%)</th><th scope="col">Difference from overall</th></tr></thead>
          <tbody>
            {props.levels.flatMap((lv, i) => props.grid[i].map((c, k) => (
              <tr><td>{lv.level}</td><td>{name(k)}</td><td class="num">{percent(c.share)}</td><td class="num">{percent(c.low)}</td><td class="num">{percent(c.high)}</td><td class="num">{points(c.share - props.overall[k])}</td></tr>
            )))}
          </tbody>
        </table>
      </details>
      {props.levels.length >= 2 && (
        <>
          <h2>Difference between two groups</h2>
          <form method="get" action={`${props.base}/contrasts`} class="row" id="pair-form">
            <input type="hidden" name="by" value={props.by} />
            {props.shading === 'share' && <input type="hidden" name="shade" value="share" />}
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
            1995) over all pairs of groups of {props.by}. Intervals come from {count(props.draws)} draws, each combining a sample of the answers' theme mixes with a resampling of the answers.
          </p>
        </>
      )}
    </Layout>
  );
}
