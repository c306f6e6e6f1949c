// `npm start` (serve --demo) on an empty data folder: the demo study is imported once and one run
// of the demo's eight themes is queued, so a newcomer's first screens have themes to show; a
// second start reuses both.
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { startServer, DEMO_RUN } from '../../src/server/start.js';
import { getStudyByName, listRuns, openStore } from '../../src/store/index.js';
import { DEMO_STUDY_NAME } from '../../src/services/index.js';

describe('serve --demo on an empty data folder', () => {
  const dataDir = mkdtempSync(join(tmpdir(), 'themata-demo-start-'));
  afterAll(() => rmSync(dataDir, { recursive: true, force: true }));

  it('imports the demo study and queues one demo run, once', async () => {
    const first = await startServer({ dataDir, port: 0, demo: true });
    const page = await fetch(first.url);
    expect(await page.text()).toContain(DEMO_STUDY_NAME);
    await first.close();
    const second = await startServer({ dataDir, port: 0, demo: true });
    await second.close();
    const store = openStore(dataDir);
    try {
      const study = getStudyByName(store, DEMO_STUDY_NAME)!;
      expect(study).toBeDefined();
      const runs = listRuns(store, study.id);
      expect(runs.map((r) => r.name)).toEqual([DEMO_RUN.name]);
    } finally {
      store.close();
    }
  });
});
