// Request rate limits (OWASP ASVS 4.0.3 V11.1.2, V11.1.4): a token bucket per signed-in account or
// per address, with a clock the test moves (no waiting, no timed assertions), and the same limits
// through the workbench's own routes.
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { RequestRateLimiter, requestLimitsFor, startServer } from '../../src/server/index.js';
import { createAccount } from '../../src/store/index.js';
import { HTML, LOCAL_CSRF, makeApp, postForm } from './helpers.js';

function clock() {
  let t = 5_000_000;
  return { now: () => t, advance: (ms: number) => (t += ms) };
}

describe('request rate limiter', () => {
  it('allows a burst of 120 requests, then 20 a second, each account on its own (common practice numbers)', () => {
    const c = clock();
    const limiter = new RequestRateLimiter({ now: c.now });
    for (let i = 0; i < 120; i++) expect(limiter.take('account:1', false).allowed, `request ${i + 1}`).toBe(true);
    expect(limiter.take('account:1', false)).toEqual({ allowed: false, retryAfterSeconds: 1 });
    expect(limiter.take('account:2', false).allowed).toBe(true);
    c.advance(1000);
    let allowed = 0;
    while (limiter.take('account:1', false).allowed) allowed++;
    expect(allowed).toBe(20);
    // Sixty seconds at a person's pace (two requests a second) are never refused.
    c.advance(10_000);
    for (let s = 0; s < 60; s++) {
      expect(limiter.take('account:1', false).allowed).toBe(true);
      expect(limiter.take('account:1', false).allowed).toBe(true);
      c.advance(1000);
    }
  });

  it('holds form posts to a smaller bucket: 30 at once, then 5 a second', () => {
    const c = clock();
    const limiter = new RequestRateLimiter({ now: c.now });
    for (let i = 0; i < 30; i++) expect(limiter.take('address:10.0.0.1', true).allowed).toBe(true);
    expect(limiter.take('address:10.0.0.1', true)).toEqual({ allowed: false, retryAfterSeconds: 1 });
    // Pages can still be read while posts wait.
    expect(limiter.take('address:10.0.0.1', false).allowed).toBe(true);
    c.advance(1000);
    let posts = 0;
    while (limiter.take('address:10.0.0.1', true).allowed) posts++;
    expect(posts).toBe(5);
  });

  it('scales every limit from one number as --requests-per-second does, 20 giving the defaults', () => {
    expect(requestLimitsFor(20)).toEqual({ perSecond: 20, burst: 120, postsPerSecond: 5, postBurst: 30 });
    const c = clock();
    const slow = new RequestRateLimiter({ ...requestLimitsFor(1), now: c.now });
    const verdicts = Array.from({ length: 7 }, () => slow.take('address:x', false).allowed);
    expect(verdicts).toEqual([true, true, true, true, true, true, false]);
  });

  it('keeps at most maxKeys buckets, so a flood of addresses cannot fill memory', () => {
    const limiter = new RequestRateLimiter({ maxKeys: 100 });
    for (let i = 0; i < 5000; i++) limiter.take(`address:10.${i >> 8}.${i & 255}.1`, i % 2 === 0);
    expect(limiter.size).toBeLessThanOrEqual(100);
  });
});

