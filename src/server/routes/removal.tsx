// Deleting a study, one imported file or one run (OWASP ASVS 4.0.3 V8.3.2). Owners only:
// editors and viewers are refused (403) and people without access see "not found" (404), as
// everywhere else. A GET shows what would be removed; only a POST with the CSRF token (and, for
// a study, its name typed again) deletes.
import { Hono, type Context } from 'hono';
import { HTTPException } from 'hono/http-exception';
import { RemovalPage, RemovedPage } from '../../../views/pages/removal.js';
import {
  describeRunContents,
  formatBytes,
  planImportRemoval,
  planRunRemoval,
  planStudyRemoval,
  removeImport,
  removeRun,
  removeStudy,
  type RemovalOutcome,
} from '../../services/index.js';
import { studyRole, type Study } from '../../store/index.js';
import { InputError } from '../../text/index.js';
import { frame, runFor, studyFor } from '../access.js';
import { renderPage } from '../render.js';
import type { AppEnv } from '../types.js';
import { text } from './forms.js';

function count(n: number, one: string, many = `${one}s`): string {
  return `${n.toLocaleString('en')} ${n === 1 ? one : many}`;
}

/** The study in the path, if the current user owns it. */
function ownedStudyFor(c: Context<AppEnv>): Study {
  const study = studyFor(c, 'write');
  const user = c.get('user');
  if (user.id !== null && studyRole(c.get('deps').store, study.id, user.id) !== 'owner') {
    throw new HTTPException(403, { message: "Only the study's owner can delete it or anything in it." });
  }
  return study;
}

function importIdOf(c: Context<AppEnv>): number {
  const raw = c.req.param('fid') ?? '';
  if (!/^\d{1,12}$/.test(raw)) throw new HTTPException(404, { message: 'There is no such page.' });
  return Number(raw);
}

export function removalRoutes(): Hono<AppEnv> {
  const app = new Hono<AppEnv>();

  const done = (c: Context<AppEnv>, outcome: RemovalOutcome, next: string, nextLabel: string, study?: Study) =>
    renderPage(c, <RemovedPage frame={frame(c, 'Deleted', study ? { study } : {})} message={outcome.message} next={next} nextLabel={nextLabel} walNote={!outcome.walTruncated} />);

  async function studyPage(c: Context<AppEnv>, study: Study, error?: string) {
    const { store, queue } = c.get('deps');
    const plan = planStudyRemoval(store, study.id, queue);
    const s = plan.contents;
    return renderPage(
      c,
      <RemovalPage
        frame={frame(c, `Delete · ${study.name}`, { study })}
        what="study"
        name={study.name}
        removes={[
          `${count(s.imports, 'imported file')}, with the original files as uploaded (${formatBytes(s.originalBytes)})`,
          count(s.answers, 'answer'),
          `the vocabulary (${count(s.vocabularyWords, 'word')}) and ${count(s.ownWords, 'own stop word')}`,
          `${count(s.runs, 'run')} with ${count(s.results, 'stored result')}, ${count(s.checkpoints, 'checkpoint')}, ${count(s.labels, 'theme label')} and ${count(s.exports, 'exported file')} kept in Themata`,
          ...(s.members > 0 ? [`${count(s.members, 'person', 'people')}'s access to the study`] : []),
        ]}
        stopping={plan.stopping}
        refusal={plan.refusal}
        typeName
        action={`/studies/${study.id}/delete`}
        back={`/studies/${study.id}/data`}
        error={error}
      />,
      error ? 400 : 200,
    );
  }

  app.get('/studies/:sid/delete', (c) => studyPage(c, ownedStudyFor(c)));

  app.post('/studies/:sid/delete', async (c) => {
    const study = ownedStudyFor(c);
    const body = await c.req.parseBody();
    if (text(body.confirmName).trim() !== study.name) return studyPage(c, study, `The name you typed is not "${study.name}". Nothing was deleted.`);
    try {
      const outcome = await removeStudy(c.get('deps').store, study.id, c.get('deps').queue);
      return done(c, outcome, '/', 'Back to the studies');
    } catch (error) {
      if (error instanceof InputError) return studyPage(c, study, error.message);
      throw error;
    }
  });

  async function importPage(c: Context<AppEnv>, study: Study, importId: number, error?: string) {
    const plan = planImportRemoval(c.get('deps').store, importId);
    if (plan.study.id !== study.id) throw new HTTPException(404, { message: 'There is no such file in this study.' });
    const r = plan.record;
    return renderPage(
      c,
      <RemovalPage
        frame={frame(c, `Delete · ${r.fileName}`, { study, active: 'data' })}
        what="file"
        name={r.fileName}
        removes={[`the original file as uploaded (${formatBytes(r.size)})`, `its ${count(r.documents, r.kind === 'glossary' ? 'glossary term document' : 'answer')}`, "their words in the study's vocabulary (rebuilt without them)"]}
        refusal={plan.refusal}
        action={`/studies/${study.id}/imports/${r.id}/delete`}
        back={`/studies/${study.id}/data`}
        error={error}
      />,
      error ? 400 : 200,
    );
  }

  const ownImport = (c: Context<AppEnv>, study: Study) => {
    const id = importIdOf(c);
    try {
      if (planImportRemoval(c.get('deps').store, id).study.id === study.id) return id;
    } catch (error) {
      if (!(error instanceof InputError)) throw error;
    }
    throw new HTTPException(404, { message: 'There is no such file in this study.' });
  };

  app.get('/studies/:sid/imports/:fid/delete', (c) => {
    const study = ownedStudyFor(c);
    return importPage(c, study, ownImport(c, study));
  });

  app.post('/studies/:sid/imports/:fid/delete', async (c) => {
    const study = ownedStudyFor(c);
    const id = ownImport(c, study);
    try {
      const outcome = await removeImport(c.get('deps').store, id);
      return done(c, outcome, `/studies/${study.id}/data`, 'Back to the data', study);
    } catch (error) {
      if (error instanceof InputError) return importPage(c, study, id, error.message);
      throw error;
    }
  });

  async function runPage(c: Context<AppEnv>, study: Study, runId: number, error?: string) {
    const plan = planRunRemoval(c.get('deps').store, runId, c.get('deps').queue);
    return renderPage(
      c,
      <RemovalPage
        frame={frame(c, `Delete · ${plan.run.name}`, { study, active: 'runs' })}
        what="run"
        name={plan.run.name}
        removes={[`the run's settings, status and progress`, describeRunContents(plan.contents)]}
        stopping={plan.stopping ? [plan.run.name] : []}
        refusal={plan.refusal}
        action={`/studies/${study.id}/runs/${runId}/delete`}
        back={`/studies/${study.id}/runs`}
        error={error}
      />,
      error ? 400 : 200,
    );
  }

  app.get('/studies/:sid/runs/:rid/delete', (c) => {
    const study = ownedStudyFor(c);
    return runPage(c, study, runFor(c, study).id);
  });

  app.post('/studies/:sid/runs/:rid/delete', async (c) => {
    const study = ownedStudyFor(c);
    const run = runFor(c, study);
    try {
      const outcome = await removeRun(c.get('deps').store, run.id, c.get('deps').queue);
      return done(c, outcome, `/studies/${study.id}/runs`, 'Back to the runs', study);
    } catch (error) {
      if (error instanceof InputError) return runPage(c, study, run.id, error.message);
      throw error;
    }
  });

  return app;
}
