import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { HTML, LOCAL_CSRF, makeApp, postForm, type TestApp } from './helpers.js';

let t: TestApp;
beforeEach(() => {
  t = makeApp();
});
afterEach(() => t.close());

describe('response headers and assets', () => {
  it('sends a content security policy that forbids inline script and framing', async () => {
    const res = await t.app.request('/', { headers: HTML });
    expect(res.status).toBe(200);
    const csp = res.headers.get('Content-Security-Policy') ?? '';
    // OWASP ASVS 4.0.3 V14.4.3: a CSP that limits script sources.
    expect(csp).toMatch(/script-src 'self'(;|$)/);
    expect(csp).not.toContain('unsafe-inline');
    expect(csp).toContain("frame-ancestors 'none'");
    expect(res.headers.get('X-Frame-Options')).toBe('DENY');
    expect(res.headers.get('X-Content-Type-Options')).toBe('nosniff');
  });

  it('serves a doctype, htmx configured without injected styles, and no inline script', async () => {
    const html = await (await t.app.request('/', { headers: HTML })).text();
    expect(html.startsWith('<!DOCTYPE html>')).toBe(true);
    expect(html).toContain('&quot;includeIndicatorStyles&quot;:false');
    const scripts = [...html.matchAll(/<script([^>]*)>([\s\S]*?)<\/script>/g)];
    expect(scripts.length).toBeGreaterThan(0);
    for (const [, attrs, body] of scripts) {
      expect(attrs).toMatch(/src="\/assets\//);
      expect(body.trim()).toBe('');
    }
    expect(html).not.toMatch(/\sstyle=/);
    expect(html).not.toMatch(/https?:\/\/(?!www\.w3\.org)/);
  });

  it('serves htmx and its SSE extension from this server, and nothing for unknown asset names', async () => {
    const htmx = await t.app.request('/assets/htmx.min.js');
    expect(htmx.status).toBe(200);
    expect(await htmx.text()).toContain('htmx');
    const sse = await t.app.request('/assets/htmx-sse.js');
    expect(await sse.text()).toContain("defineExtension('sse'");
    expect((await t.app.request('/assets/..%2Fpackage.json')).status).toBe(404);
    expect((await t.app.request('/assets/app.css')).headers.get('Content-Type')).toContain('text/css');
  });

  it('refuses state-changing requests without the CSRF token or from another origin', async () => {
    expect((await postForm(t, '/studies', { name: 'No token' })).status).toBe(403);
    expect((await postForm(t, '/studies', { name: 'Wrong', _csrf: 'nope' })).status).toBe(403);
    const cross = await postForm(t, '/studies', { name: 'Cross', _csrf: LOCAL_CSRF }, { Origin: 'https://evil.example', Host: 'localhost' });
    expect(cross.status).toBe(403);
    const ok = await postForm(t, '/studies', { name: 'Fine', _csrf: LOCAL_CSRF });
    expect(ok.status).toBe(303);
    const viaHeader = await postForm(t, '/studies', { name: 'Header' }, { 'X-CSRF-Token': LOCAL_CSRF });
    expect(viaHeader.status).toBe(303);
  });

  it('refuses uploads over the size limit with a clear message', async () => {
    const small = makeApp({ uploadLimitBytes: 1024 });
    try {
      const form = new FormData();
      form.append('_csrf', LOCAL_CSRF);
      form.append('file', new File(['x'.repeat(200_000)], 'big.csv'));
      const res = await small.app.request('/studies/1/data/upload', { method: 'POST', body: form });
      expect(res.status).toBe(413);
      expect(await res.text()).toMatch(/larger than the limit/);
    } finally {
      await small.close();
    }
  });
});
