// Languages: counts, confidence, undetermined answers, declared-vs-written disagreements, and
// overrides (one by one or in bulk). An override re-runs the vocabulary so runs see it.
import { Hono, type Context } from 'hono';
import { LanguagesPage } from '../../../views/pages/languages.js';
import { rebuildVocabulary } from '../../services/index.js';
import { glossaryTermsByLanguage } from '../../services/index.js';
import { adoptWrittenLanguages, languageSummary, listDocuments, overrideLanguages, studyRole, type DocumentFilter } from '../../store/index.js';
import { frame, studyFor } from '../access.js';
import { renderPage } from '../render.js';
import type { AppEnv } from '../types.js';
import { queryInt, text, texts } from './forms.js';

const PAGE = 50;

/** Back to the Languages page the form came from (never elsewhere), saying how many changed. */
function back(c: Context<AppEnv>, studyId: number, from: string, changed: number) {
  const target = from.startsWith(`/studies/${studyId}/languages`) ? from : `/studies/${studyId}/languages`;
  return c.redirect(`${target}${target.includes('?') ? '&' : '?'}changed=${changed}`, 303);
}

export function languageRoutes(): Hono<AppEnv> {
  const app = new Hono<AppEnv>();

  app.get('/studies/:sid/languages', (c) => {
    const study = studyFor(c);
    const { store } = c.get('deps');
    const summary = languageSummary(store, study.id);
    const bins = new Array<number>(10).fill(0);
    for (const r of summary) r.confidenceBins.forEach((n, i) => (bins[i] += n));
    const undetermined = summary.find((r) => r.language === null)?.documents ?? 0;
    const disagreements = summary.reduce((s, r) => s + r.disagreements, 0);
    const show = c.req.query('show') ?? (undetermined > 0 ? 'undetermined' : disagreements > 0 ? 'disagreements' : 'all');
    const filterLanguage = c.req.query('language') ?? '';
    const filter: DocumentFilter = {};
    if (show === 'undetermined') filter.language = null;
    else if (show === 'disagreements') filter.disagreements = true;
    else if (show === 'mixed') filter.mixed = true;
    if (filterLanguage && show !== 'undetermined') filter.language = filterLanguage;
    const offset = queryInt(c.req.query('offset'), 0);
    const page = listDocuments(store, study.id, filter, { offset, limit: PAGE });
    const found = summary.map((r) => r.language).filter((l): l is string => l !== null);
    const choices = [...new Set([...study.languages, ...found])].sort();
    const user = c.get('user');
    const role = user.id === null ? 'owner' : studyRole(store, study.id, user.id);
    const changed = Number(c.req.query('changed'));
    return renderPage(
      c,
      <LanguagesPage
        frame={frame(c, `Languages · ${study.name}`, { study, active: 'languages' })}
        studyId={study.id}
        rows={summary}
        bins={bins}
        show={show}
        filterLanguage={filterLanguage}
        answers={page.rows.map((d) => ({
          id: d.id,
          rowId: d.rowId,
          text: d.text,
          language: d.language,
          declared: d.declaredLanguage,
          source: d.languageSource,
          confidence: d.confidence,
          excluded: d.excluded,
          written: d.writtenLanguage,
          check: d.declaredCheck,
          mixed: d.mixedLanguage === null ? null : { language: d.mixedLanguage, share: d.mixedShare ?? 0 },
        }))}
        review={{
          writtenDiffers: listDocuments(store, study.id, { writtenDiffers: true }, { limit: 0 }).total,
          mixed: listDocuments(store, study.id, { mixed: true }, { limit: 0 }).total,
          overruled: listDocuments(store, study.id, { declaredCheck: 'overruled' }, { limit: 0 }).total,
        }}
        total={page.total}
        offset={offset}
        limit={PAGE}
        choices={choices}
        canEdit={role === 'owner' || role === 'editor'}
        glossaryTerms={{ byLanguage: glossaryTermsByLanguage(store, study.id), dataHref: `/studies/${study.id}/data` }}
        message={Number.isInteger(changed) && changed >= 0 && c.req.query('changed') !== undefined ? `Changed the language of ${changed} answer${changed === 1 ? '' : 's'}; the vocabulary was rebuilt.` : undefined}
      />,
    );
  });

  app.post('/studies/:sid/languages/override', async (c: Context<AppEnv>) => {
    const study = studyFor(c, 'write');
    const { store } = c.get('deps');
    const body = await c.req.parseBody({ all: true });
    const one = text(body.one);
    let ids: number[];
    let language: string;
    if (one) {
      ids = [Number(one)];
      language = text(body[`lang-${one}`]);
    } else {
      ids = texts(body.ids).map(Number);
      language = text(body.bulk);
    }
    ids = ids.filter((n) => Number.isInteger(n) && n > 0);
    const found = new Set([...study.languages, ...languageSummary(store, study.id).map((r) => r.language).filter((l): l is string => l !== null)]);
    if (language !== '-' && !found.has(language)) language = '';
    let changed = 0;
    if (ids.length > 0 && language !== '') {
      changed = overrideLanguages(store, study.id, ids, language === '-' ? null : language);
      rebuildVocabulary(store, study.id);
    }
    return back(c, study.id, text(body.back), changed);
  });

  // Accept the language an answer is written in (judged from its text) for one answer, or for
  // every answer whose decided language differs from it; the declared language stays stored.
  app.post('/studies/:sid/languages/accept-written', async (c: Context<AppEnv>) => {
    const study = studyFor(c, 'write');
    const { store } = c.get('deps');
    const body = await c.req.parseBody({ all: true });
    const one = Number(text(body.one));
    const all = text(body.all) === '1';
    let changed = 0;
    if (Number.isInteger(one) && one > 0) changed = adoptWrittenLanguages(store, study.id, [one]);
    else if (all) changed = adoptWrittenLanguages(store, study.id);
    if (changed > 0) rebuildVocabulary(store, study.id);
    return back(c, study.id, text(body.back), changed);
  });
  return app;
}
