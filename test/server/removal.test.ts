// Deleting from the workbench (OWASP ASVS 4.0.3 V8.3.2): a "Delete…" link for the owner, a
// confirmation page that counts what goes, a POST with the CSRF token (and the study's name typed
// again) that deletes, and the usual refusals: 403 for editors and viewers, 404 for others.
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { createFitRun, runFitJob } from '../../src/services/index.js';
import { addStudyMember, createAccount, createStudy, deleteStudy, getStudyByName, getRun, getStudy, insertImport, listImports, type Store } from '../../src/store/index.js';
import { syntheticStudy } from '../services/synthetic-study.js';
import { HTML, makeApp, postForm, type TestApp } from './helpers.js';

let t: TestApp;
let studyId: number;
let runId: number;
const users: Record<string, { headers: Record<string, string>; csrf: string }> = {};

async function finishedRun(store: Store, study: number, name: string): Promise<number> {
  const run = createFitRun(store, study, { themes: 2, sweeps: 6, burnIn: 2, sampler: 'reference', name });
  await runFitJob({ store, runId: run.id });
  return run.id;
}

async function login(name: string) {
  const res = await postForm(t, '/login', { name, password: `${name} has a long password`, next: '/' });
  const token = /themata_session=([^;]+)/.exec(res.headers.get('Set-Cookie') ?? '')![1];
  const headers = { Cookie: `themata_session=${token}` };
  const page = await (await t.app.request('/', { headers: { ...HTML, ...headers } })).text();
  return { headers, csrf: /name="_csrf" value="([^"]+)"/.exec(page)![1] };
}

const get = (user: string, path: string) => t.app.request(path, { headers: { ...HTML, ...users[user].headers } });
const post = (user: string, path: string, fields: Record<string, string> = {}) => postForm(t, path, { _csrf: users[user].csrf, ...fields }, users[user].headers);

const ids: Record<string, number> = {};
beforeAll(async () => {
  t = makeApp({ loopbackOnly: false });
  for (const name of ['ana', 'ed', 'vi', 'ben']) ids[name] = createAccount(t.store, name, `${name} has a long password`).id;
  for (const name of ['ana', 'ed', 'vi', 'ben']) users[name] = await login(name);
});
afterAll(() => t.close());

// Each test starts from the same study (the one before is deleted, whatever the test did with it).
beforeEach(async () => {
  for (const name of ['Synthetic', 'Other']) {
    const old = getStudyByName(t.store, name);
    if (old) deleteStudy(t.store, old.id);
  }
  studyId = syntheticStudy(t.store, { documents: 60 });
  addStudyMember(t.store, studyId, ids.ana, 'owner');
  addStudyMember(t.store, studyId, ids.ed, 'editor');
  addStudyMember(t.store, studyId, ids.vi, 'viewer');
  runId = await finishedRun(t.store, studyId, 'k2');
});

