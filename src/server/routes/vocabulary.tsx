// Vocabulary: sizes, top words, the study's own stop words, pruning settings (saved in the
// study's settings, applied by rebuilding the vocabulary over the whole study). A word search is
// posted (POST …/vocabulary/search), so the words stay out of addresses (OWASP ASVS 4.0.3 V8.3.1).
import { Hono, type Context } from 'hono';
import { VocabularyPage } from '../../../views/pages/vocabulary.js';
import { pipelineSettings } from '../../services/index.js';
import { openStopWords, stemmerName, surveyLexicon } from '../../text/index.js';
import { rebuildVocabulary } from '../../services/index.js';
import { exclusionSummary, getStudyWordLists, setStudyWordList, studyRole, topWords, updateStudy, vocabularySizes } from '../../store/index.js';
import { frame, studyFor } from '../access.js';
import { renderPage } from '../render.js';
import type { AppEnv } from '../types.js';
import { intField, numberField, queryInt, text } from './forms.js';

const PAGE = 40;

function wordList(raw: string): string[] {
  return [...new Set(raw.split(/[\r\n,]+/).map((w) => w.trim().toLowerCase()).filter((w) => w && w.length <= 100))].slice(0, 5000);
}

export function vocabularyRoutes(): Hono<AppEnv> {
  const app = new Hono<AppEnv>();

  // A `q` in the address is ignored: searches arrive only in a POST body.
  app.get('/studies/:sid/vocabulary', (c) =>
    vocabularyPage(c, { language: c.req.query('language'), search: '', offset: queryInt(c.req.query('offset'), 0), saved: Boolean(c.req.query('saved')) }),
  );

  app.post('/studies/:sid/vocabulary/search', async (c) => {
    const body = await c.req.parseBody();
    return vocabularyPage(c, { language: text(body.language), search: text(body.q).slice(0, 100), offset: queryInt(text(body.offset), 0), saved: false });
  });

  function vocabularyPage(c: Context<AppEnv>, query: { language: string | undefined; search: string; offset: number; saved: boolean }) {
    const study = studyFor(c);
    const { store } = c.get('deps');
    const sizes = vocabularySizes(store, study.id);
    const language = sizes.some((s) => s.language === query.language) ? query.language! : (sizes[0]?.language ?? '');
    const { search, offset } = query;
    const words = language ? topWords(store, study.id, language, { limit: PAGE, offset, search: search || undefined }) : [];
    const totalWords = search ? offset + words.length + (words.length === PAGE ? PAGE : 0) : (sizes.find((s) => s.language === language)?.words ?? 0);
    const collocations = language
      ? topWords(store, study.id, language, { limit: 2000 })
          .filter((w) => /[ _]/.test(w.stem))
          .slice(0, 30)
          .map((w) => ({ surface: w.surface, count: w.count }))
      : [];
    const lists = getStudyWordLists(store, study.id);
    const s = pipelineSettings(study.settings.pipeline, {});
    const user = c.get('user');
    const role = user.id === null ? 'owner' : studyRole(store, study.id, user.id);
    return renderPage(
      c,
      <VocabularyPage
        frame={frame(c, `Vocabulary · ${study.name}`, { study, active: 'vocabulary' })}
        studyId={study.id}
        sizes={sizes}
        language={language}
        words={words}
        search={search}
        offset={offset}
        limit={PAGE}
        totalWords={totalWords}
        collocations={collocations}
        ownWords={lists[language] ?? []}
        ownWordsAll={lists['*'] ?? []}
        settings={{
          stemming: s.stemming,
          foldDiacritics: s.foldDiacritics,
          minCount: s.minCount,
          maxDocShare: s.maxDocShare,
          minTokens: s.minTokens,
          collocationNpmi: s.collocationNpmi,
          collocationMinCount: s.collocationMinCount,
        }}
        excluded={exclusionSummary(store, study.id)}
        standard={{
          stemmer: language ? (s.stemming ? stemmerName(language) : null) : null,
          stopWords: language ? openStopWords(language) : [],
          fillers: (language && surveyLexicon(language)?.fillers) || [],
          nonAnswers: (language && surveyLexicon(language)?.nonAnswers) || [],
          kept: (language && surveyLexicon(language)?.keep) || [],
        }}
        canEdit={role === 'owner' || role === 'editor'}
        message={query.saved ? 'Saved. The vocabulary was rebuilt; new runs use it (finished runs keep theirs).' : undefined}
      />,
    );
  }

  app.post('/studies/:sid/vocabulary/words', async (c) => {
    const study = studyFor(c, 'write');
    const { store } = c.get('deps');
    const body = await c.req.parseBody();
    const language = text(body.language).slice(0, 20);
    if (language && language !== '*') setStudyWordList(store, study.id, language, wordList(text(body.words)));
    setStudyWordList(store, study.id, '*', wordList(text(body.wordsAll)));
    rebuildVocabulary(store, study.id);
    return c.redirect(`/studies/${study.id}/vocabulary?language=${encodeURIComponent(language)}&saved=1`, 303);
  });

  app.post('/studies/:sid/vocabulary/settings', async (c) => {
    const study = studyFor(c, 'write');
    const { store } = c.get('deps');
    const body = await c.req.parseBody();
    const current = pipelineSettings(study.settings.pipeline, {});
    const minCount = intField(body.minCount, 'Minimum count', 1, 1000, current.minCount);
    const maxDocShare = numberField(body.maxDocShare, 'Largest share of answers', 0.01, 1, current.maxDocShare);
    const minTokens = intField(body.minTokens, 'Fewest kept words', 1, 100, current.minTokens);
    const npmiRaw = text(body.collocationNpmi).trim();
    const npmi = npmiRaw === '' ? null : numberField(npmiRaw, 'Word-pair association', 0, 1);
    const collocationMinCount = intField(body.collocationMinCount, 'Word-pair count', 2, 10000, current.collocationMinCount);
    const problems = [minCount, maxDocShare, minTokens, npmi, collocationMinCount].filter((v): v is string => typeof v === 'string');
    const language = text(body.language).slice(0, 20);
    if (problems.length) return c.text(problems.join(' '), 400);
    const pipeline = {
      stemming: text(body.stemming) === '1',
      foldDiacritics: text(body.foldDiacritics) === '1',
      minCount,
      maxDocShare,
      minTokens,
      collocationNpmi: npmi,
      collocationMinCount,
    };
    updateStudy(store, study.id, { settings: { ...study.settings, pipeline } });
    rebuildVocabulary(store, study.id);
    return c.redirect(`/studies/${study.id}/vocabulary?language=${encodeURIComponent(language)}&saved=1`, 303);
  });
  return app;
}
