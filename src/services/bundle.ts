// The saved-run bundle (`*.themata-run`): everything Apply needs to code new answers without the
// database — languages, vocabulary stems, φ̂, α, labels, the pipeline settings and the column
// mapping the study was imported with. Format (Themata's own): gzip-compressed JSON whose
// `format` field is "themata-run" and `version` 1; typed arrays as base64 of little-endian bytes.
import { gunzipSync, gzipSync } from 'node:zlib';
import type { FeatureEncoding } from '../model/features.js';
import type { ColumnMapping, PipelineSettings } from '../text/types.js';
import { InputError } from '../text/types.js';

export const BUNDLE_FORMAT = 'themata-run';
export const BUNDLE_VERSION = 1;
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

export function encodeBundle(bundle: RunBundle): Uint8Array {
  const json = JSON.stringify({ ...bundle, phi: bundle.phi.map(b64), lambda: b64(bundle.lambda), beta: b64(bundle.beta) });
  return new Uint8Array(gzipSync(Buffer.from(json, 'utf8')));
}

export function decodeBundle(bytes: Uint8Array, fileName = 'bundle'): RunBundle {
  let parsed: Record<string, unknown>;
  try {
    parsed = JSON.parse(gunzipSync(bytes).toString('utf8')) as Record<string, unknown>;
  } catch {
    throw new InputError(`${fileName} is not a saved-run bundle (${BUNDLE_EXTENSION}); export one from a finished run.`, fileName);
  }
  if (parsed.format !== BUNDLE_FORMAT) throw new InputError(`${fileName} is not a saved-run bundle.`, fileName);
  if (parsed.version !== BUNDLE_VERSION) throw new InputError(`${fileName} is a version ${String(parsed.version)} bundle; this Themata reads version ${BUNDLE_VERSION}.`, fileName);
  const b = parsed as unknown as RunBundle & { phi: string[]; lambda: string; beta: string };
  const phi = b.phi.map(f64);
  phi.forEach((p, l) => {
    if (p.length !== b.vocabularies[l].stems.length * b.K) throw new InputError(`${fileName} is damaged: theme-word table of ${b.languages[l]} has the wrong size.`, fileName);
  });
  return { ...b, phi, lambda: f64(b.lambda), beta: f64(b.beta) };
}
