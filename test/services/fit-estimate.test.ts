// The estimate said before a fit starts (issue 15): it grows with the study's words and the
// sweeps, a second thread shortens it, a machine too small for the study is named with both
// sizes, and the Runs page and `themata fit` show it. Invented data (synthetic study). How close
// the estimate comes to a real fit is measured in `npm run bench -- --full`, not timed here.
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { estimateFit, type MachineSize } from '../../src/services/index.js';
import * as S from '../../src/store/index.js';
import { tempDir } from '../store/helpers.js';
import { HTML, makeApp, type TestApp } from '../server/helpers.js';
import { cli } from '../cli/cli-harness.js';
import { syntheticStudy } from './synthetic-study.js';

const t = tempDir('themata-fit-estimate-');
const data = join(t.dir, 'data');
const LARGE: MachineSize = { memoryBytes: 24e9, cores: 2 };
let store: S.Store;
let small = 0;
let large = 0;
let web: TestApp;

beforeAll(() => {
  store = S.openStore(data);
  small = syntheticStudy(store, { documents: 100 });
  S.updateStudy(store, small, { name: 'Small' });
  large = syntheticStudy(store, { documents: 1000, seed: 4 });
  web = makeApp({ dir: data });
});
afterAll(async () => {
  await web.close();
  store.close();
  t.cleanup();
});

describe('the estimate before a fit', () => {
  it('counts the words to fit and grows with them and with the sweeps; two threads take less time than one', () => {
    const a = estimateFit(store, small, { themes: 10, sweeps: 200 }, LARGE);
    const b = estimateFit(store, large, { themes: 10, sweeps: 200 }, LARGE);
    expect(a.answers).toBeGreaterThan(100); // linked translations are answers too
    expect(b.words).toBeGreaterThan(9 * a.words);
    expect(b.seconds.sampling).toBeGreaterThan(a.seconds.sampling);
    expect(b.peakBytes).toBeGreaterThan(a.peakBytes);
    const longer = estimateFit(store, large, { themes: 10, sweeps: 800 }, LARGE);
    // The sweeps part scales with the sweeps, the rest does not depend on them.
    expect(longer.seconds.sampling).toBeCloseTo(4 * b.seconds.sampling, 6);
    expect(longer.seconds.preparing).toBe(b.seconds.preparing);
    const two = estimateFit(store, large, { themes: 10, sweeps: 800, threads: 2 }, LARGE);
    expect(two.seconds.sampling).toBeLessThan(longer.seconds.sampling);
    expect(a.seconds.total).toBeCloseTo(a.seconds.preparing + a.seconds.starting + a.seconds.sampling + a.seconds.after, 9);
    expect(a.fits).toBe(true);
  });

  it('says so when the machine has too little memory for the study, naming both sizes', () => {
    const tiny = estimateFit(store, large, { themes: 10 }, { memoryBytes: 100e6, cores: 1 });
    expect(tiny.fits).toBe(false);
    expect(tiny.notes.join(' ')).toMatch(/This fit needs about \d+ MB of memory and this machine has 100 MB/);
    const slow = estimateFit(store, large, { themes: 200, sweeps: 100_000 }, LARGE);
    expect(slow.notes.join(' ')).toMatch(/takes more than an hour/);
  });

  it('is shown on the Runs page for the form as it is, and again for changed fields', async () => {
    const page = await (await web.app.request(`/studies/${large}/runs`, { headers: HTML })).text();
    expect(page).toMatch(/id="fit-estimate"[^>]*hx-get="\/studies\/\d+\/runs\/estimate"/);
    expect(page).toMatch(/answers will be used\. Estimated: [\d,]+ answers, [\d,]+ words: about \d+ (s|min)/);
    const changed = await (await web.app.request(`/studies/${large}/runs/estimate?themes=20&sweeps=2000&threads=1&holdout=0`, { headers: HTML })).text();
    expect(changed).toMatch(/^<div id="fit-estimate"/);
    expect(changed).toMatch(/Estimated: .* of memory at the peak/);
    const wrong = await (await web.app.request(`/studies/${large}/runs/estimate?themes=1`, { headers: HTML })).text();
    expect(wrong).toContain('No estimate yet: Number of themes must be a whole number from 2');
  });

  it('is printed by themata fit before the sweeps', async () => {
    store.close();
    try {
      const out = await cli(['--data', data, 'fit', '--study', 'Synthetic', '--themes', '2', '--sweeps', '4', '--burn-in', '1', '--name', 'estimated']);
      expect(out.code).toBe(0);
      expect(out.stderr).toMatch(/Estimate: [\d,]+ answers, [\d,]+ words: about \d+ s in all .* of memory at the peak\./);
    } finally {
      store = S.openStore(data);
    }
  });
});
