// Per-account limits on work through the workbench (OWASP ASVS 4.0.3 V11.1.3): the fourth fit an
// account starts while three of its fits are queued or running is refused on the Runs page, and
// no run is created for it. Invented data (synthetic study); the queue is stopped, so the fits stay queued.
import { describe, expect, it } from 'vitest';
import { addStudyMember, createAccount, listRuns } from '../../src/store/index.js';
import { syntheticStudy } from '../services/synthetic-study.js';
import { HTML, makeApp, postForm } from './helpers.js';

describe('fits per account in the workbench', () => {
  it('refuses a fourth queued fit of one account with a clear message and creates no run', async () => {
    const t = makeApp({ loopbackOnly: false });
    try {
      const ana = createAccount(t.store, 'ana', 'ana has a long password');
      const studyId = syntheticStudy(t.store, { documents: 40 });
      addStudyMember(t.store, studyId, ana.id, 'owner');
      const login = await postForm(t, '/login', { name: 'ana', password: 'ana has a long password', next: '/' });
      const headers = { Cookie: `themata_session=${/themata_session=([^;]+)/.exec(login.headers.get('Set-Cookie') ?? '')![1]}` };
      const page = await (await t.app.request(`/studies/${studyId}/runs`, { headers: { ...HTML, ...headers } })).text();
      const csrf = /name="_csrf" value="([^"]+)"/.exec(page)![1];
      await t.queue.close(); // nothing is fitted: every run started below stays queued
      for (const name of ['k2', 'k3', 'k4']) {
        const res = await postForm(t, `/studies/${studyId}/runs`, { _csrf: csrf, themes: '2', sweeps: '10', name }, headers);
        expect(res.status, name).toBe(303);
      }
      const refused = await postForm(t, `/studies/${studyId}/runs`, { _csrf: csrf, themes: '5', sweeps: '10', name: 'k5' }, headers);
      expect(refused.status).toBe(400);
      expect(await refused.text()).toContain('You have 3 fits queued or running, the most one account may have at once (3).');
      expect(listRuns(t.store, studyId).map((r) => r.name).sort()).toEqual(['k2', 'k3', 'k4']);
    } finally {
      await t.close();
    }
  });
});
