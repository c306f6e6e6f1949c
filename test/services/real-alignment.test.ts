// Outside check on real text: the CLDR emoji names and keywords shipped in `emojibase-data`
// 17.0.0 (MIT licence; data.json of en, es, fr, de, ja, fields `label`, `tags`, `group`; see
// bench/alignment/emoji-study.ts) — 1,644 concepts written independently by CLDR's translators in
// five languages, eight known categories. Through the same services as the workbench (import, fit
// job, stored results), the dominant theme of a concept that has no link must agree across
// languages far above chance once 10% of the concepts are linked, and more with half linked; with
// no link at all it is near chance (nothing ties the languages but shared spellings). Measured
// levels (bench/alignment, two seeds): 0.15, 0.53, 0.74–0.77 against chance 0.13.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { emojiConcepts } from '../../bench/alignment/emoji-study.js';
import { alignmentStudy, fitAndMeasure, importAlignmentStudy, type AlignmentFigures } from '../../bench/alignment/measure.js';
import { createFitRun, loadRunModel, runFitJob } from '../../src/services/index.js';
import { withTempStore } from '../store/helpers.js';

const concepts = emojiConcepts();
const figures = new Map<number, AlignmentFigures>();
let ctx: ReturnType<typeof withTempStore>;

beforeAll(async () => {
  ctx = withTempStore();
  for (const share of [0, 0.1, 0.5]) {
    const study = alignmentStudy(concepts, share, 11);
    const studyId = await importAlignmentStudy(ctx.store, study, `emoji ${share}`);
    figures.set(
      share,
      await fitAndMeasure(ctx.store, studyId, concepts, study.linked, async () => {
        const run = createFitRun(ctx.store, studyId, { themes: 8, sweeps: 200, seed: 1, name: 'k8' });
        await runFitJob({ store: ctx.store, runId: run.id });
        const m = loadRunModel(ctx.store, run.id)!;
        return { ...m, samplerSeconds: m.diagnostics.seconds };
      }),
    );
  }
}, 300_000);
afterAll(() => ctx.cleanup());

describe('alignment across languages on real short texts (emojibase-data)', () => {
  it('is near chance without links, far above it with 10% linked, higher again with half linked', () => {
    const [none, tenth, half] = [0, 0.1, 0.5].map((s) => figures.get(s)!);
    console.log(`emoji alignment: ${[none, tenth, half].map((f) => `${f.agreement.toFixed(3)} (chance ${f.chance.toFixed(3)})`).join(', ')}`);
    expect(none.agreement).toBeLessThan(none.chance + 0.1);
    expect(tenth.agreement).toBeGreaterThan(3 * tenth.chance);
    expect(tenth.agreement).toBeGreaterThan(0.45);
    expect(half.agreement).toBeGreaterThan(tenth.agreement + 0.1);
    expect(half.agreement).toBeGreaterThan(0.65);
  });
});
