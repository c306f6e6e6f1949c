// Issue 6, "Done when": on the demo study the planted effects show up in the contrasts with 95%
// intervals that exclude zero. The demo's truth (demo/truth.json, written by its generator) names
// each planted effect (covariate level → theme) and each theme's key words per language; a fitted
// theme is identified with a planted one by the probability mass φ puts on its English key words.
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createFitRun, importFile, loadRunModel, runContrasts, runFitJob, type RunModel } from '../../src/services/index.js';
import { openStore, type Store } from '../../src/store/index.js';
import { DEMO_COLUMNS } from '../../demo/index.js';

interface Truth {
  themes: { id: string; keyWords: Record<string, string[]> }[];
  effects: { covariate: string; level: string; theme: string }[];
}
const demoDir = join(import.meta.dirname, '..', '..', 'demo');
const truth = JSON.parse(readFileSync(join(demoDir, 'truth.json'), 'utf8')) as Truth;

/** The fitted theme with most English φ mass on the planted theme's key words (surface forms). */
function fittedTheme(model: RunModel, plantedId: string): number {
  const keys = new Set(truth.themes.find((t) => t.id === plantedId)!.keyWords.en);
  const l = model.languages.indexOf('en');
  const vocab = model.vocabularies[l];
  const V = model.phi[l].length / model.K;
  let best = -1;
  let bestMass = -1;
  for (let k = 0; k < model.K; k++) {
    let mass = 0;
    for (let w = 0; w < V; w++) if (keys.has(vocab.surfaces[w]) || keys.has(vocab.stems[w])) mass += model.phi[l][k * V + w];
    if (mass > bestMass) [best, bestMass] = [k, mass];
  }
  return best;
}

describe('demo study contrasts (demo/truth.json planted effects)', () => {
  let dataDir: string;
  let store: Store;
  let model: RunModel;
  beforeAll(async () => {
    dataDir = mkdtempSync(join(tmpdir(), 'themata-demo-contrasts-'));
    store = openStore(dataDir);
    const bytes = new Uint8Array(readFileSync(join(demoDir, 'library-survey.csv')));
    const summary = await importFile(store, { study: 'Demo', bytes, fileName: 'library-survey.csv', mapping: DEMO_COLUMNS });
    const run = createFitRun(store, summary.studyId, { themes: 8, sweeps: 300, seed: 20251, threads: 1, covariates: ['branch_region', 'channel', 'age_band', 'wave'] });
    await runFitJob({ store, runId: run.id });
    model = loadRunModel(store, run.id)!;
  });
  afterAll(() => {
    store.close();
    rmSync(dataDir, { recursive: true, force: true });
  });

  it('every planted effect: the level writes more about its theme than each other level, with 95% intervals excluding zero', () => {
    expect(truth.effects.length).toBe(5);
    for (const effect of truth.effects) {
      const k = fittedTheme(model, effect.theme);
      const result = runContrasts(store, model, { by: effect.covariate, draws: 400, seed: 7 });
      const rows = result.differences.filter((d) => d.theme === k && (d.levelA === effect.level || d.levelB === effect.level));
      expect(rows.length, `${effect.covariate}=${effect.level}`).toBeGreaterThan(0);
      for (const d of rows) {
        // Orient every difference as (planted level) − (other level).
        const [low, high] = d.levelA === effect.level ? [d.low, d.high] : [-d.high, -d.low];
        expect(low, `${effect.covariate}: ${effect.level} vs ${d.levelA === effect.level ? d.levelB : d.levelA} on ${effect.theme} (theme ${k + 1}): [${low.toFixed(3)}, ${high.toFixed(3)}]`).toBeGreaterThan(0);
      }
    }
  });
});
