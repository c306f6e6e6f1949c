// One settings schema for every place a fit is asked for (issue 13): the same bounds on the
// command line and on the Runs page, each message naming the setting as the person knows it there
// (a flag, a field label); a name already used and a study without answers are input errors.
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { NUMBER_SETTINGS, numberSetting } from '../../src/services/index.js';
import * as S from '../../src/store/index.js';
import { tempDir } from '../store/helpers.js';
import { HTML, LOCAL_CSRF, makeApp, postForm, type TestApp } from '../server/helpers.js';
import { syntheticStudy } from '../services/synthetic-study.js';
import { cli } from './cli-harness.js';

const t = tempDir('themata-fit-settings-');
const data = join(t.dir, 'data');
let web: TestApp;
let studyId = 0;
let emptyId = 0;

beforeAll(() => {
  const store = S.openStore(data);
  studyId = syntheticStudy(store, { documents: 40 });
  emptyId = S.createStudy(store, { name: 'Empty', languages: ['en'] }).id;
  store.close();
  web = makeApp({ dir: data });
});
afterAll(async () => {
  await web.close();
  t.cleanup();
});

const fit = (...args: string[]) => cli(['--data', data, 'fit', '--study', 'Synthetic', '--sweeps', '4', '--burn-in', '1', ...args]);
const oneLine = (stderr: string) => {
  const lines = stderr.trim().split('\n');
  expect(lines).toHaveLength(1);
  return lines[0];
};
const post = (sid: number, fields: Record<string, string>) => postForm(web, `/studies/${sid}/runs`, { _csrf: LOCAL_CSRF, ...fields });

describe('fit settings', () => {
  it('refuses a second fit with a name already used as an input error (exit 2, one line)', async () => {
    const first = await fit('--themes', '2', '--name', 'twice');
    expect(first.code).toBe(0);
    const second = await fit('--themes', '2', '--name', 'twice');
    expect(second.code).toBe(2);
    expect(oneLine(second.stderr)).toBe('themata: Study "Synthetic" has a run called "twice" already. Choose another --name, or remove that run first.');
    const page = await post(studyId, { themes: '2', sweeps: '4', name: 'twice' });
    expect(page.status).toBe(400);
    expect(await page.text()).toContain('has a run called &quot;twice&quot; already. Choose another Name, or remove that run first.');
  });

  it('bounds each setting the same on the command line and the page, naming the flag or the field', async () => {
    const cases = [
      { name: 'themes', value: '500', flag: '--themes', field: 'themes' },
      { name: 'holdout', value: '0.7', flag: '--holdout', field: 'holdout' },
      { name: 'seed', value: '-1', flag: '--seed', field: 'seed' },
      { name: 'sweeps', value: '0', flag: '--sweeps', field: 'sweeps' },
    ] as const;
    for (const c of cases) {
      const spec = numberSetting(c.name);
      const what = spec.kind === 'whole' ? 'a whole number' : 'a number';
      const range = `from ${spec.min.toLocaleString('en')} to ${spec.max.toLocaleString('en')} (got "${c.value}").`;
      const args = c.name === 'themes' ? ['--themes', c.value] : ['--themes', '2', c.flag, c.value];
      const r = await fit(...args);
      expect(r.code, c.name).toBe(2);
      expect(oneLine(r.stderr)).toBe(`themata: ${c.flag} must be ${what} ${range}`);
      const fields: Record<string, string> = { themes: '2', sweeps: '4', burnIn: '1', [c.field]: c.value };
      const res = await post(studyId, fields);
      expect(res.status, c.name).toBe(400);
      expect(await res.text()).toContain(`${spec.label} must be ${what} ${range.replace(/"/g, '&quot;')}`);
    }
    // Burn-in below sweeps, in each place's words.
    const r = await fit('--themes', '2', '--sweeps', '5', '--burn-in', '5');
    expect(oneLine(r.stderr)).toBe('themata: --burn-in must be below --sweeps (5); got 5.');
    const res = await post(studyId, { themes: '2', sweeps: '5', burnIn: '5' });
    expect(await res.text()).toContain('Burn-in sweeps must be below Sweeps (5); got 5.');
  });

  it('draws the Runs form from the same schema: labels, bounds and pre-filled values', async () => {
    const page = await (await web.app.request(`/studies/${studyId}/runs`, { headers: HTML })).text();
    for (const spec of NUMBER_SETTINGS.filter((s) => s.onForm)) {
      const input = new RegExp(`<input name="${spec.name}" type="number" min="${spec.min}" max="(\\d+(?:\\.\\d+)?)"`).exec(page);
      expect(input, spec.name).not.toBeNull();
      if (spec.name !== 'threads') expect(Number(input![1])).toBe(spec.max);
      expect(page).toContain(spec.label);
    }
    expect(page).toMatch(/<input name="themes" type="number" min="2" max="200" value="10" required=""/);
    expect(page).toMatch(/<input name="holdout" type="number" min="0" max="0.5" step="0.05" value="0.1"/);
    expect(page).not.toContain('name="checkpointEvery"');
  });

  it('refuses a run on a study with no answers, saying what to do', async () => {
    const r = await cli(['--data', data, 'fit', '--study', 'Empty', '--themes', '3']);
    expect(r.code).toBe(2);
    expect(oneLine(r.stderr)).toMatch(/^themata: Study "Empty" has no answers to fit yet\. Import a file with answers first \(themata import FILE --study "Empty"/);
    const res = await post(emptyId, { themes: '3' });
    expect(res.status).toBe(400);
    const html = await res.text();
    expect(html).toContain('Study &quot;Empty&quot; has no answers to fit yet. Import a file with answers on the Data page first');
    const store = S.openStore(data);
    try {
      expect(S.listRuns(store, emptyId)).toEqual([]);
    } finally {
      store.close();
    }
    const page = await (await web.app.request(`/studies/${emptyId}/runs`, { headers: HTML })).text();
    expect(page).toMatch(/<button type="submit" disabled="">Start run<\/button>/);
  });
});
