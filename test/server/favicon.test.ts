// Every page asks for /favicon.ico: it is served (a real ICO, no sign-in needed) and linked
// from the page frame with its SVG twin, so no request ends in a 404 (issue 14).
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { faviconIco } from '../../src/server/favicon.js';
import { HTML, makeApp, type TestApp } from './helpers.js';

let t: TestApp;
beforeAll(() => {
  t = makeApp({ loopbackOnly: false });
});
afterAll(() => t.close());

describe('the favicon', () => {
  it('answers /favicon.ico with an ICO image even before signing in', async () => {
    const res = await t.app.request('/favicon.ico');
    expect(res.status).toBe(200);
    expect(res.headers.get('Content-Type')).toBe('image/x-icon');
    const bytes = new Uint8Array(await res.arrayBuffer());
    const v = new DataView(bytes.buffer);
    // ICONDIR: reserved 0, type 1 (icon), one image of 16×16 at 32 bits, its data right after.
    expect([v.getUint16(0, true), v.getUint16(2, true), v.getUint16(4, true)]).toEqual([0, 1, 1]);
    expect([bytes[6], bytes[7], v.getUint16(12, true)]).toEqual([16, 16, 32]);
    expect(v.getUint32(14, true) + v.getUint32(18, true)).toBe(bytes.length);
  });

  it('draws the blue square with a white T and transparent corners', () => {
    const ico = faviconIco();
    const at = (x: number, y: number) => Array.from(ico.subarray(22 + 40 + ((15 - y) * 16 + x) * 4, 22 + 40 + ((15 - y) * 16 + x) * 4 + 4));
    expect(at(0, 0)).toEqual([0, 0, 0, 0]);
    expect(at(2, 8)).toEqual([0xb2, 0x72, 0x00, 0xff]);
    expect(at(7, 8)).toEqual([0xff, 0xff, 0xff, 0xff]);
  });

  it('serves the SVG icon and links both from every page', async () => {
    const svg = await t.app.request('/assets/favicon.svg');
    expect(svg.status).toBe(200);
    expect(svg.headers.get('Content-Type')).toBe('image/svg+xml');
    expect(await svg.text()).toContain('<svg');
    const login = await (await t.app.request('/login', { headers: HTML })).text();
    expect(login).toContain('<link rel="icon" href="/favicon.ico"');
    expect(login).toContain('<link rel="icon" href="/assets/favicon.svg" type="image/svg+xml"');
  });
});
