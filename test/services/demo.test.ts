import { describe, expect, it } from 'vitest';
import { DEMO_STUDY_NAME, ensureDemoStudy } from '../../src/services/index.js';
import { createStudy, listStudies } from '../../src/store/index.js';
import { withTempStore } from '../store/helpers.js';

describe('ensureDemoStudy', () => {
  it('imports the committed demo survey once into an empty data folder, then reuses it', async () => {
    const ctx = withTempStore();
    try {
      const first = await ensureDemoStudy(ctx.store);
      expect(first.status).toBe('imported');
      expect(first.summary!.documents).toBeGreaterThan(1000);
      expect(Object.keys(first.summary!.vocabularySizes).length).toBeGreaterThanOrEqual(4);
      const again = await ensureDemoStudy(ctx.store);
      expect(again).toMatchObject({ status: 'present', studyId: first.studyId });
      expect(listStudies(ctx.store).map((s) => s.name)).toEqual([DEMO_STUDY_NAME]);
    } finally {
      ctx.cleanup();
    }
  });

  it('does not add the demo to a data folder that already holds studies', async () => {
    const ctx = withTempStore();
    try {
      createStudy(ctx.store, { name: 'Mine' });
      expect((await ensureDemoStudy(ctx.store)).status).toBe('skipped');
    } finally {
      ctx.cleanup();
    }
  });
});
