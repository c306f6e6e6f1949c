// Export (prepare the files of docs/design.md §8 and the printable report; download them) and Apply
// (code a new file with this run). Downloads come only from the run's own prepared files,
// looked up by id and checked to belong to this run; names are never used as paths.
import { Hono, type Context } from 'hono';
import { HTTPException } from 'hono/http-exception';
import { ApplyPage, ExportPage } from '../../../views/pages/export.js';
import { applyRun, buildBundle } from '../../services/index.js';
import { describeCovariateNote } from '../../services/index.js';
import { bundleFileName, exportFiles, exportTables } from '../../services/index.js';
import { exportWorkbook } from '../../services/index.js';
import { getRunExportBytes, inTransaction, listImports, listRunExports, saveRunExport, studyRole, type Study } from '../../store/index.js';
import { InputError } from '../../text/index.js';
import { scanUpload } from '../../platform/index.js';
import { finishedRunFor, frame, studyFor } from '../access.js';
import { renderPage } from '../render.js';
import { reportHtml } from '../results/report.js';
import type { RunDataCache } from '../results/run-data.js';
import type { AppEnv } from '../types.js';
import { text } from './forms.js';

function canEdit(c: Context<AppEnv>, study: Study): boolean {
  const user = c.get('user');
  if (user.id === null) return true;
  const role = studyRole(c.get('deps').store, study.id, user.id);
  return role === 'owner' || role === 'editor';
}

function contentDisposition(name: string): string {
  const ascii = name.replace(/[^\x20-\x7e]/g, '_').replace(/["\\]/g, '_');
  return `attachment; filename="${ascii}"; filename*=UTF-8''${encodeURIComponent(name)}`;
}

export function exportRoutes(cache: RunDataCache): Hono<AppEnv> {
  const app = new Hono<AppEnv>();

  function load(c: Context<AppEnv>, need: 'read' | 'write' = 'read') {
    const study = studyFor(c, need);
    const run = finishedRunFor(c, study);
    const data = cache.get(run.id);
    if (!data) throw new HTTPException(409, { message: 'This run finished without saved results.' });
    return { study, run, data, base: `/studies/${study.id}/runs/${run.id}` };
  }

  app.get('/studies/:sid/runs/:rid/export', (c) => {
    const { study, run, base } = load(c);
    const all = listRunExports(c.get('deps').store, run.id).filter((f) => !f.fileName.startsWith('coded-'));
    const latest = new Map<string, (typeof all)[number]>();
    for (const f of all) if (!latest.has(f.fileName)) latest.set(f.fileName, f);
    return renderPage(
      c,
      <ExportPage
        frame={frame(c, `Export · ${run.name}`, { study, run, active: 'export' })}
        base={base}
        files={[...latest.values()]}
        canEdit={canEdit(c, study)}
        bundleName={bundleFileName(run.name)}
        message={c.req.query('prepared') ? 'The files are ready.' : undefined}
      />,
    );
  });

  app.post('/studies/:sid/runs/:rid/export', async (c) => {
    const { study, run, data, base } = load(c, 'write');
    const { store } = c.get('deps');
    const body = await c.req.parseBody();
    // Checkboxes send nothing when cleared: "choices" says the form was sent, so both default to on.
    const chosen = (name: string) => body.choices !== '1' || body[name] === '1';
    const tables = exportTables(store, data.model, { answerText: chosen('answerText') });
    const files = exportFiles(store, data.model, tables);
    if (chosen('workbook')) files.splice(3, 0, await exportWorkbook(tables));
    const report = new TextEncoder().encode(await reportHtml(store, study, data));
    inTransaction(store, () => {
      for (const f of files) saveRunExport(store, run.id, f.name, f.mediaType, f.bytes);
      saveRunExport(store, run.id, 'report.html', 'text/html; charset=utf-8', report);
    });
    return c.redirect(`${base}/export?prepared=1`, 303);
  });

  app.get('/studies/:sid/runs/:rid/export/files/:fid', (c) => {
    const { run } = load(c);
    const id = Number(c.req.param('fid'));
    const { store } = c.get('deps');
    const owned = Number.isInteger(id) && listRunExports(store, run.id).some((f) => f.id === id);
    const file = owned ? getRunExportBytes(store, id) : undefined;
    if (!file) throw new HTTPException(404, { message: 'There is no such file for this run. Prepare the files on the Export page.' });
    return c.body(file.bytes as Uint8Array<ArrayBuffer>, 200, {
      'Content-Type': file.mediaType,
      'Content-Disposition': contentDisposition(file.fileName),
      'X-Content-Type-Options': 'nosniff',
      'Cache-Control': 'no-store',
    });
  });

  function applyPage(c: Context<AppEnv>, extra: { error?: string; result?: Parameters<typeof ApplyPage>[0]['result'] } = {}) {
    const { study, run, base } = load(c);
    const textColumns = [...new Set(listImports(c.get('deps').store, study.id).flatMap((i) => i.mapping.text))];
    return renderPage(
      c,
      <ApplyPage frame={frame(c, `Apply · ${run.name}`, { study, run, active: 'apply' })} base={base} textColumns={textColumns} canEdit={canEdit(c, study)} {...extra} />,
      extra.error ? 400 : 200,
    );
  }

  app.get('/studies/:sid/runs/:rid/apply', (c) => applyPage(c));

  app.post('/studies/:sid/runs/:rid/apply', async (c) => {
    const { run, data } = load(c, 'write');
    const { store } = c.get('deps');
    const body = await c.req.parseBody();
    const file = body.file;
    if (!(file instanceof File) || file.size === 0) return applyPage(c, { error: 'Choose a file of new answers (it was missing or empty).' });
    const fileName = (file.name.split(/[\\/]/).pop() || 'upload').slice(0, 200);
    try {
      const bytes = new Uint8Array(await file.arrayBuffer());
      // Scanned like every upload before it is read (OWASP ASVS 4.0.3 V12.4.2; scan-upload.ts).
      await scanUpload(c.get('deps').uploadScanner, bytes, fileName);
      const answerText = body.choices !== '1' || body.answerText === '1';
      const out = await applyRun(buildBundle(store, data.model), { bytes, fileName, sheet: text(body.sheet).trim() || undefined, answerText });
      const stem = fileName.replace(/\.[^.]+$/, '').replace(/[^\p{L}\p{N}._-]+/gu, '-').slice(0, 80) || 'answers';
      const name = `coded-${stem}.csv`;
      const fileId = saveRunExport(store, run.id, name, out.file.mediaType, out.file.bytes);
      const { summary } = out;
      return applyPage(c, {
        result: {
          fileId,
          fileName: name,
          ...summary,
          missingColumns: summary.missingColumns.map((m) => `"${m.column}" (${m.role})`),
          covariateNotes: summary.covariateNotes.map(describeCovariateNote),
        },
      });
    } catch (error) {
      if (error instanceof InputError) return applyPage(c, { error: error.message });
      throw error;
    }
  });
  return app;
}
