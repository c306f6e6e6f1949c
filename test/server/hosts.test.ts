// The Host check against DNS rebinding (Jackson et al., "Protecting Browsers from DNS Rebinding
// Attacks", ACM CCS 2007): a page on a foreign name that resolves to 127.0.0.1 is same-origin
// for the browser, but its requests still name the foreign host.
import { request } from 'node:http';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { hostName, isAllowedHost, settingsFromEnvironment, startServer } from '../../src/server/index.js';
import { HTML, LOCAL_CSRF, makeApp, postForm, type TestApp } from './helpers.js';

describe('host names a loopback server answers to', () => {
  let t: TestApp;
  beforeAll(() => {
    t = makeApp();
  });
  afterAll(() => t.close());

  it('answers requests addressed to 127.0.0.1, localhost or [::1], with or without a port', async () => {
    for (const host of ['127.0.0.1:4180', '127.0.0.1', 'localhost:4180', 'LocalHost', '[::1]:4180', '[::1]']) {
      expect((await t.app.request('/', { headers: { ...HTML, Host: host } })).status, host).toBe(200);
    }
  });

  it('refuses any other host name with 421 and a plain message, for pages, forms and assets', async () => {
    const hosts = ['evil.example', 'evil.example:4180', '127.0.0.1.evil.example', 'localhost.evil.example', 'localhost.', '10.0.0.5:4180', 'a b', ''];
    for (const host of hosts) {
      const res = await t.app.request('/', { headers: { ...HTML, Host: host } });
      expect(res.status, host).toBe(421);
      expect(await res.text(), host).toMatch(/answers only to addresses of this computer/);
    }
    // The attack itself: a rebound page read the CSRF token and posts with its own, matching Origin.
    const post = await postForm(t, '/studies', { name: 'Planted', _csrf: LOCAL_CSRF }, { Host: 'evil.example:4180', Origin: 'http://evil.example:4180' });
    expect(post.status).toBe(421);
    expect((await t.app.request('/assets/app.css', { headers: { Host: 'evil.example' } })).status).toBe(421);
    const studies = await (await t.app.request('/', { headers: HTML })).text();
    expect(studies).not.toContain('Planted');
  });

  it('also answers to names listed in allowedHosts (a proxy on the same computer)', async () => {
    const proxied = makeApp({ allowedHosts: ['Lab.Example.org'] });
    try {
      expect((await proxied.app.request('/', { headers: { ...HTML, Host: 'lab.example.org' } })).status).toBe(200);
      expect((await proxied.app.request('/', { headers: { ...HTML, Host: 'localhost:4180' } })).status).toBe(200);
      expect((await proxied.app.request('/', { headers: { ...HTML, Host: 'other.example.org' } })).status).toBe(421);
    } finally {
      await proxied.close();
    }
  });
});

/** A raw HTTP request, so the Host header (or its absence, HTTP/1.0) is exactly what we say. */
function rawGet(port: number, host: string | undefined): Promise<{ status: number; body: string }> {
  return new Promise((resolve, reject) => {
    const req = request({ host: '127.0.0.1', port, path: '/', method: 'GET', setHost: false, headers: host === undefined ? {} : { Host: host } }, (res) => {
      let body = '';
      res.setEncoding('utf8');
      res.on('data', (chunk: string) => (body += chunk));
      res.on('end', () => resolve({ status: res.statusCode ?? 0, body }));
    });
    req.on('error', reject);
    req.end();
  });
}

describe('the Host check on a real socket', () => {
  it('refuses a foreign Host with 421 and answers 127.0.0.1 and localhost', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'themata-hosts-'));
    const server = await startServer({ host: '127.0.0.1', port: 0, dataDir: dir });
    try {
      expect((await rawGet(server.port, `evil.example:${server.port}`)).status).toBe(421);
      expect((await rawGet(server.port, `127.0.0.1:${server.port}`)).status).toBe(200);
      expect((await rawGet(server.port, `localhost:${server.port}`)).status).toBe(200);
      // HTTP/1.1 without Host is refused by node:http itself (RFC 9112 §3.2 requires the header).
      expect((await rawGet(server.port, undefined)).status).toBe(400);
    } finally {
      await server.close();
      rmSync(dir, { recursive: true, force: true });
    }
  });
});

describe('host names a server with accounts answers to', () => {
  it('answers any name when bound beyond loopback with no list, and only the listed names with one', async () => {
    const open = makeApp({ loopbackOnly: false });
    const listed = makeApp({ loopbackOnly: false, allowedHosts: ['lab.example.org'] });
    try {
      // 303: sent to sign in, i.e. the request was accepted.
      expect((await open.app.request('/', { headers: { ...HTML, Host: 'anything.example' } })).status).toBe(303);
      expect((await listed.app.request('/', { headers: { ...HTML, Host: 'lab.example.org:443' } })).status).toBe(303);
      const refused = await listed.app.request('/', { headers: { ...HTML, Host: 'evil.example' } });
      expect(refused.status).toBe(421);
      expect(await refused.text()).toMatch(/allowed hosts/);
    } finally {
      await Promise.all([open.close(), listed.close()]);
    }
  });
});

describe('host name parsing', () => {
  it('reads the name of a Host header and refuses malformed ones', () => {
    expect(hostName('LOCALHOST:80')).toBe('localhost');
    expect(hostName('[::1]:4180')).toBe('::1');
    expect(hostName('user@127.0.0.1')).toBeUndefined();
    expect(hostName('127.0.0.1/evil')).toBeUndefined();
    expect(isAllowedHost('127.0.0.2:1', { loopbackOnly: true })).toBe(true);
    // Another spelling of 127.0.0.1 (WHATWG URL Standard, IPv4 parser): an IP literal, nothing to rebind.
    expect(isAllowedHost('0x7f.1', { loopbackOnly: true })).toBe(true);
    expect(isAllowedHost(undefined, { loopbackOnly: true })).toBe(false);
  });

  it('reads THEMATA_SECURE_COOKIES and THEMATA_ALLOWED_HOSTS for themata serve', () => {
    expect(settingsFromEnvironment({})).toEqual({ secureCookies: false, allowedHosts: [] });
    expect(settingsFromEnvironment({ THEMATA_SECURE_COOKIES: '1', THEMATA_ALLOWED_HOSTS: 'lab.example.org, themata.example.org' })).toEqual({
      secureCookies: true,
      allowedHosts: ['lab.example.org', 'themata.example.org'],
    });
  });
});
