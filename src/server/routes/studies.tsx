// Studies: list and create; deleting a study, a file or a run lives in removal.tsx.
import { Hono, type Context } from 'hono';
import { StudiesPage } from '../../../views/pages/studies.js';
import { addStudyMember, createStudy, getStudyByName, listStudies } from '../../store/index.js';
import { frame, studyFor } from '../access.js';
import { renderPage } from '../render.js';
import type { AppEnv } from '../types.js';
import { parseLanguageList } from './forms.js';
import { removalRoutes } from './removal.js';

export function studyRoutes(): Hono<AppEnv> {
  const app = new Hono<AppEnv>();
  const page = (c: Context<AppEnv>, error?: string, name?: string, status: 200 | 400 = 200) => {
    const { store } = c.get('deps');
    const user = c.get('user');
    const studies = listStudies(store, user.id === null ? {} : { accountId: user.id }).map((s) => ({
      id: s.id,
      name: s.name,
      documents: s.documents,
      imports: s.imports,
      runs: s.runs,
      languages: s.languagesFound.length ? s.languagesFound : s.languages,
      lastActivity: s.lastActivity,
    }));
    return renderPage(c, <StudiesPage frame={frame(c, 'Studies')} studies={studies} error={error} name={name} />, status);
  };
  app.get('/', (c) => page(c));
  app.get('/studies', (c) => c.redirect('/', 303));
  app.post('/studies', async (c) => {
    const { store } = c.get('deps');
    const body = await c.req.parseBody();
    const name = typeof body.name === 'string' ? body.name.trim() : '';
    if (!name) return page(c, 'Give the study a name.', name, 400);
    if (name.length > 200) return page(c, 'Keep the name under 200 characters.', name, 400);
    if (getStudyByName(store, name)) return page(c, `A study called "${name}" already exists. Choose another name.`, name, 400);
    const languages = parseLanguageList(body.languages);
    if (typeof languages === 'string') return page(c, languages, name, 400);
    const study = createStudy(store, { name, languages });
    const user = c.get('user');
    if (user.id !== null) addStudyMember(store, study.id, user.id, 'owner');
    return c.redirect(`/studies/${study.id}/data`, 303);
  });
  app.get('/studies/:sid', (c) => c.redirect(`/studies/${studyFor(c).id}/data`, 303));
  app.route('/', removalRoutes());
  return app;
}
