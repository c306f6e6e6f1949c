// OWASP ASVS 4.0.3 V9.1.1–V9.1.3: Themata serving HTTPS itself, for operators without a TLS
// proxy. A real server on an ephemeral loopback port (startServer({ tls }) in process, and
// `themata serve --tls-cert --tls-key` in its own process), reached with node:https and node:tls
// trusting only the test certificate in test/fixtures/tls/ (made for these tests; never to serve).
import { spawn, type ChildProcess } from 'node:child_process';
import { generateKeyPairSync } from 'node:crypto';
import { readFileSync, writeFileSync } from 'node:fs';
import { request as httpRequest, type IncomingHttpHeaders } from 'node:http';
import { request as httpsRequest } from 'node:https';
import { join } from 'node:path';
import { connect as tlsConnect, createServer as createTlsServer, type ConnectionOptions, type SecureVersion, type TLSSocket } from 'node:tls';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startServer, type RunningServer } from '../../src/server/index.js';
import { createAccount, openStore } from '../../src/store/index.js';
import { cli } from '../cli/cli-harness.js';
import { HTML, makeApp } from '../server/helpers.js';
import { tempFolder } from './server-process.js';

const FIXTURES = join(import.meta.dirname, '..', 'fixtures', 'tls');
const CERT_FILE = join(FIXTURES, 'cert.pem');
const KEY_FILE = join(FIXTURES, 'key.pem');
const CERT = readFileSync(CERT_FILE);
const KEY = readFileSync(KEY_FILE);
const BIN = join(import.meta.dirname, '..', '..', 'bin', 'themata.mjs');
const PASSWORD = 'a long invented password';

interface Reply {
  status: number;
  headers: IncomingHttpHeaders;
  body: string;
  /** The TLS version the connection used. */
  protocol: string | null;
  /** The cipher suite's IANA name. */
  cipher: string;
}

/** One HTTPS request to 127.0.0.1:port from a client that trusts only the test certificate. */
function overTls(port: number, path: string, options: { method?: string; form?: string; tls?: { maxVersion?: SecureVersion } } = {}): Promise<Reply> {
  return new Promise((resolve, reject) => {
    const headers: Record<string, string> = { Accept: 'text/html' };
    if (options.form !== undefined) headers['Content-Type'] = 'application/x-www-form-urlencoded';
    const req = httpsRequest(
      { host: '127.0.0.1', port, path, method: options.method ?? 'GET', headers, ca: CERT, agent: false, ...options.tls },
      (res) => {
        const socket = res.socket as TLSSocket;
        const protocol = socket.getProtocol();
        const cipher = socket.getCipher().standardName;
        let body = '';
        res.setEncoding('utf8');
        res.on('data', (chunk: string) => (body += chunk));
        res.on('end', () => resolve({ status: res.statusCode ?? 0, headers: res.headers, body, protocol, cipher }));
      },
    );
    req.on('error', reject);
    req.end(options.form);
  });
}

/** A bare TLS handshake with the given client settings: the version agreed, or the error. */
function handshake(port: number, options: ConnectionOptions): Promise<{ protocol: string | null } | { error: NodeJS.ErrnoException }> {
  return new Promise((resolve) => {
    const socket = tlsConnect({ host: '127.0.0.1', port, ca: CERT, ...options }, () => {
      const protocol = socket.getProtocol();
      socket.end();
      resolve({ protocol });
    });
    socket.on('error', (error: NodeJS.ErrnoException) => resolve({ error }));
  });
}

/** A client that can speak TLS 1.0 and 1.1 only (OpenSSL 3 needs security level 0 for them). */
const OLD_CLIENT: ConnectionOptions = { minVersion: 'TLSv1', maxVersion: 'TLSv1.1', ciphers: 'DEFAULT:@SECLEVEL=0' };

const signIn = new URLSearchParams({ name: 'ana', password: PASSWORD, next: '/' }).toString();

