// Issue 8, item 5 (imports): the real workbench process is killed with SIGKILL at seeded random
// moments while it imports a file of 2,000 answers through its web forms, ten times, and started
// again on the same data folder each time. After every kill the SQLite file must pass
// `PRAGMA integrity_check` (SQLite documentation, "PRAGMA integrity_check") and every import must
// be all there (its row, its original bytes, every answer, the study's vocabulary) or not there at
// all; an import the server had confirmed must never be lost.
import { createHash } from 'node:crypto';
import { readFileSync } from 'node:fs';
import { parse } from 'csv-parse/sync';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Xoshiro128 } from '../../src/model/rng.js';
import { databaseProblems, inspect, LocalClient, sleep, startServerProcess, tempFolder, type ServerProcess } from './server-process.js';

const ANSWERS = 2000;
const KILLS = 10;

/** The first ANSWERS records of the invented demo survey, written back as RFC 4180 CSV. */
function surveyFile(): Uint8Array {
  const records = parse(readFileSync(new URL('../../demo/library-survey.csv', import.meta.url)), { bom: true, relax_column_count: true }) as string[][];
  const quote = (cell: string) => `"${cell.replace(/"/g, '""')}"`;
  const lines = records.slice(0, ANSWERS + 1).map((r) => r.map(quote).join(','));
  return new TextEncoder().encode(`${lines.join('\r\n')}\r\n`);
}

/** Column roles of the demo file on the mapping form (docs/design.md §3). */
const ROLES: Record<string, string> = {
  answer_id: 'id',
  answer: 'text',
  questionnaire_language: 'language',
  link_key: 'link',
  branch_region: 'categorical',
  channel: 'categorical',
  age_band: 'categorical',
  wave: 'categorical',
  weight: 'weight',
};

interface StudyState {
  imports: number;
  documents: number;
  vocabularyWords: number;
  sha256: string | null;
  summaryDocuments: number | null;
}

function studyState(dataDir: string, studyId: number): StudyState {
  return inspect(dataDir, (db) => {
    const imp = db.prepare('SELECT id, original, summary FROM imports WHERE study_id = ?').all(studyId) as { id: number; original: Buffer; summary: string }[];
    const documents = (db.prepare('SELECT COUNT(*) AS n FROM documents WHERE study_id = ?').get(studyId) as { n: number }).n;
    const vocabularyWords = (db.prepare('SELECT COUNT(*) AS n FROM vocabularies WHERE study_id = ?').get(studyId) as { n: number }).n;
    return {
      imports: imp.length,
      documents,
      vocabularyWords,
      sha256: imp.length ? createHash('sha256').update(imp[0].original).digest('hex') : null,
      summaryDocuments: imp.length ? ((JSON.parse(imp[0].summary) as { documents?: number }).documents ?? null) : null,
    };
  });
}

describe('killing the server during imports', () => {
  const folder = tempFolder('themata-crash-import-');
  const file = surveyFile();
  const fileHash = createHash('sha256').update(file).digest('hex');
  let server: ServerProcess | undefined;

  beforeAll(() => {
    expect(file.byteLength).toBeGreaterThan(100_000);
  });
  afterAll(async () => {
    await server?.kill();
    folder.cleanup();
  });

  async function begin(client: LocalClient, name: string): Promise<{ studyId: number; fields: Record<string, string> }> {
    const created = await client.postForm('/studies', { name, languages: '' });
    expect(created.status, await created.clone().text()).toBe(303);
    const studyId = Number(/\/studies\/(\d+)/.exec(created.headers.get('Location') ?? '')![1]);
    const mapping = await client.postFile(`/studies/${studyId}/data/upload`, {}, { name: 'library-survey.csv', bytes: file });
    const page = await mapping.text();
    expect(mapping.status, page.slice(0, 500)).toBe(200);
    const upload = /name="upload" value="([^"]+)"/.exec(page)![1];
    const header = parse(new TextDecoder().decode(file).split('\r\n')[0]) as string[][];
    const fields: Record<string, string> = { upload };
    header[0].forEach((column, j) => (fields[`role-${j}`] = ROLES[column] ?? 'ignore'));
    return { studyId, fields };
  }

  it('keeps every import whole or absent, and the database sound, over ten kills', { timeout: 300_000 }, async () => {
    // An uninterrupted import first: what "whole" means, and how long an import takes.
    server = await startServerProcess(folder.dir);
    let client = new LocalClient(server.url);
    const first = await begin(client, 'Crash 0');
    const started = performance.now();
    const done = await client.postForm(`/studies/${first.studyId}/data/import`, first.fields);
    const importMs = performance.now() - started;
    expect(done.status, (await done.text()).slice(0, 800)).toBe(303);
    const whole = studyState(folder.dir, first.studyId);
    expect(whole).toMatchObject({ imports: 1, documents: ANSWERS, sha256: fileHash, summaryDocuments: ANSWERS });
    expect(whole.vocabularyWords).toBeGreaterThan(100);

    const rng = Xoshiro128.fromSeed(20261202);
    const confirmed = new Set<number>([first.studyId]);
    const studies = [first.studyId];
    const outcomes = { absent: 0, whole: 0 };
    const killedAt: string[] = [];
    for (let i = 1; i <= KILLS; i++) {
      const { studyId, fields } = await begin(client, `Crash ${i}`);
      studies.push(studyId);
      // Half the kills in the first half of the import, half around its end, where the
      // transaction commits (a machine busier or idler than during the first import shifts both).
      const u = rng.nextDouble();
      const delay = importMs * (i % 2 === 1 ? 0.6 * u : 0.7 + 0.5 * u);
      let answered = false;
      const request = client
        .postForm(`/studies/${studyId}/data/import`, fields)
        .then((r) => (answered = r.status === 303))
        .catch(() => undefined); // the connection dies with the server
      await sleep(delay);
      await server.kill();
      await request;
      if (answered) confirmed.add(studyId);

      inspect(folder.dir, (db) => expect(databaseProblems(db), `after kill ${i}`).toEqual([]));
      for (const id of studies) {
        const state = studyState(folder.dir, id);
        if (state.imports === 0) {
          expect(confirmed.has(id), `a confirmed import of study ${id} was lost (kill ${i})`).toBe(false);
          expect(state, `study ${id} after kill ${i}`).toMatchObject({ documents: 0, vocabularyWords: 0 });
        } else {
          expect(state, `study ${id} after kill ${i}`).toEqual(whole);
        }
        if (id === studyId) outcomes[state.imports === 0 ? 'absent' : 'whole']++;
        if (id === studyId) killedAt.push(`${Math.round(delay)}ms:${state.imports === 0 ? 'absent' : 'whole'}${answered ? '+confirmed' : ''}`);
      }

      server = await startServerProcess(folder.dir);
      client = new LocalClient(server.url);
      const page = await client.get(`/studies/${studyId}/data`);
      expect(page.status, `Data page after restart ${i}`).toBe(200);
    }
    // The seeded moments must have caught imports before their commit, or the test proves little.
    expect(outcomes.absent, `import took ${Math.round(importMs)} ms; kills: ${killedAt.join(' ')}`).toBeGreaterThanOrEqual(3);
    await server.kill();
    server = undefined;
    inspect(folder.dir, (db) => expect(databaseProblems(db)).toEqual([]));
  });
});
