// Every chart sits in a figure with a caption and its numbers one click away in a table.
import type { Child } from 'hono/jsx';

export interface NumbersTable {
  readonly columns: string[];
  readonly rows: (string | number)[][];
}

export function formatNumber(v: string | number): string {
  if (typeof v === 'string') return v;
  if (!Number.isFinite(v)) return '—';
  if (Number.isInteger(v)) return v.toLocaleString('en-GB');
  const a = Math.abs(v);
  return a >= 100 ? v.toFixed(1) : a >= 1 ? v.toFixed(3) : v.toPrecision(3);
}

export function Figure(props: { caption: string; numbers: NumbersTable; children: Child }) {
  return (
    <figure class="chart">
      {props.children}
      <figcaption>{props.caption}</figcaption>
      <details class="numbers">
        <summary>Numbers behind this chart</summary>
        <table>
          <thead>
            <tr>{props.numbers.columns.map((c) => <th scope="col">{c}</th>)}</tr>
          </thead>
          <tbody>
            {props.numbers.rows.map((r) => (
              <tr>{r.map((v) => <td class={typeof v === 'number' ? 'num' : undefined}>{formatNumber(v)}</td>)}</tr>
            ))}
          </tbody>
        </table>
      </details>
    </figure>
  );
}