describe('HTTPS served by Themata itself (ASVS V9.1)', () => {
  const folder = tempFolder('themata-tls-');
  let running: RunningServer;
  let port = 0;

  beforeAll(async () => {
    const store = openStore(folder.dir);
    createAccount(store, 'ana', PASSWORD);
    store.close();
    running = await startServer({ host: '127.0.0.1', port: 0, dataDir: folder.dir, allowedHosts: [], tls: { cert: CERT, key: KEY } });
    port = running.port;
  });

  afterAll(async () => {
    await running?.close();
    folder.cleanup();
  });

  it('V9.1.1: serves the sign-in page over TLS 1.2 or 1.3 to a client that trusts the certificate, at an https address', async () => {
    expect(running.url).toBe(`https://127.0.0.1:${port}/`);
    expect(running.certificateValidTo?.toISOString().slice(0, 10)).toBe('2126-11-08');
    const page = await overTls(port, '/login');
    expect(page.status).toBe(200);
    expect(page.body).toContain('name="password"');
    expect(['TLSv1.2', 'TLSv1.3']).toContain(page.protocol);
  });

  it('V3.4.1, V3.4.4, V9.1.1: over TLS the session cookie is Secure and named with the __Host- prefix, without being asked for', async () => {
    const reply = await overTls(port, '/login', { method: 'POST', form: signIn });
    expect(reply.status).toBe(303);
    const cookie = String(reply.headers['set-cookie'] ?? '');
    expect(cookie).toMatch(/^__Host-themata_session=[^;]+;/);
    expect(cookie).toMatch(/;\s*Secure/i);
    expect(cookie).toMatch(/;\s*HttpOnly/i);
  });

  it('V14.4.5: HTTPS responses carry Strict-Transport-Security for a year, plain HTTP responses none', async () => {
    for (const path of ['/login', '/assets/app.css', '/nowhere']) {
      expect((await overTls(port, path)).headers['strict-transport-security'], path).toBe('max-age=31536000');
    }
    // RFC 6797 §7.2: never over plain HTTP. Behind a TLS proxy (secure cookies on) the browser
    // does receive the response over HTTPS, so there it is sent.
    const plain = makeApp({ loopbackOnly: false });
    const proxied = makeApp({ loopbackOnly: false, secureCookies: true });
    try {
      expect((await plain.app.request('/login', { headers: HTML })).headers.get('Strict-Transport-Security')).toBeNull();
      expect((await proxied.app.request('/login', { headers: HTML })).headers.get('Strict-Transport-Security')).toBe('max-age=31536000');
    } finally {
      await plain.close();
      await proxied.close();
    }
  });

  it('V9.1.2, V9.1.3: refuses a client limited to TLS 1.1, and agrees a forward-secret AEAD suite with a TLS 1.2 client', async () => {
    // The same old client does connect to a server that allows TLS 1.1, so the refusal below is
    // Themata's, not a limit of the client or of this machine's OpenSSL.
    const lenient = createTlsServer({ cert: CERT, key: KEY, minVersion: 'TLSv1', ciphers: 'DEFAULT:@SECLEVEL=0' }, (s) => s.end());
    await new Promise<void>((resolve) => lenient.listen(0, '127.0.0.1', resolve));
    try {
      const control = await handshake((lenient.address() as { port: number }).port, OLD_CLIENT);
      expect(control).toEqual({ protocol: 'TLSv1.1' });
    } finally {
      await new Promise<void>((resolve) => lenient.close(() => resolve()));
    }
    const old = await handshake(port, OLD_CLIENT);
    expect('error' in old ? old.error.code : old).toMatch(/PROTOCOL_VERSION|UNSUPPORTED_PROTOCOL/);

    const tls12 = await overTls(port, '/login', { tls: { maxVersion: 'TLSv1.2' } });
    expect(tls12.status).toBe(200);
    expect(tls12.protocol).toBe('TLSv1.2');
    expect(tls12.cipher).toMatch(/^TLS_ECDHE_(RSA|ECDSA)_WITH_(AES_(128|256)_GCM|CHACHA20_POLY1305)_SHA(256|384)?$/);
  });

  it('V9.1.1: a plain HTTP request to the HTTPS port gets no page', async () => {
    const outcome = await new Promise<{ status?: number; body?: string; error?: string }>((resolve) => {
      const req = httpRequest({ host: '127.0.0.1', port, path: '/login', headers: { Accept: 'text/html' }, agent: false }, (res) => {
        let body = '';
        res.setEncoding('utf8');
        res.on('data', (chunk: string) => (body += chunk));
        res.on('end', () => resolve({ status: res.statusCode, body }));
      });
      req.setTimeout(10_000, () => req.destroy(new Error('timed out')));
      req.on('error', (e) => resolve({ error: e.message }));
      req.end();
    });
    expect(outcome.status).not.toBe(200);
    expect(outcome.body ?? '').not.toContain('name="password"');
  });
});

