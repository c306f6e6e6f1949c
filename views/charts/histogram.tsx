// A histogram of pre-binned counts (e.g. language-detection confidence). Scales from d3-scale.
import { scaleLinear } from 'd3-scale';
import { Figure, formatNumber } from './figure.js';
import { seriesColour } from './palette.js';

export interface Bin {
  readonly x0: number;
  readonly x1: number;
  readonly count: number;
}

export function Histogram(props: { caption: string; xLabel: string; bins: readonly Bin[]; width?: number; height?: number }) {
  const width = props.width ?? 640;
  const height = props.height ?? 200;
  const m = { top: 10, right: 16, bottom: 40, left: 56 };
  const lo = props.bins.length ? props.bins[0].x0 : 0;
  const hi = props.bins.length ? props.bins[props.bins.length - 1].x1 : 1;
  const x = scaleLinear().domain([lo, hi]).range([m.left, width - m.right]);
  const y = scaleLinear()
    .domain([0, Math.max(1, ...props.bins.map((b) => b.count))])
    .nice()
    .range([height - m.bottom, m.top]);
  const xTick = x.tickFormat(5);
  const yTick = y.tickFormat(4);
  const rows = props.bins.map((b) => [`${formatNumber(b.x0)}–${formatNumber(b.x1)}`, b.count]);
  return (
    <Figure caption={props.caption} numbers={{ columns: [props.xLabel, 'Answers'], rows }}>
      <svg class="histogram" viewBox={`0 0 ${width} ${height}`} role="img" aria-label={props.caption}>
        <g class="axis">
          {y.ticks(4).map((t) => (
            <g>
              <line class="grid" x1={m.left} x2={width - m.right} y1={y(t)} y2={y(t)} />
              <text x={m.left - 6} y={y(t) + 4} text-anchor="end">{yTick(t)}</text>
            </g>
          ))}
          {x.ticks(5).map((t) => (
            <text x={x(t)} y={height - m.bottom + 16} text-anchor="middle">{xTick(t)}</text>
          ))}
          <line x1={m.left} x2={width - m.right} y1={height - m.bottom} y2={height - m.bottom} />
          <text x={(m.left + width - m.right) / 2} y={height - 4} text-anchor="middle">{props.xLabel}</text>
        </g>
        {props.bins.map((b) => (
          <rect x={x(b.x0) + 1} y={y(b.count)} width={Math.max(0, x(b.x1) - x(b.x0) - 2)} height={y(0) - y(b.count)} fill={seriesColour(0)} />
        ))}
      </svg>
    </Figure>
  );
}
