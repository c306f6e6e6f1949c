// `themata serve --secure-cookies / --no-secure-cookies / --allowed-hosts / --requests-per-second`
// in the production start path (bin/themata.mjs in its own process): each flag does what its help
// says and wins over its environment variable, which keeps working without the flag.
import { spawn, type ChildProcess } from 'node:child_process';
import { request } from 'node:http';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createAccount, openStore } from '../../src/store/index.js';
import { cli } from './cli-harness.js';

const bin = join(import.meta.dirname, '..', '..', 'bin', 'themata.mjs');
const PASSWORD = 'a long invented password';
let dir: string;
const children: ChildProcess[] = [];

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'themata-serve-flags-'));
  const store = openStore(dir);
  createAccount(store, 'ana', PASSWORD);
  store.close();
});

afterAll(async () => {
  await Promise.all(
    children.filter((c) => c.exitCode === null).map((c) => new Promise<void>((resolve) => {
      c.once('exit', () => resolve());
      c.kill('SIGTERM');
    })),
  );
  rmSync(dir, { recursive: true, force: true });
});

/** Start `themata serve` on a free port (port 0 is not accepted by every path, so ask the kernel). */
async function serve(args: string[], env: Record<string, string>): Promise<number> {
  const child = spawn(process.execPath, [bin, '--data', dir, 'serve', '--port', '0', ...args], {
    stdio: ['ignore', 'pipe', 'pipe'],
    env: { ...process.env, THEMATA_SECURE_COOKIES: '', THEMATA_ALLOWED_HOSTS: '', ...env },
  });
  children.push(child);
  return new Promise((resolve, reject) => {
    let text = '';
    const onData = (chunk: Buffer) => {
      text += chunk.toString();
      const m = text.match(/serving at http:\/\/127\.0\.0\.1:(\d+)\//);
      if (m) resolve(Number(m[1]));
    };
    child.stdout!.on('data', onData);
    child.stderr!.on('data', onData);
    child.once('exit', (code) => reject(new Error(`themata serve stopped (exit ${code}): ${text}`)));
  });
}

function send(port: number, host: string, method = 'GET', body?: string): Promise<{ status: number; cookie: string }> {
  return new Promise((resolve, reject) => {
    const headers: Record<string, string> = { Host: host };
    if (body !== undefined) headers['Content-Type'] = 'application/x-www-form-urlencoded';
    const req = request({ host: '127.0.0.1', port, path: '/login', method, setHost: false, headers }, (res) => {
      res.resume();
      res.on('end', () => resolve({ status: res.statusCode ?? 0, cookie: String(res.headers['set-cookie'] ?? '') }));
    });
    req.on('error', reject);
    req.end(body);
  });
}

const signIn = new URLSearchParams({ name: 'ana', password: PASSWORD, next: '/' }).toString();

describe('themata serve flags', () => {
  it('describes --secure-cookies, --allowed-hosts and --requests-per-second in its help', async () => {
    const r = await cli(['serve', '--help']);
    expect(r.code).toBe(0);
    const help = r.stdout.replace(/\s+/g, ' '); // commander wraps lines to the terminal width
    expect(help).toContain('--secure-cookies behind a TLS proxy: send the session cookie over HTTPS only, as __Host-themata_session (overrides THEMATA_SECURE_COOKIES)');
    expect(help).toContain('--allowed-hosts <names> host names the server answers to besides its own, separated by commas');
    expect(help).toContain('(overrides THEMATA_ALLOWED_HOSTS)');
    expect(help).toContain('--requests-per-second <n> requests a second each account (or address, when not signed in) may make');
    expect(help).toContain('themata serve --host 127.0.0.1 --secure-cookies --allowed-hosts themata.lab.example.org');
  });

  it('refuses a request rate that is not a number of at least one, with a clear message', async () => {
    const r = await cli(['--data', dir, 'serve', '--requests-per-second', 'lots']);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('--requests-per-second needs a number of at least 1 (got "lots").');
  });

  it('takes the flags over the environment variables: secure cookie, listed host names, request rate', async () => {
    const port = await serve(['--secure-cookies', '--allowed-hosts', 'lab.example.org, stats.example.org', '--requests-per-second', '1'], {
      THEMATA_ALLOWED_HOSTS: 'other.example.org',
    });
    expect((await send(port, 'other.example.org')).status).toBe(421);
    expect((await send(port, 'stats.example.org:443')).status).toBe(200);
    const login = await send(port, 'lab.example.org', 'POST', signIn);
    expect(login.status).toBe(303);
    expect(login.cookie).toMatch(/^__Host-themata_session=[^;]+;.*Secure/);
    // --requests-per-second 1: bursts of six from one address, one more a second; twenty at once
    // are more than any refill in the time they take.
    const statuses = await Promise.all(Array.from({ length: 20 }, () => send(port, 'lab.example.org').then((r) => r.status)));
    expect(statuses).toContain(429);
    expect(statuses.filter((s) => s === 200).length).toBeLessThan(20);
  });

  it('keeps reading the environment without flags, and --no-secure-cookies turns the secure cookie off', async () => {
    const port = await serve(['--no-secure-cookies'], { THEMATA_SECURE_COOKIES: '1', THEMATA_ALLOWED_HOSTS: 'lab.example.org' });
    expect((await send(port, 'lab.example.org')).status).toBe(200);
    expect((await send(port, 'elsewhere.example.org')).status).toBe(421);
    const login = await send(port, 'lab.example.org', 'POST', signIn);
    expect(login.status).toBe(303);
    expect(login.cookie).toMatch(/^themata_session=/);
    expect(login.cookie).not.toMatch(/Secure/i);
    const withEnv = await serve([], { THEMATA_SECURE_COOKIES: '1' });
    expect((await send(withEnv, '127.0.0.1')).status).toBe(200);
    expect((await send(withEnv, '127.0.0.1', 'POST', signIn)).cookie).toMatch(/^__Host-themata_session=[^;]+;.*Secure/);
  });
});
