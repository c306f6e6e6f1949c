// Signed saved-run bundles (OWASP ASVS 4.0.3 V5.5.1, integrity of serialised objects): HMAC-SHA256
// over the payload's exact bytes with a key made once per data folder. The four cases: signed here,
// edited, signed by another installation, unsigned from an older Themata. Invented numbers.
import { mkdtempSync, readFileSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { gunzipSync, gzipSync } from 'node:zlib';
import { afterAll, describe, expect, it } from 'vitest';
import { BUNDLE_KEY_FILE, installationKey } from '../../src/platform/index.js';
import { encodeBundle, openBundle, UntrustedBundleError, type RunBundle } from '../../src/services/bundle.js';
import { InputError } from '../../src/text/types.js';

const dirs: string[] = [];
function dataFolder(): string {
  const dir = mkdtempSync(join(tmpdir(), 'themata-bundle-key-'));
  dirs.push(dir);
  return dir;
}
afterAll(() => {
  for (const d of dirs) rmSync(d, { recursive: true, force: true });
});

const bundle: RunBundle = {
  format: 'themata-run',
  version: 1,
  createdAt: '2026-01-01T00:00:00.000Z',
  study: 'Invented study',
  run: 'k2',
  K: 2,
  labels: ['Opening hours', 'Staff'],
  languages: ['en'],
  vocabularies: [{ stems: ['open', 'hour', 'staff', 'kind'], surfaces: ['open', 'hours', 'staff', 'kind'] }],
  phi: [Float64Array.of(0.4, 0.05, 0.4, 0.05, 0.1, 0.45, 0.1, 0.45)],
  lambda: Float64Array.of(-2.3, -2.3),
  encoding: null,
  beta: Float64Array.of(0.01),
  pipeline: { stemming: true, foldDiacritics: false, minCount: 2, maxDocShare: 0.5, collocationNpmi: null, collocationMinCount: 5, extraStopWords: {}, minTokens: 1 },
  mapping: { text: ['answer'], covariates: [] },
  settings: {},
};

/** What `themata export` wrote before bundles were signed: the content alone, gzip JSON version 1. */
function unsignedOldBundle(): Uint8Array {
  const b64 = (a: Float64Array) => Buffer.from(a.buffer).toString('base64');
  return gzipSync(JSON.stringify({ ...bundle, phi: bundle.phi.map(b64), lambda: b64(bundle.lambda), beta: b64(bundle.beta) }));
}

describe('the installation key', () => {
  it('is made once per data folder, 32 random bytes readable by its owner only, and differs between folders', () => {
    const dir = dataFolder();
    const key = installationKey(dir);
    expect(key).toHaveLength(32);
    expect(installationKey(dir)).toEqual(key);
    expect(statSync(join(dir, BUNDLE_KEY_FILE)).mode & 0o777).toBe(0o600);
    expect(new Uint8Array(readFileSync(join(dir, BUNDLE_KEY_FILE)))).toEqual(key);
    expect(installationKey(dataFolder())).not.toEqual(key);
  });
});

describe('signed saved-run bundles (V5.5.1)', () => {
  const here = installationKey(dataFolder());
  const elsewhere = installationKey(dataFolder());

  it('accepts a bundle signed by this installation, bit for bit', () => {
    const { bundle: back, origin } = openBundle(encodeBundle(bundle, here), { key: here, fileName: 'k2.themata-run' });
    expect(origin).toBe('this installation');
    expect(back.labels).toEqual(['Opening hours', 'Staff']);
    expect([...back.phi[0]]).toEqual([...bundle.phi[0]]);
  });

  it('refuses an edited bundle with a clear message, even when the person trusts it', () => {
    const envelope = JSON.parse(gunzipSync(encodeBundle(bundle, here)).toString('utf8'));
    envelope.payload = envelope.payload.replace('Opening hours', 'Parking');
    const edited = gzipSync(JSON.stringify(envelope));
    for (const trust of [false, true]) {
      expect(() => openBundle(edited, { key: here, trust, fileName: 'k2.themata-run' })).toThrow(
        'k2.themata-run was changed after this Themata installation saved it (its signature does not match), so it is not used. Export the run again from its study.',
      );
    }
    // A signature taken from another file does not fit either.
    const other = JSON.parse(gunzipSync(encodeBundle({ ...bundle, run: 'k3' }, here)).toString('utf8'));
    envelope.signature = other.signature;
    expect(() => openBundle(gzipSync(JSON.stringify(envelope)), { key: here })).toThrow(/signature does not match/);
  });

  it('refuses a bundle of another installation unless the person says they trust it', () => {
    const foreign = encodeBundle(bundle, elsewhere);
    expect(() => openBundle(foreign, { key: here, fileName: 'k2.themata-run' })).toThrow(UntrustedBundleError);
    expect(() => openBundle(foreign, { key: here, fileName: 'k2.themata-run' })).toThrow(
      'k2.themata-run was saved by another Themata installation, so this one cannot tell whether it was changed since. If you trust where it came from, apply it with --trust-bundle.',
    );
    const trusted = openBundle(foreign, { key: here, trust: true });
    expect(trusted.origin).toBe('another installation (trusted)');
    expect(trusted.bundle.labels).toEqual(['Opening hours', 'Staff']);
  });

  it('refuses an unsigned bundle of an older Themata unless the person says they trust it', () => {
    const old = unsignedOldBundle();
    expect(() => openBundle(old, { key: here, fileName: 'old.themata-run' })).toThrow(UntrustedBundleError);
    expect(() => openBundle(old, { key: here, fileName: 'old.themata-run' })).toThrow(/unsigned saved run from an older Themata/);
    const trusted = openBundle(old, { key: here, trust: true });
    expect(trusted.origin).toBe('unsigned (trusted)');
    expect([...trusted.bundle.lambda]).toEqual([-2.3, -2.3]);
  });

  it('refuses files that are not bundles, or bundles with no signature, with an InputError', () => {
    expect(() => openBundle(new TextEncoder().encode('id,answer\n'), { key: here, trust: true })).toThrow(InputError);
    expect(() => openBundle(gzipSync('[1,2]'), { key: here, trust: true })).toThrow(InputError);
    expect(() => openBundle(gzipSync(JSON.stringify({ format: 'themata-run', version: 2, payload: '{}' })), { key: here, trust: true })).toThrow(/damaged/);
  });
});
