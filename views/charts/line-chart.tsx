// A line chart (e.g. the log-likelihood trace per sweep). Scales and ticks come from d3-scale,
// the path from d3-shape: no hand-written axis arithmetic.
import { scaleLinear } from 'd3-scale';
import { line } from 'd3-shape';
import { Figure } from './figure.js';
import { seriesColour } from './palette.js';

export interface LineSeries {
  readonly name: string;
  readonly points: readonly (readonly [number, number])[];
}

export interface LineChartProps {
  readonly caption: string;
  readonly xLabel: string;
  readonly yLabel: string;
  readonly series: readonly LineSeries[];
  readonly width?: number;
  readonly height?: number;
  readonly id?: string;
}

export function LineChart(props: LineChartProps) {
  const width = props.width ?? 640;
  const height = props.height ?? 240;
  const m = { top: 12, right: 16, bottom: 40, left: 64 };
  const all = props.series.flatMap((s) => s.points);
  const xs = all.map((p) => p[0]);
  const ys = all.map((p) => p[1]).filter(Number.isFinite);
  const x = scaleLinear()
    .domain(xs.length ? [Math.min(...xs), Math.max(Math.max(...xs), Math.min(...xs) + 1)] : [0, 1])
    .range([m.left, width - m.right]);
  const y = scaleLinear()
    .domain(ys.length ? [Math.min(...ys), Math.max(...ys)] : [0, 1])
    .nice()
    .range([height - m.bottom, m.top]);
  const path = line<readonly [number, number]>()
    .defined((p) => Number.isFinite(p[1]))
    .x((p) => x(p[0]))
    .y((p) => y(p[1]));
  const xTick = x.tickFormat(6);
  const yTick = y.tickFormat(5);
  const rows = props.series.flatMap((s) => s.points.map((p) => [s.name, p[0], p[1]] as (string | number)[]));
  return (
    <Figure caption={props.caption} numbers={{ columns: ['Series', props.xLabel, props.yLabel], rows }}>
      <svg id={props.id} class="line-chart" viewBox={`0 0 ${width} ${height}`} role="img" aria-label={props.caption}>
        <g class="axis">
          <line x1={m.left} x2={width - m.right} y1={height - m.bottom} y2={height - m.bottom} />
          {x.ticks(6).map((t) => (
            <g>
              <line x1={x(t)} x2={x(t)} y1={height - m.bottom} y2={height - m.bottom + 4} />
              <text x={x(t)} y={height - m.bottom + 16} text-anchor="middle">{xTick(t)}</text>
            </g>
          ))}
          <text x={(m.left + width - m.right) / 2} y={height - 4} text-anchor="middle">{props.xLabel}</text>
        </g>
        <g class="axis">
          <line x1={m.left} x2={m.left} y1={m.top} y2={height - m.bottom} />
          {y.ticks(5).map((t) => (
            <g>
              <line class="grid" x1={m.left} x2={width - m.right} y1={y(t)} y2={y(t)} />
              <text x={m.left - 6} y={y(t) + 4} text-anchor="end">{yTick(t)}</text>
            </g>
          ))}
          <text transform={`translate(14 ${(m.top + height - m.bottom) / 2}) rotate(-90)`} text-anchor="middle">{props.yLabel}</text>
        </g>
        {props.series.map((s, i) => (
          <path d={path(s.points) ?? ''} fill="none" stroke={seriesColour(i)} stroke-width="2" />
        ))}
        {props.series.length > 1 &&
          props.series.map((s, i) => (
            <text x={width - m.right} y={m.top + 12 + i * 14} text-anchor="end" fill={seriesColour(i)}>{s.name}</text>
          ))}
      </svg>
    </Figure>
  );
}
