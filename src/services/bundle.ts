// The saved-run bundle (`*.themata-run`): everything Apply needs to code new answers without the
// database — languages, vocabulary stems, φ̂, α, labels, the pipeline settings and the column
// mapping the study was imported with. Format (Themata's own): gzip-compressed JSON.
// - The content: `format` "themata-run", `version` 1, typed arrays as base64 of little-endian bytes.
// - Version 2 files wrap it, signed: `{ format, version: 2, signature: { algorithm: "HMAC-SHA256",
//   installation, value }, payload }`, where `payload` is the content's JSON text and `value` the
//   HMAC-SHA256 (RFC 2104; FIPS 180-4) of the payload's exact UTF-8 bytes under this installation's
//   secret key (bundle-key.ts), base64url. `installation` names the key (not secret), so a file
//   from another installation can be told from an edited one.
// Reading (OWASP ASVS 4.0.3 V5.5.1, integrity of serialised objects): a valid signature of this
// installation is accepted; a mismatch under this installation's key means the file was edited and
// it is refused; a file signed elsewhere, or an unsigned version 1 file of an older Themata, is
// refused unless the person says they trust it (`themata apply --trust-bundle`).
import { createHash, createHmac, timingSafeEqual } from 'node:crypto';
import { gunzipSync, gzipSync } from 'node:zlib';
import type { FeatureEncoding } from '../model/index.js';
import type { ColumnMapping, PipelineSettings } from '../text/index.js';
import { InputError } from '../text/index.js';

export const BUNDLE_FORMAT = 'themata-run';
/** Version of the content (the run's tables). */
export const BUNDLE_VERSION = 1;
/** Version of the signed file that wraps the content. */
export const SIGNED_BUNDLE_VERSION = 2;
export const BUNDLE_EXTENSION = '.themata-run';

export interface RunBundle {
  readonly format: typeof BUNDLE_FORMAT;
  readonly version: number;
  readonly createdAt: string;
  readonly study: string;
  readonly run: string;
  readonly K: number;
  readonly labels: string[];
  readonly languages: string[];
  readonly vocabularies: { stems: string[]; surfaces: string[] }[];
  /** φ̂ per language, V_ℓ×K row-major. */
  readonly phi: Float64Array[];
  /** φ̂ is K×V_ℓ row-major. λ is K×F; α of a new answer = exp(λ·x) with x from `encoding`. */
  readonly lambda: Float64Array;
  readonly encoding: FeatureEncoding | null;
  readonly beta: Float64Array;
  readonly pipeline: PipelineSettings;
  /** Mapping of the study's first import: a default for Apply's column flags. */
  readonly mapping: ColumnMapping | null;
  readonly settings: Record<string, unknown>;
}

function b64(a: Float64Array): string {
  return Buffer.from(a.buffer, a.byteOffset, a.byteLength).toString('base64');
}

function f64(s: string): Float64Array {
  const buf = Buffer.from(s, 'base64');
  const out = new Float64Array(buf.byteLength / 8);
  new Uint8Array(out.buffer).set(buf);
  return out;
}

/** A short public name of a signing key: the first 16 hex digits of SHA-256 over a label and the key. */
export function bundleKeyName(key: Uint8Array): string {
  return createHash('sha256').update('themata bundle signing key\0').update(key).digest('hex').slice(0, 16);
}

function sign(payload: string, key: Uint8Array): string {
  return createHmac('sha256', key).update(Buffer.from(payload, 'utf8')).digest('base64url');
}

/** Write a bundle signed with this installation's key. */
export function encodeBundle(bundle: RunBundle, key: Uint8Array): Uint8Array {
  const payload = JSON.stringify({ ...bundle, phi: bundle.phi.map(b64), lambda: b64(bundle.lambda), beta: b64(bundle.beta) });
  const envelope = {
    format: BUNDLE_FORMAT,
    version: SIGNED_BUNDLE_VERSION,
    signature: { algorithm: 'HMAC-SHA256', installation: bundleKeyName(key), value: sign(payload, key) },
    payload,
  };
  return new Uint8Array(gzipSync(Buffer.from(JSON.stringify(envelope), 'utf8')));
}

/** Where a bundle that was accepted came from. */
export type BundleOrigin = 'this installation' | 'another installation (trusted)' | 'unsigned (trusted)';

export interface OpenBundleOptions {
  /** This installation's signing key. */
  readonly key: Uint8Array;
  /** The person trusts a bundle signed by another installation, or unsigned (older Themata). */
  readonly trust?: boolean;
  readonly fileName?: string;
}