describe('themata serve --tls-cert / --tls-key', () => {
  const folder = tempFolder('themata-tls-cli-');
  let child: ChildProcess | undefined;

  beforeAll(() => {
    const store = openStore(folder.dir);
    createAccount(store, 'ana', PASSWORD);
    store.close();
  });

  afterAll(async () => {
    if (child && child.exitCode === null && child.signalCode === null) {
      const gone = new Promise<void>((resolve) => child!.once('exit', () => resolve()));
      child.kill('SIGTERM');
      await gone;
    }
    folder.cleanup();
  });

  it('refuses a certificate without its key, or a key without its certificate, with exit code 2 and a clear message', async () => {
    const noKey = await cli(['--data', folder.dir, 'serve', '--port', '0', '--tls-cert', CERT_FILE]);
    expect(noKey.code).toBe(2);
    expect(noKey.stderr).toContain('--tls-cert needs --tls-key as well: give both the certificate file and its private key file (PEM), or neither to serve plain HTTP.');
    const noCert = await cli(['--data', folder.dir, 'serve', '--port', '0', '--tls-key', KEY_FILE]);
    expect(noCert.code).toBe(2);
    expect(noCert.stderr).toContain('--tls-key needs --tls-cert as well');
  });

  it('refuses --no-secure-cookies with --tls-cert, since over HTTPS the session cookie is always Secure', async () => {
    const r = await cli(['--data', folder.dir, 'serve', '--port', '0', '--tls-cert', CERT_FILE, '--tls-key', KEY_FILE, '--no-secure-cookies']);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('--no-secure-cookies cannot be used with --tls-cert: over HTTPS the session cookie is always Secure.');
  });

  it('refuses an unreadable file, swapped files and a key that does not belong to the certificate, with exit code 2', async () => {
    const missing = join(folder.dir, 'no-such-cert.pem');
    const unreadable = await cli(['--data', folder.dir, 'serve', '--port', '0', '--tls-cert', missing, '--tls-key', KEY_FILE]);
    expect(unreadable.code).toBe(2);
    expect(unreadable.stderr).toContain(`Cannot read the TLS certificate file "${missing}" given with --tls-cert (there is no such file).`);

    const swapped = await cli(['--data', folder.dir, 'serve', '--port', '0', '--tls-cert', KEY_FILE, '--tls-key', CERT_FILE]);
    expect(swapped.code).toBe(2);
    expect(swapped.stderr).toContain(`The TLS certificate file "${KEY_FILE}" does not hold a PEM certificate`);

    const otherKey = join(folder.dir, 'other-key.pem');
    const { privateKey } = generateKeyPairSync('rsa', { modulusLength: 2048 });
    writeFileSync(otherKey, privateKey.export({ type: 'pkcs8', format: 'pem' }));
    const mismatched = await cli(['--data', folder.dir, 'serve', '--port', '0', '--tls-cert', CERT_FILE, '--tls-key', otherKey]);
    expect(mismatched.code).toBe(2);
    expect(mismatched.stderr).toContain(`The TLS key file "${otherKey}" does not belong to the certificate: give the private key the certificate was made for.`);
  });

  it('serves HTTPS from the command line: the start line says https and when the certificate expires, and the page loads over TLS', async () => {
    const env: NodeJS.ProcessEnv = { ...process.env, THEMATA_SECURE_COOKIES: '', THEMATA_ALLOWED_HOSTS: '' };
    delete env.THEMATA_DATA;
    const started = spawn(process.execPath, [BIN, '--data', folder.dir, 'serve', '--port', '0', '--tls-cert', CERT_FILE, '--tls-key', KEY_FILE], {
      stdio: ['ignore', 'pipe', 'pipe'],
      env,
    });
    child = started;
    const { port, text } = await new Promise<{ port: number; text: string }>((resolve, reject) => {
      let text = '';
      const onData = (chunk: Buffer) => {
        text += chunk.toString();
        const m = /serving at https:\/\/127\.0\.0\.1:(\d+)\/[\s\S]*valid until/.exec(text);
        if (m) resolve({ port: Number(m[1]), text });
      };
      started.stdout!.on('data', onData);
      started.stderr!.on('data', onData);
      started.once('exit', (code) => reject(new Error(`themata serve stopped (exit ${code}): ${text}`)));
    });
    expect(text).toContain('The TLS certificate is valid until 2126-11-08. Themata does not renew it');
    const page = await overTls(port, '/login');
    expect(page.status).toBe(200);
    expect(page.headers['strict-transport-security']).toBe('max-age=31536000');
    expect(['TLSv1.2', 'TLSv1.3']).toContain(page.protocol);
  });
});
