// Checkpoints of a fit: everything needed to continue a run exactly as if it had never stopped
// (docs/design.md §4): assignments z, RNG state, hyperparameters, sweep number, the log-likelihood
// trace and the posterior-sample accumulators. Counts are not saved: every sampler rebuilds
// them from z.
//
// Byte layout (little-endian, versioned):
//   0..3   ASCII "THCK"
//   4..7   uint32 format version (CHECKPOINT_VERSION)
//   8..11  uint32 byte length H of the JSON header
//   12..   UTF-8 JSON header {scalars, arrays: [{name, type, length}]}, zero-padded to 8 bytes
//   then each array's raw bytes in header order, each padded to a multiple of 8 bytes.

export const CHECKPOINT_VERSION = 1;
const MAGIC = [0x54, 0x48, 0x43, 0x4b]; // "THCK"

export interface Checkpoint {
  readonly version: number;
  readonly K: number;
  /** Sweeps completed. */
  readonly sweep: number;
  readonly z: Uint16Array;
  readonly rngState: Uint32Array;
  /** λ, K×F row-major. */
  readonly lambda: Float64Array;
  readonly numFeatures: number;
  readonly beta: Float64Array;
  /** Joint log-likelihood per token after each completed sweep. */
  readonly logLikelihoodTrace: Float64Array;
  /** Σ over saved samples of (n_kw + β)/(n_k + Vβ), (ΣV_ℓ)×K. */
  readonly phiSum: Float64Array;
  /** Σ over saved samples of E[θ_g | z], G×K. */
  readonly thetaSum: Float64Array;
  readonly numSamples: number;
  /** The most recent kept θ samples (G×K each) and the sweeps they come from. */
  readonly thetaSamples: Float32Array[];
  readonly thetaSampleSweeps: number[];
  /** Number of hyperparameter optimizations run so far. */
  readonly optimizations: number;
}

type ArrayKind = 'u16' | 'u32' | 'f64' | 'f32';
type Typed = Uint16Array | Uint32Array | Float64Array | Float32Array;

function kindOf(a: Typed): ArrayKind {
  if (a instanceof Uint16Array) return 'u16';
  if (a instanceof Uint32Array) return 'u32';
  if (a instanceof Float64Array) return 'f64';
  return 'f32';
}

const BYTES: Record<ArrayKind, number> = { u16: 2, u32: 4, f64: 8, f32: 4 };

function pad8(n: number): number {
  return (n + 7) & ~7;
}

/** Serializes a checkpoint to bytes (see the layout above). */
export function encodeCheckpoint(cp: Checkpoint): Uint8Array {
  const arrays: [string, Typed][] = [
    ['z', cp.z],
    ['rngState', cp.rngState],
    ['lambda', cp.lambda],
    ['beta', cp.beta],
    ['logLikelihoodTrace', cp.logLikelihoodTrace],
    ['phiSum', cp.phiSum],
    ['thetaSum', cp.thetaSum],
    ...cp.thetaSamples.map((s, i): [string, Typed] => [`thetaSample${i}`, s]),
  ];
  const header = {
    K: cp.K,
    sweep: cp.sweep,
    numFeatures: cp.numFeatures,
    numSamples: cp.numSamples,
    thetaSampleSweeps: cp.thetaSampleSweeps,
    optimizations: cp.optimizations,
    arrays: arrays.map(([name, a]) => ({ name, type: kindOf(a), length: a.length })),
  };
  const json = new TextEncoder().encode(JSON.stringify(header));
  let size = pad8(12 + json.length);
  for (const [, a] of arrays) size += pad8(a.byteLength);
  const out = new Uint8Array(size);
  out.set(MAGIC, 0);
  const view = new DataView(out.buffer);
  view.setUint32(4, CHECKPOINT_VERSION, true);
  view.setUint32(8, json.length, true);
  out.set(json, 12);
  let offset = pad8(12 + json.length);
  for (const [, a] of arrays) {
    out.set(new Uint8Array(a.buffer, a.byteOffset, a.byteLength), offset);
    offset += pad8(a.byteLength);
  }
  return out;
}

/** Reads bytes written by encodeCheckpoint; refuses other formats and versions with a clear message. */
export function decodeCheckpoint(bytes: Uint8Array): Checkpoint {
  if (bytes.length < 12 || MAGIC.some((m, i) => bytes[i] !== m)) throw new Error('These bytes are not a Themata checkpoint.');
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const version = view.getUint32(4, true);
  if (version !== CHECKPOINT_VERSION) {
    throw new Error(`Checkpoint format version ${version} is not supported (this version reads ${CHECKPOINT_VERSION}); restart the run.`);
  }
  const headerLength = view.getUint32(8, true);
  const header = JSON.parse(new TextDecoder().decode(bytes.subarray(12, 12 + headerLength))) as {
    K: number;
    sweep: number;
    numFeatures: number;
    numSamples: number;
    thetaSampleSweeps: number[];
    optimizations: number;
    arrays: { name: string; type: ArrayKind; length: number }[];
  };
  let offset = pad8(12 + headerLength);
  const arrays = new Map<string, Typed>();
  for (const { name, type, length } of header.arrays) {
    const byteLength = length * BYTES[type];
    if (offset + byteLength > bytes.length) throw new Error('The checkpoint is truncated.');
    // Copy into a fresh, aligned buffer.
    const buf = bytes.slice(offset, offset + byteLength).buffer;
    const a = type === 'u16' ? new Uint16Array(buf) : type === 'u32' ? new Uint32Array(buf) : type === 'f64' ? new Float64Array(buf) : new Float32Array(buf);
    arrays.set(name, a);
    offset += pad8(byteLength);
  }
  const get = <T extends Typed>(name: string): T => {
    const a = arrays.get(name);
    if (!a) throw new Error(`The checkpoint has no ${name}.`);
    return a as T;
  };
  return {
    version,
    K: header.K,
    sweep: header.sweep,
    z: get<Uint16Array>('z'),
    rngState: get<Uint32Array>('rngState'),
    lambda: get<Float64Array>('lambda'),
    numFeatures: header.numFeatures,
    beta: get<Float64Array>('beta'),
    logLikelihoodTrace: get<Float64Array>('logLikelihoodTrace'),
    phiSum: get<Float64Array>('phiSum'),
    thetaSum: get<Float64Array>('thetaSum'),
    numSamples: header.numSamples,
    thetaSamples: header.thetaSampleSweeps.map((_, i) => get<Float32Array>(`thetaSample${i}`)),
    thetaSampleSweeps: header.thetaSampleSweeps,
    optimizations: header.optimizations,
  };
}