/** A bundle refused because nothing shows it is unchanged (the person may still choose to trust it). */
export class UntrustedBundleError extends InputError {
  override readonly name = 'UntrustedBundleError';
}

/** Read a bundle and check its signature (see the top of this file for what is accepted). */
export function openBundle(bytes: Uint8Array, options: OpenBundleOptions): { bundle: RunBundle; origin: BundleOrigin } {
  const fileName = options.fileName ?? 'bundle';
  const outer = parseJson(gunzipOrRefuse(bytes, fileName), fileName);
  if (outer.format !== BUNDLE_FORMAT) throw new InputError(`${fileName} is not a saved-run bundle.`, fileName);
  if (outer.version === BUNDLE_VERSION) {
    if (!options.trust) {
      throw new UntrustedBundleError(
        `${fileName} is an unsigned saved run from an older Themata, so nothing shows it is unchanged. ` +
          'Export the run again to get a signed file, or, if you trust this file, apply it with --trust-bundle.',
        fileName,
      );
    }
    return { bundle: decodeContent(outer, fileName), origin: 'unsigned (trusted)' };
  }
  if (outer.version !== SIGNED_BUNDLE_VERSION) {
    throw new InputError(`${fileName} is a version ${String(outer.version)} bundle; this Themata reads versions ${BUNDLE_VERSION} and ${SIGNED_BUNDLE_VERSION}.`, fileName);
  }
  const signature = outer.signature as { algorithm?: unknown; installation?: unknown; value?: unknown } | undefined;
  const payload = outer.payload;
  if (typeof payload !== 'string' || !signature || signature.algorithm !== 'HMAC-SHA256' || typeof signature.value !== 'string') {
    throw new InputError(`${fileName} is damaged: its signature or contents are missing.`, fileName);
  }
  let origin: BundleOrigin = 'this installation';
  if (signature.installation === bundleKeyName(options.key)) {
    const expected = Buffer.from(sign(payload, options.key));
    const given = Buffer.from(signature.value);
    if (expected.length !== given.length || !timingSafeEqual(expected, given)) {
      throw new InputError(
        `${fileName} was changed after this Themata installation saved it (its signature does not match), so it is not used. ` +
          'Export the run again from its study.',
        fileName,
      );
    }
  } else if (!options.trust) {
    throw new UntrustedBundleError(
      `${fileName} was saved by another Themata installation, so this one cannot tell whether it was changed since. ` +
        'If you trust where it came from, apply it with --trust-bundle.',
      fileName,
    );
  } else {
    origin = 'another installation (trusted)';
  }
  return { bundle: decodeContent(parseJson(payload, fileName), fileName), origin };
}

/** Read a bundle (see openBundle), without saying where it came from. */
export function decodeBundle(bytes: Uint8Array, options: OpenBundleOptions): RunBundle {
  return openBundle(bytes, options).bundle;
}

function gunzipOrRefuse(bytes: Uint8Array, fileName: string): string {
  try {
    return gunzipSync(bytes).toString('utf8');
  } catch {
    throw new InputError(`${fileName} is not a saved-run bundle (${BUNDLE_EXTENSION}); export one from a finished run.`, fileName);
  }
}

function parseJson(text: string, fileName: string): Record<string, unknown> {
  try {
    const parsed = JSON.parse(text) as unknown;
    if (parsed && typeof parsed === 'object' && !Array.isArray(parsed)) return parsed as Record<string, unknown>;
  } catch {
    // refused below
  }
  throw new InputError(`${fileName} is not a saved-run bundle (${BUNDLE_EXTENSION}); export one from a finished run.`, fileName);
}

function decodeContent(parsed: Record<string, unknown>, fileName: string): RunBundle {
  if (parsed.format !== BUNDLE_FORMAT) throw new InputError(`${fileName} is not a saved-run bundle.`, fileName);
  if (parsed.version !== BUNDLE_VERSION) throw new InputError(`${fileName} is a version ${String(parsed.version)} bundle; this Themata reads version ${BUNDLE_VERSION}.`, fileName);
  const b = parsed as unknown as RunBundle & { phi: string[]; lambda: string; beta: string };
  const phi = b.phi.map(f64);
  phi.forEach((p, l) => {
    if (p.length !== b.vocabularies[l].stems.length * b.K) throw new InputError(`${fileName} is damaged: theme-word table of ${b.languages[l]} has the wrong size.`, fileName);
  });
  return { ...b, phi, lambda: f64(b.lambda), beta: f64(b.beta) };
}
