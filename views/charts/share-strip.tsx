// A one-line proportional strip (e.g. a theme's tokens by language, or an answer's theme mix).
// Small enough to sit in a table cell; labelled segments, so colour is never the only cue.
import { scaleLinear } from 'd3-scale';
import { seriesColour } from './palette.js';

export interface StripPart {
  readonly label: string;
  readonly share: number;
  /** Palette index (stable per language or theme). */
  readonly colour: number;
}

export function ShareStrip(props: { parts: readonly StripPart[]; width?: number; label: string }) {
  const width = props.width ?? 160;
  const height = 16;
  const total = props.parts.reduce((s, p) => s + Math.max(0, p.share), 0) || 1;
  const x = scaleLinear().domain([0, total]).range([0, width]);
  let acc = 0;
  const title = props.parts.map((p) => `${p.label} ${Math.round((100 * p.share) / total)}%`).join(', ');
  return (
    <svg class="strip" viewBox={`0 0 ${width} ${height}`} width={width} height={height} role="img" aria-label={`${props.label}: ${title}`}>
      <title>{title}</title>
      {props.parts.map((p) => {
        const x0 = x(acc);
        acc += Math.max(0, p.share);
        const w = x(acc) - x0;
        return (
          <g>
            <rect x={x0} y="0" width={w} height={height} fill={seriesColour(p.colour)} />
            {w > 22 && <text x={x0 + 3} y="12" class="strip-label">{p.label}</text>}
          </g>
        );
      })}
    </svg>
  );
}
