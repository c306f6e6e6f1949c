// `npm run bench -- --only sampler [--quick] [--json] [--full]` (issue #5).
//
// On one seeded synthetic corpus (bench/sampler/corpus.ts; 50,000 link groups ≈ 1.15 M tokens,
// --quick 8,000 groups) and for K ∈ {20, 100, 500}, measured side by side in one run from the
// same random start:
//   floor      tokens/s of the loop that only moves counts (bench/sampler/floor.ts)
//   reference  tokens/s of the plain O(K) sampler. Every sampler's tokens/s is taken, like the
//              floor's, over consecutive sweeps with nothing in between, after its quality trace
//              (converged state); the trace's own rates (likelihood evaluated between sweeps,
//              which leaves caches cold) are reported as `betweenLikelihoodEvaluations`, and
//              those of its first half, from the random start, as `firstHalf`
//   fast1      tokens/s of the fast exact sampler (SparseLDA buckets) on one thread
//   fastAll    tokens/s of the AD-LDA parallel sampler on every core
//   time to quality: seconds until the joint log-likelihood per token first reaches the
//              reference's mean over its last tenth of sweeps (sweeps 181–200; --quick: 23–25 of
//              25, fewer sweeps so the run stays under two minutes), the same rule for every
//              sampler, the reference included. Likelihood evaluation is not timed. A chain that
//              settles in a slightly lower mode never reaches it (null in JSON), so the time to
//              99% of the reference's gain from the shared random start is printed beside it
//              (timeToQuality99Ratio), with the level where each chain settled.
//   bytesPerToken: bytes of fast-sampler state that grow with the tokens (z + word lists),
//              divided by tokens; dense n_kw (vocabulary × K) is reported apart as tableBytes.
//              bytesPerTokenAll: the same for the parallel sampler (a copy of the word lists per
//              thread, plus two move logs per partition).
// JSON (last stdout line with --json): one object, every figure an array indexed like `k`.
import { availableParallelism } from 'node:os';
import type { BenchOptions } from './run.js';
import { benchCorpus } from './sampler/corpus.js';
import { measureK, type KFigures } from './sampler/measure.js';
import { runFullCase } from './sampler/full-case.js';

