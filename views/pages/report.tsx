// The standalone printable report: one HTML file with its styles and SVG charts inline, no
// scripts and nothing fetched, so it opens anywhere and prints as it looks.
import { IntervalChart, LineChart } from '../charts/index.js';
import { Cautions, percent, when } from '../components.js';

export interface ReportProps {
  readonly study: string;
  readonly run: string;
  readonly createdAt: string;
  readonly settings: string;
  readonly css: string;
  readonly languages: string[];
  readonly themes: { k: number; label: string; share: number; words: Record<string, string[]> }[];
  readonly groups: { covariate: string; levels: string[]; rows: { level: string; theme: number; share: number; low: number; high: number; n: number; effectiveN: number }[] }[];
  readonly trace: number[];
}

export function ReportDocument(props: ReportProps) {
  return (
    <html lang="en">
      <head>
        <meta charset="utf-8" />
        <title>{`${props.study} · ${props.run} · Themata report`}</title>
        <style>{props.css}</style>
      </head>
      <body class="report">
        <main>
          <h1>{props.study}</h1>
          <p class="lead">Themes of run {props.run}, prepared {when(props.createdAt)} by Themata. {props.settings}</p>
          <Cautions privacy />
          <h2>Themes</h2>
          <table class="list themes">
            <thead>
              <tr>
                <th scope="col">#</th>
                <th scope="col">Label</th>
                <th scope="col" class="num">Share</th>
                {props.languages.map((l) => <th scope="col">Words · {l}</th>)}
              </tr>
            </thead>
            <tbody>
              {props.themes.map((t) => (
                <tr>
                  <td>{t.k + 1}</td>
                  <td>{t.label}</td>
                  <td class="num">{percent(t.share)}</td>
                  {props.languages.map((l) => <td class="words">{(t.words[l] ?? []).join(', ')}</td>)}
                </tr>
              ))}
            </tbody>
          </table>
          <IntervalChart caption="Share of all answers per theme (survey-weighted)." valueLabel="Share" percent rows={props.themes.map((t) => ({ label: `${t.k + 1}. ${t.label}`, value: t.share }))} />
          {props.groups.map((g) => (
            <section class="page-break">
              <h2>By {g.covariate}</h2>
              {props.themes.map((t) => (
                <IntervalChart
                  caption={`Theme ${t.k + 1} (${t.label}) by ${g.covariate}, 95% intervals.`}
                  valueLabel="Share"
                  percent
                  rows={g.rows.filter((r) => r.theme === t.k).map((r) => ({ label: r.level, value: r.share, low: r.low, high: r.high, extra: [r.n, Math.round(r.effectiveN)] }))}
                  extraColumns={['n', 'Effective n']}
                />
              ))}
            </section>
          ))}
          {props.trace.length > 1 && (
            <section class="page-break">
              <h2>Fit</h2>
              <LineChart caption="Log-likelihood per word after each sweep." xLabel="Sweep" yLabel="Log-likelihood per word" series={[{ name: 'log-likelihood', points: props.trace.map((v, i) => [i + 1, v] as const) }]} />
            </section>
          )}
        </main>
      </body>
    </html>
  );
}
