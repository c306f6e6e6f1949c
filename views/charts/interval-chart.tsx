// Horizontal bars (or points) with optional 95% intervals: shares per group, differences between
// two groups (with a zero line), counts per language. Scale and ticks from d3-scale.
import { scaleBand, scaleLinear } from 'd3-scale';
import { Figure } from './figure.js';
import { seriesColour } from './palette.js';

export interface IntervalRow {
  readonly label: string;
  readonly value: number;
  readonly low?: number;
  readonly high?: number;
  /** Extra numbers shown only in the table (e.g. n, effective n). */
  readonly extra?: (string | number)[];
}

export interface IntervalChartProps {
  readonly caption: string;
  readonly valueLabel: string;
  readonly rows: readonly IntervalRow[];
  /** 'bar' draws from zero; 'point' draws a dot (for differences). */
  readonly mark?: 'bar' | 'point';
  readonly extraColumns?: string[];
  /** Show values as percentages. */
  readonly percent?: boolean;
  readonly width?: number;
  readonly colour?: number;
}

export function IntervalChart(props: IntervalChartProps) {
  const width = props.width ?? 640;
  const rowHeight = 22;
  const m = { top: 8, right: 24, bottom: 36, left: Math.min(260, 24 + 7 * Math.max(4, ...props.rows.map((r) => r.label.length))) };
  const height = m.top + m.bottom + rowHeight * Math.max(1, props.rows.length);
  const values = props.rows.flatMap((r) => [r.value, r.low ?? r.value, r.high ?? r.value]).filter(Number.isFinite);
  const lo = Math.min(0, ...values);
  const hi = Math.max(0, ...values);
  const x = scaleLinear().domain([lo, hi === lo ? lo + 1 : hi]).nice().range([m.left, width - m.right]);
  const y = scaleBand<number>().domain(props.rows.map((_, i) => i)).range([m.top, height - m.bottom]).padding(0.25);
  const tick = x.tickFormat(5, props.percent ? '.0~%' : undefined);
  const exact = (v: number) => (props.percent ? (Number.isFinite(v) ? `${(100 * v).toFixed(1)}%` : '—') : v);
  const colour = seriesColour(props.colour ?? 0);
  const mark = props.mark ?? 'bar';
  const columns = ['Label', props.valueLabel, 'Low (95%)', 'High (95%)', ...(props.extraColumns ?? [])];
  const rows = props.rows.map((r) => [r.label, exact(r.value), r.low === undefined ? '' : exact(r.low), r.high === undefined ? '' : exact(r.high), ...(r.extra ?? [])]);
  return (
    <Figure caption={props.caption} numbers={{ columns, rows }}>
      <svg class="interval-chart" viewBox={`0 0 ${width} ${height}`} role="img" aria-label={props.caption}>
        <g class="axis">
          {x.ticks(5).map((t) => (
            <g>
              <line class="grid" x1={x(t)} x2={x(t)} y1={m.top} y2={height - m.bottom} />
              <text x={x(t)} y={height - m.bottom + 16} text-anchor="middle">{tick(t)}</text>
            </g>
          ))}
          <line class="zero" x1={x(0)} x2={x(0)} y1={m.top} y2={height - m.bottom} />
          <text x={(m.left + width - m.right) / 2} y={height - 4} text-anchor="middle">{props.valueLabel}</text>
        </g>
        {props.rows.map((r, i) => {
          const top = y(i) ?? 0;
          const mid = top + y.bandwidth() / 2;
          return (
            <g>
              <text x={m.left - 6} y={mid + 4} text-anchor="end">{r.label}</text>
              {mark === 'bar' ? (
                <rect x={Math.min(x(0), x(r.value))} y={top} width={Math.abs(x(r.value) - x(0))} height={y.bandwidth()} fill={colour} />
              ) : (
                <circle cx={x(r.value)} cy={mid} r="4" fill={colour} />
              )}
              {r.low !== undefined && r.high !== undefined && (
                <g class="interval">
                  <line x1={x(r.low)} x2={x(r.high)} y1={mid} y2={mid} />
                  <line x1={x(r.low)} x2={x(r.low)} y1={mid - 5} y2={mid + 5} />
                  <line x1={x(r.high)} x2={x(r.high)} y1={mid - 5} y2={mid + 5} />
                </g>
              )}
            </g>
          );
        })}
      </svg>
    </Figure>
  );
}