export async function runBench(options: BenchOptions): Promise<Record<string, unknown>> {
  const { log } = options;
  const groups = options.quick ? 8_000 : 50_000;
  const qualitySweeps = options.quick ? 25 : 200;
  const threads = availableParallelism();
  const built = benchCorpus(groups, 20260501);
  const N = built.corpus.words.length;
  log(`corpus: ${built.corpus.numGroups} link groups, ${built.corpus.docOffsets.length - 1} documents, ${N} tokens, 4 languages; threads for fastAll: ${threads}`);
  log(`time to quality: mean log-likelihood of the reference's last tenth of ${qualitySweeps} sweeps${options.quick ? ' (--quick: fewer sweeps than the full run\'s 200)' : ''}`);
  const ks = [20, 100, 500];
  const rows: KFigures[] = [];
  for (const K of ks) {
    const row = await measureK(built, K, { qualitySweeps, floorSweeps: options.quick ? 3 : 10, threads, log });
    rows.push(row);
  }
  const pick = <T extends keyof KFigures>(key: T) => rows.map((r) => r[key]);
  const result: Record<string, unknown> = {
    k: ks,
    floor: pick('floor'),
    reference: pick('reference'),
    fast1: pick('fast1'),
    fastAll: pick('fastAll'),
    fastOverReference: rows.map((r) => r.fast1 / r.reference),
    fastOverFloor: rows.map((r) => r.fast1 / r.floor),
    allOverOne: rows.map((r) => r.fastAll / r.fast1),
    timeToQualityRatio: rows.map((r) => r.ttqFast1 / r.ttqReference),
    timeToQualityRatioAll: rows.map((r) => r.ttqFastAll / r.ttqReference),
    timeToQualitySeconds: { reference: pick('ttqReference'), fast1: pick('ttqFast1'), fastAll: pick('ttqFastAll') },
    // The softer target (99% of the reference's gain from the shared start; see measure.ts).
    timeToQuality99Ratio: rows.map((r) => r.ttq99Fast1 / r.ttq99Reference),
    timeToQuality99RatioAll: rows.map((r) => r.ttq99FastAll / r.ttq99Reference),
    timeToQuality99Seconds: { reference: pick('ttq99Reference'), fast1: pick('ttq99Fast1'), fastAll: pick('ttq99FastAll') },
    settledLogLikelihood: { reference: pick('plateauReference'), fast1: pick('plateauFast1'), fastAll: pick('plateauFastAll') },
    sweepsToQuality: { reference: qualitySweeps, fast1: pick('sweepsFast1'), fastAll: pick('sweepsFastAll') },
    firstHalf: { reference: pick('referenceEarly'), fast1: pick('fast1Early'), fastAll: pick('fastAllEarly') },
    betweenLikelihoodEvaluations: { reference: pick('referenceTraced'), fast1: pick('fast1Traced'), fastAll: pick('fastAllTraced') },
    cpuTime: {
      floor: pick('floorCpu'),
      reference: pick('referenceCpu'),
      fast1: pick('fast1Cpu'),
      fastOverReference: rows.map((r) => r.fast1Cpu / r.referenceCpu),
      fastOverFloor: rows.map((r) => r.fast1Cpu / r.floorCpu),
    },
    bytesPerToken: pick('bytesPerToken'),
    bytesPerTokenAll: pick('bytesPerTokenAll'),
    tableBytes: pick('tableBytes'),
    tokens: N,
    groups: built.corpus.numGroups,
    threads,
    qualitySweeps,
    peakRssMB: process.resourceUsage().maxRSS / 1024,
  };
  log('');
  log('K      floor M/s  ref M/s  fast1 M/s  fastAll M/s  fast/ref  fast/floor  all/one  ttq fast1/ref  ttq all/ref  bytes/token  (all cores)');
  rows.forEach((r, i) => {
    log(
      `${String(r.K).padEnd(6)} ${(r.floor / 1e6).toFixed(2).padStart(9)}  ${(r.reference / 1e6).toFixed(2).padStart(7)}  ${(r.fast1 / 1e6).toFixed(2).padStart(9)}  ${(r.fastAll / 1e6).toFixed(2).padStart(11)}  ` +
        `${(result.fastOverReference as number[])[i].toFixed(2).padStart(8)}  ${(result.fastOverFloor as number[])[i].toFixed(2).padStart(10)}  ${(result.allOverOne as number[])[i].toFixed(2).padStart(7)}  ` +
        `${(result.timeToQualityRatio as number[])[i].toFixed(3).padStart(13)}  ${(result.timeToQualityRatioAll as number[])[i].toFixed(3).padStart(11)}  ` +
        `${r.bytesPerToken.toFixed(2).padStart(11)}  ${('(' + r.bytesPerTokenAll.toFixed(2) + ')').padStart(11)}`,
    );
  });
  log('time to 99% of the reference\'s gain from the random start (chains can settle in different modes; measure.ts):');
  rows.forEach((r) =>
    log(
      `K=${r.K}: reference ${r.ttq99Reference.toFixed(2)} s, fast1 ${r.ttq99Fast1.toFixed(2)} s (${(r.ttq99Fast1 / r.ttq99Reference).toFixed(3)}), fastAll ${r.ttq99FastAll.toFixed(2)} s (${(r.ttq99FastAll / r.ttq99Reference).toFixed(3)}); ` +
        `settled at ${r.plateauReference.toFixed(4)} / ${r.plateauFast1.toFixed(4)} / ${r.plateauFastAll.toFixed(4)}`,
    ),
  );
  log('per CPU second (single-threaded loops; robust when other programs share the cores):');
  rows.forEach((r) => log(`K=${r.K}: floor ${(r.floorCpu / 1e6).toFixed(2)} M, reference ${(r.referenceCpu / 1e6).toFixed(2)} M, fast1 ${(r.fast1Cpu / 1e6).toFixed(2)} M tokens/CPU-s; fast/ref ${(r.fast1Cpu / r.referenceCpu).toFixed(2)}, fast/floor ${(r.fast1Cpu / r.floorCpu).toFixed(2)}`));
  log(`peak RSS: ${(result.peakRssMB as number).toFixed(0)} MB`);
  if (options.full) result.full = await runFullCase(log, options.answers);
  return result;
}
