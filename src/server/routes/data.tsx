// Data: imports list, upload, column mapping, import; sharing a study with other accounts.
import { Hono, type Context } from 'hono';
import { HTTPException } from 'hono/http-exception';
import { DataPage, MappingPage } from '../../../views/pages/data.js';
import { importFile } from '../../services/index.js';
import { describeScanning, scanUpload } from '../../platform/index.js';
import { readInputTable } from '../../services/index.js';
import { addStudyMember, getAccountByName, listImports, listStudyMembers, studyRole, type Study } from '../../store/index.js';
import { InputError, type Table } from '../../text/index.js';
import { frame, studyFor } from '../access.js';
import { mappingFromRoles, PROFILE_ROWS, profileColumns, ROLE_LABELS, type ColumnRole } from '../column-roles.js';
import { renderPage } from '../render.js';
import type { AppEnv } from '../types.js';
import { PendingUploads } from '../uploads.js';
import { text } from './forms.js';
import { glossaryRoutes, glossarySection } from './glossary.js';

function ownerKey(c: Context<AppEnv>): string {
  const u = c.get('user');
  return u.id === null ? 'local' : `account:${u.id}`;
}

function role(c: Context<AppEnv>, study: Study) {
  const u = c.get('user');
  return u.id === null ? 'owner' : studyRole(c.get('deps').store, study.id, u.id);
}

async function dataPage(c: Context<AppEnv>, study: Study, error?: string, status: 200 | 400 = 200) {
  const { store } = c.get('deps');
  const imports = listImports(store, study.id, 'answers').map((i) => {
    const s = i.summary as { documentsPerLanguage?: Record<string, number>; undetermined?: number; excluded?: Record<string, number>; encodingConfidence?: number; encodingNotes?: { message: string }[] };
    return {
      id: i.id,
      fileName: i.fileName,
      format: i.format,
      size: i.size,
      encoding: i.encoding,
      documents: i.documents,
      createdAt: i.createdAt,
      perLanguage: s.documentsPerLanguage ?? {},
      undetermined: s.undetermined ?? 0,
      excluded: s.excluded ?? {},
      textColumns: i.mapping.text,
      ...(s.encodingConfidence !== undefined ? { encodingConfidence: s.encodingConfidence } : {}),
      encodingNotes: (s.encodingNotes ?? []).map((n) => n.message),
    };
  });
  const r = role(c, study);
  const user = c.get('user');
  const members = user.id === null ? undefined : listStudyMembers(store, study.id).map((m) => ({ name: m.name, role: m.role }));
  const justImported = Number(c.req.query('imported')) || undefined;
  return renderPage(
    c,
    <DataPage
      frame={frame(c, `Data · ${study.name}`, { study, active: 'data' })}
      studyId={study.id}
      imports={imports}
      justImported={justImported}
      error={error}
      canEdit={r === 'owner' || r === 'editor'}
      canShare={r === 'owner'}
      members={members}
      declaredLanguages={study.languages}
      scanning={describeScanning(c.get('deps').uploadScanner)}
      glossary={glossarySection(c, study, { canEdit: r === 'owner' || r === 'editor', canDelete: r === 'owner' })}
    />,
    status,
  );
}

function describeAssumed(t: Table): string {
  const a = t.assumed;
  const parts = [`encoding ${a.encoding}${a.encodingConfidence !== undefined ? ` (confidence ${Math.round(100 * a.encodingConfidence)}%)` : ''}`];
  if (a.delimiter) parts.push(`separator ${a.delimiter === '\t' ? 'tab' : `"${a.delimiter}"`}`);
  if (a.sheet) parts.push(`sheet "${a.sheet}"${a.sheets && a.sheets.length > 1 ? ` of ${a.sheets.length} (${a.sheets.join(', ')})` : ''}`);
  if (t.labelledColumns?.length) parts.push(`value labels applied to ${t.labelledColumns.length} columns`);
  return parts.join(', ');
}

