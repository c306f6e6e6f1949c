import { describe, expect, it } from 'vitest';
import { Histogram, IntervalChart, LineChart, OKABE_ITO, SERIES_COLOURS, ShareStrip } from '../../views/charts/index.js';

async function html(node: { toString(): string | Promise<string> }): Promise<string> {
  return await node.toString();
}

describe('server-rendered charts', () => {
  it('uses the Okabe–Ito palette only', () => {
    // Okabe & Ito, "Color Universal Design" (2008): the eight published colours.
    const published = ['#000000', '#E69F00', '#56B4E9', '#009E73', '#F0E442', '#0072B2', '#D55E00', '#CC79A7'];
    expect(Object.values(OKABE_ITO).sort()).toEqual([...published].sort());
    for (const c of SERIES_COLOURS) expect(published).toContain(c);
  });

  it('draws a line chart with d3 ticks and keeps its numbers one click away', async () => {
    const out = await html(<LineChart caption="Trace" xLabel="Sweep" yLabel="LL" series={[{ name: 'll', points: [[1, -9], [2, -8.5], [3, -8.25]] }]} />);
    expect(out).toContain('<svg');
    expect(out).toMatch(/<path d="M[^"]+L[^"]+"/);
    expect(out).toContain('<details class="numbers">');
    expect(out).toContain('-8.25');
    // Ticks and their labels come from d3-scale (nice steps, d3-format's minus sign U+2212).
    expect(out).toMatch(/>−9\.0<\/text>/);
    expect(out).toMatch(/>−8\.4<\/text>/);
  });

  it('draws intervals around points, crossing zero for differences', async () => {
    const out = await html(<IntervalChart caption="Diff" valueLabel="Difference" mark="point" percent rows={[{ label: 'A', value: 0.05, low: -0.01, high: 0.1 }]} />);
    expect(out).toContain('<circle');
    expect(out).toContain('class="zero"');
    expect(out).toContain('<td>5.0%</td>');
    expect(out).toContain('-1.0%');
  });

  it('escapes labels: a label with markup is text, not markup', async () => {
    const evil = '<img src=x onerror=alert(1)>';
    const out = await html(
      <>
        <IntervalChart caption={evil} valueLabel="v" rows={[{ label: evil, value: 1 }]} />
        <ShareStrip label={evil} parts={[{ label: evil, share: 1, colour: 0 }]} />
        <Histogram caption="c" xLabel={evil} bins={[{ x0: 0, x1: 1, count: 3 }]} />
      </>,
    );
    expect(out).not.toContain('<img');
    expect(out).toContain('&lt;img');
  });
});
