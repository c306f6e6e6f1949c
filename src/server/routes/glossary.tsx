// Glossaries on the Data page: the section's figures, and the upload that imports a glossary in
// one step (its columns are languages, so there is nothing to map). Wired by dataRoutes, which
// passes its page renderer so an input error is shown on the Data page like other uploads'.
import { Hono, type Context } from 'hono';
import type { GlossarySectionProps } from '../../../views/glossary.js';
import { importGlossary, listGlossaries } from '../../services/index.js';
import { scanUpload } from '../../platform/index.js';
import type { Study } from '../../store/index.js';
import { InputError } from '../../text/index.js';
import { studyFor } from '../access.js';
import type { AppEnv } from '../types.js';
import { text } from './forms.js';

type DataPage = (c: Context<AppEnv>, study: Study, error?: string, status?: 200 | 400) => Response | Promise<Response>;

/** Props of the Data page's Glossaries section. */
export function glossarySection(c: Context<AppEnv>, study: Study, role: { canEdit: boolean; canDelete: boolean }): GlossarySectionProps {
  return {
    base: `/studies/${study.id}`,
    csrf: c.get('csrf'),
    glossaries: listGlossaries(c.get('deps').store, study.id),
    languages: study.languages,
    canEdit: role.canEdit,
    canDelete: role.canDelete,
    justImported: Number(c.req.query('glossary')) || undefined,
  };
}

export function glossaryRoutes(dataPage: DataPage): Hono<AppEnv> {
  const app = new Hono<AppEnv>();
  app.post('/studies/:sid/glossary', async (c) => {
    const study = studyFor(c, 'write');
    const body = await c.req.parseBody();
    const file = body.file;
    if (!(file instanceof File) || file.size === 0) return dataPage(c, study, 'Choose a glossary file to upload (it was missing or empty).', 400);
    const bytes = new Uint8Array(await file.arrayBuffer());
    // Only the last path segment of the browser's name is kept: it is shown, never used as a path.
    const fileName = (file.name.split(/[\\/]/).pop() || 'glossary').slice(0, 200);
    const sheet = text(body.sheet).trim() || undefined;
    try {
      // Scanned before anything reads or keeps the bytes (OWASP ASVS 4.0.3 V12.4.2).
      await scanUpload(c.get('deps').uploadScanner, bytes, fileName);
      const summary = await importGlossary(c.get('deps').store, { study: study.id, bytes, fileName, ...(sheet ? { sheet } : {}) });
      return c.redirect(`/studies/${study.id}/data?glossary=${summary.importId}#glossaries`, 303);
    } catch (error) {
      if (error instanceof InputError) return dataPage(c, study, error.message, 400);
      throw error;
    }
  });
  return app;
}