describe('deleting from the workbench', () => {
  it('shows the owner Delete… links on the Data and Runs pages, and no one else', async () => {
    const data = await (await get('ana', `/studies/${studyId}/data`)).text();
    expect(data).toContain(`href="/studies/${studyId}/delete"`);
    expect(data).toMatch(new RegExp(`href="/studies/${studyId}/imports/\\d+/delete"`));
    expect(await (await get('ana', `/studies/${studyId}/runs`)).text()).toContain(`href="/studies/${studyId}/runs/${runId}/delete"`);
    for (const user of ['ed', 'vi']) {
      expect(await (await get(user, `/studies/${studyId}/data`)).text()).not.toContain('/delete"');
      expect(await (await get(user, `/studies/${studyId}/runs`)).text()).not.toContain('/delete"');
    }
  });

  it('says exactly what deleting a study removes, and deletes it only when its name is typed', async () => {
    const page = await (await get('ana', `/studies/${studyId}/delete`)).text();
    expect(page).toContain('Delete study “Synthetic”?');
    expect(page).toContain('<li>1 imported file, with the original files as uploaded (3 bytes)</li>');
    expect(page).toMatch(/<li>6\d answers<\/li>/);
    expect(page).toMatch(/1 run with \d+ stored results, 0 checkpoints, 0 theme labels and 0 exported files kept in Themata/);
    expect(page).toMatch(/3 people(&#39;|')s access to the study/);
    expect(page).toContain('name="confirmName"');

    const wrong = await post('ana', `/studies/${studyId}/delete`, { confirmName: 'synthetic' });
    expect(wrong.status).toBe(400);
    expect(await wrong.text()).toContain('The name you typed is not &quot;Synthetic&quot;. Nothing was deleted.');
    expect(getStudy(t.store, studyId)).toBeDefined();

    const noToken = await postForm(t, `/studies/${studyId}/delete`, { confirmName: 'Synthetic' }, users.ana.headers);
    expect(noToken.status).toBe(403);
    expect(getStudy(t.store, studyId)).toBeDefined();

    const done = await post('ana', `/studies/${studyId}/delete`, { confirmName: 'Synthetic' });
    expect(done.status).toBe(200);
    expect(await done.text()).toMatch(/Deleted study &quot;Synthetic&quot;: 1 imported file .*, 6\d answers/);
    expect(getStudy(t.store, studyId)).toBeUndefined();
    expect(getRun(t.store, runId)).toBeUndefined();
    expect((await get('ana', `/studies/${studyId}/data`)).status).toBe(404);
  });

  it('refuses deletion to editors and viewers (403) and answers 404 to accounts without access', async () => {
    const importId = listImports(t.store, studyId)[0].id;
    const paths = [`/studies/${studyId}/delete`, `/studies/${studyId}/runs/${runId}/delete`, `/studies/${studyId}/imports/${importId}/delete`];
    for (const path of paths) {
      for (const user of ['ed', 'vi']) {
        expect((await get(user, path)).status, `${user} GET ${path}`).toBe(403);
        expect((await post(user, path, { confirmName: 'Synthetic' })).status, `${user} POST ${path}`).toBe(403);
      }
      expect((await get('ben', path)).status, `GET ${path}`).toBe(404);
      const res = await post('ben', path, { confirmName: 'Synthetic' });
      expect(res.status, `POST ${path}`).toBe(404);
      expect(await res.text()).not.toContain('Synthetic');
    }
    expect(getStudy(t.store, studyId)).toBeDefined();
    expect(getRun(t.store, runId)).toBeDefined();
    expect(listImports(t.store, studyId)).toHaveLength(1);
  });

  it('deletes a run after its confirmation page, and refuses on the page an import a run was fitted on', async () => {
    const importId = listImports(t.store, studyId)[0].id;
    const refused = await (await get('ana', `/studies/${studyId}/imports/${importId}/delete`)).text();
    expect(refused).toContain('Run &quot;k2&quot; was fitted on answers of synthetic.csv. Delete that run first');
    expect(refused).not.toContain('name="confirmName"');
    expect(refused).not.toContain('>Delete file</button>');
    expect((await post('ana', `/studies/${studyId}/imports/${importId}/delete`)).status).toBe(400);
    expect(listImports(t.store, studyId)).toHaveLength(1);

    const page = await (await get('ana', `/studies/${studyId}/runs/${runId}/delete`)).text();
    expect(page).toMatch(/\d+ stored results, 0 checkpoints, 0 theme labels and 0 exported files/);
    const done = await post('ana', `/studies/${studyId}/runs/${runId}/delete`);
    expect(done.status).toBe(200);
    expect(await done.text()).toContain('Deleted run &quot;k2&quot; of study &quot;Synthetic&quot;');
    expect(getRun(t.store, runId)).toBeUndefined();

    const gone = await post('ana', `/studies/${studyId}/imports/${importId}/delete`);
    expect(gone.status).toBe(200);
    expect(await gone.text()).toContain('Deleted synthetic.csv from study &quot;Synthetic&quot;');
    expect(listImports(t.store, studyId)).toHaveLength(0);
  });

  it("answers 404 for another study's import through your own study's path", async () => {
    const other = insertImport(t.store, { studyId: createStudy(t.store, { name: 'Other' }).id, fileName: 'theirs.csv', format: 'csv', bytes: new Uint8Array([1]), encoding: 'UTF-8', mapping: { text: ['a'], covariates: [] } });
    expect((await get('ana', `/studies/${studyId}/imports/${other}/delete`)).status).toBe(404);
    expect((await post('ana', `/studies/${studyId}/imports/${other}/delete`)).status).toBe(404);
  });
});

