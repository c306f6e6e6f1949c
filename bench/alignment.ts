// `npm run bench -- --only alignment`: agreement across languages on real short texts (the CLDR
// emoji names and keywords of `emojibase-data`, bench/alignment/emoji-study.ts), through the same
// services as the workbench (import, glossary, fit job with its stored results), with 0%, 10% and
// 50% of concepts linked, without and with a glossary (the emoji group and subgroup names), and
// the fit job's wall time beside the sampler's own time. Figures, not assertions.
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { createFitRun, importGlossary, loadRunModel, runFitJob } from '../src/services/index.js';
import { openStore } from '../src/store/index.js';
import { emojiConcepts, emojiGlossaryCsv } from './alignment/emoji-study.js';
import { alignmentStudy, fitAndMeasure, importAlignmentStudy } from './alignment/measure.js';
import type { BenchOptions } from './run.js';

export async function runBench(options: BenchOptions): Promise<Record<string, unknown>> {
  const concepts = emojiConcepts();
  const shares = options.quick ? [0.1] : [0, 0.1, 0.5];
  const seeds = options.quick ? [1] : [1, 2];
  const sweeps = 300;
  const rows: Record<string, unknown>[] = [];
  options.log(`emojibase-data 17.0.0 (MIT): ${concepts.length} texts, ${new Set(concepts.map((c) => c.concept)).size} concepts, 5 languages; K = 8, ${sweeps} sweeps, 1 thread`);
  options.log('linked  glossary  seed  agreement  chance  purity  fit wall s  sampler s  wall/sampler');
  for (const share of shares) {
    for (const glossary of [false, true]) {
      const dir = mkdtempSync(join(tmpdir(), 'themata-align-'));
      const store = openStore(dir);
      try {
        const study = alignmentStudy(concepts, share, 11);
        const studyId = await importAlignmentStudy(store, study, 'emoji');
        if (glossary) await importGlossary(store, { study: studyId, bytes: new TextEncoder().encode(emojiGlossaryCsv()), fileName: 'emoji-names.csv' });
        for (const seed of seeds) {
          const f = await fitAndMeasure(store, studyId, concepts, study.linked, async () => {
            const run = createFitRun(store, studyId, { themes: 8, sweeps, seed, name: `s${seed}` });
            await runFitJob({ store, runId: run.id });
            const m = loadRunModel(store, run.id)!;
            return { ...m, samplerSeconds: m.diagnostics.seconds };
          });
          rows.push({ linked: share, glossary, seed, ...f });
          options.log(
            `${(share * 100).toFixed(0).padStart(5)}%  ${glossary ? 'yes' : 'no '}       ${seed}     ${f.agreement.toFixed(3)}      ${f.chance.toFixed(3)}   ${f.purity.toFixed(3)}   ${f.wallSeconds.toFixed(2).padStart(8)}   ${f.samplerSeconds.toFixed(2).padStart(8)}   ${(f.wallSeconds / f.samplerSeconds).toFixed(2)}`,
          );
        }
      } finally {
        store.close();
        rmSync(dir, { recursive: true, force: true });
      }
    }
  }
  return { corpus: 'emojibase-data 17.0.0', rows };
}