describe('request rate limits in the workbench', () => {
  it('answers 429 with a plain page and Retry-After beyond the limit, and still serves static assets', async () => {
    const c = clock();
    const t = makeApp({ requestLimiter: new RequestRateLimiter({ burst: 3, perSecond: 1, now: c.now }) });
    try {
      for (let i = 0; i < 3; i++) expect((await t.app.request('/', { headers: HTML })).status).toBe(200);
      const refused = await t.app.request('/', { headers: HTML });
      expect(refused.status).toBe(429);
      expect(refused.headers.get('Retry-After')).toBe('1');
      expect(refused.headers.get('Content-Type')).toMatch(/^text\/html/);
      const body = await refused.text();
      expect(body).toContain('Too many requests in a short time from this computer. Wait 1 second and try again');
      expect(body).not.toMatch(/<script/);
      // htmx requests get the message as text, to show in place.
      const fragment = await t.app.request('/', { headers: { ...HTML, 'HX-Request': 'true' } });
      expect(fragment.status).toBe(429);
      expect(await fragment.text()).toMatch(/^Too many requests/);
      expect((await t.app.request('/assets/app.css')).status).toBe(200);
      c.advance(1000);
      expect((await t.app.request('/', { headers: HTML })).status).toBe(200);
    } finally {
      await t.close();
    }
  });

  it('stops a flood of form posts before the form is read, while pages still load', async () => {
    const c = clock();
    const t = makeApp({ requestLimiter: new RequestRateLimiter({ postBurst: 2, postsPerSecond: 0.01, now: c.now }) });
    try {
      expect((await postForm(t, '/studies', { _csrf: LOCAL_CSRF, name: 'First' })).status).toBe(303);
      expect((await postForm(t, '/studies', { _csrf: LOCAL_CSRF, name: 'Second' })).status).toBe(303);
      const refused = await postForm(t, '/studies', { _csrf: LOCAL_CSRF, name: 'Third' });
      expect(refused.status).toBe(429);
      expect(Number(refused.headers.get('Retry-After'))).toBeGreaterThan(1);
      const page = await (await t.app.request('/', { headers: HTML })).text();
      expect(page).toContain('Second');
      expect(page).not.toContain('Third');
    } finally {
      await t.close();
    }
  });

  it('counts each signed-in account on its own, and the sign-in page by address', async () => {
    const c = clock();
    const t = makeApp({ loopbackOnly: false, requestLimiter: new RequestRateLimiter({ burst: 4, perSecond: 0.01, now: c.now }) });
    try {
      createAccount(t.store, 'ana', 'ana has a long password');
      createAccount(t.store, 'ben', 'ben has a long password');
      const cookie = async (name: string) => {
        const res = await postForm(t, '/login', { name, password: `${name} has a long password`, next: '/' });
        expect(res.status).toBe(303);
        return { Cookie: `themata_session=${/themata_session=([^;]+)/.exec(res.headers.get('Set-Cookie') ?? '')![1]}` };
      };
      const ana = await cookie('ana'); // the address has used 1 of its 4
      const ben = await cookie('ben'); // 2 of 4
      for (let i = 0; i < 4; i++) expect((await t.app.request('/', { headers: { ...HTML, ...ana } })).status).toBe(200);
      const anaRefused = await t.app.request('/', { headers: { ...HTML, ...ana } });
      expect(anaRefused.status).toBe(429);
      expect(await anaRefused.text()).toContain('from this account');
      for (let i = 0; i < 4; i++) expect((await t.app.request('/', { headers: { ...HTML, ...ben } })).status).toBe(200);
      expect((await t.app.request('/login', { headers: HTML })).status).toBe(200); // 3 of 4
      expect((await t.app.request('/login', { headers: HTML })).status).toBe(200); // 4 of 4
      const loginRefused = await t.app.request('/login', { headers: HTML });
      expect(loginRefused.status).toBe(429);
      expect(await loginRefused.text()).toContain('from this computer');
    } finally {
      await t.close();
    }
  });

  it('has the limits on in a started server, and lets startServer set them', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'themata-limits-'));
    const server = await startServer({ host: '127.0.0.1', port: 0, dataDir: dir, requestLimits: { burst: 2, perSecond: 0.01 } });
    try {
      const statuses: number[] = [];
      for (let i = 0; i < 3; i++) {
        const res = await fetch(new URL('/', server.url), { headers: HTML });
        statuses.push(res.status);
        await res.body?.cancel();
      }
      expect(statuses).toEqual([200, 200, 429]);
    } finally {
      await server.close();
      rmSync(dir, { recursive: true, force: true });
    }
  });
});