export function dataRoutes(): Hono<AppEnv> {
  const app = new Hono<AppEnv>();
  const uploads = new PendingUploads();

  async function mappingPage(c: Context<AppEnv>, study: Study, key: string, upload: { fileName: string; bytes: Uint8Array; sheet?: string }, error?: string) {
    const table = await readInputTable(upload.bytes, upload.fileName, upload.sheet);
    const profiles = profileColumns(table);
    return renderPage(
      c,
      <MappingPage
        frame={frame(c, `Choose columns · ${study.name}`, { study, active: 'data' })}
        studyId={study.id}
        uploadKey={key}
        fileName={upload.fileName}
        format={table.format}
        assumed={describeAssumed(table)}
        rows={table.rows.length}
        sampled={Math.min(table.rows.length, PROFILE_ROWS)}
        columns={profiles}
        roles={ROLE_LABELS}
        preview={table.rows.slice(0, 8)}
        encodingNotes={(table.assumed.encodingNotes ?? []).map((n) => n.message)}
        error={error}
      />,
      error ? 400 : 200,
    );
  }

  app.get('/studies/:sid/data', (c) => dataPage(c, studyFor(c)));
  app.route('/', glossaryRoutes(dataPage));

  app.post('/studies/:sid/data/upload', async (c) => {
    const study = studyFor(c, 'write');
    const body = await c.req.parseBody();
    const file = body.file;
    if (!(file instanceof File) || file.size === 0) return dataPage(c, study, 'Choose a file to upload (it was missing or empty).', 400);
    const bytes = new Uint8Array(await file.arrayBuffer());
    // Keep only the last path segment of what the browser calls the file: it is shown, never used as a path.
    const fileName = (file.name.split(/[\\/]/).pop() || 'upload').slice(0, 200);
    const sheet = text(body.sheet).trim() || undefined;
    // Scanned before anything reads or keeps the bytes (OWASP ASVS 4.0.3 V12.4.2).
    try {
      await scanUpload(c.get('deps').uploadScanner, bytes, fileName);
    } catch (error) {
      if (error instanceof InputError) return dataPage(c, study, error.message, 400);
      throw error;
    }
    const key = uploads.put({ studyId: study.id, owner: ownerKey(c), fileName, bytes, sheet });
    try {
      return await mappingPage(c, study, key, { fileName, bytes, sheet });
    } catch (error) {
      uploads.delete(key);
      if (error instanceof InputError) return dataPage(c, study, error.message, 400);
      throw error;
    }
  });

  app.post('/studies/:sid/data/import', async (c) => {
    const study = studyFor(c, 'write');
    const body = await c.req.parseBody();
    const key = text(body.upload);
    const upload = uploads.get(key, study.id, ownerKey(c));
    if (!upload) return dataPage(c, study, 'That upload has expired (uploads wait one hour for their columns). Upload the file again.', 400);
    const table = await readInputTable(upload.bytes, upload.fileName, upload.sheet);
    const roles = table.columns.map((_, j) => {
      const r = text(body[`role-${j}`]) as ColumnRole;
      return r in ROLE_LABELS ? r : 'ignore';
    });
    const mapping = mappingFromRoles(table.columns, roles);
    if (typeof mapping === 'string') return mappingPage(c, study, key, upload, mapping);
    try {
      const summary = await importFile(c.get('deps').store, { study: study.id, bytes: upload.bytes, fileName: upload.fileName, mapping, sheet: upload.sheet });
      uploads.delete(key);
      return c.redirect(`/studies/${study.id}/data?imported=${summary.importId}`, 303);
    } catch (error) {
      if (error instanceof InputError) return mappingPage(c, study, key, upload, error.message);
      throw error;
    }
  });

  app.post('/studies/:sid/members', async (c) => {
    const study = studyFor(c, 'write');
    const user = c.get('user');
    if (user.id === null) throw new HTTPException(400, { message: 'Sharing needs accounts. Add accounts with `themata users add NAME` first.' });
    if (role(c, study) !== 'owner') throw new HTTPException(403, { message: 'Only an owner of the study can share it.' });
    const body = await c.req.parseBody();
    const { store } = c.get('deps');
    const account = getAccountByName(store, text(body.name));
    if (!account) return dataPage(c, study, `There is no account called "${text(body.name)}".`, 400);
    const r = text(body.role);
    addStudyMember(store, study.id, account.id, r === 'owner' || r === 'editor' ? r : 'viewer');
    return c.redirect(`/studies/${study.id}/data`, 303);
  });
  return app;
}
