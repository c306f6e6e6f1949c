// Virus scanning of uploads (OWASP ASVS 4.0.3 V12.4.2) with an operator-configured scanner: the
// workbench upload form, `themata import` and `themata serve`, against a stand-in scanner
// (test/fixtures/scan/fake-scanner.mjs) that answers with ClamAV's exit codes. The EICAR test
// string (https://www.eicar.org/download-anti-malware-testfile/) is put together at run time.
import { spawn, type ChildProcess } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startServer } from '../../src/server/index.js';
import { parseScanCommand, scannerFromSetting, scanUpload, type UploadScanner } from '../../src/platform/index.js';
import { createStudy, listStudies, openStore, type Store } from '../../src/store/index.js';
import { InputError } from '../../src/text/types.js';
import { cli } from '../cli/cli-harness.js';
import { FIXTURE_FLAGS, surveyCsv, surveyRows } from '../services/survey-fixture.js';
import { idFrom, inventedSurvey, LOCAL_CSRF, makeApp, postFile, postForm, type TestApp } from '../server/helpers.js';

const FAKE = join(import.meta.dirname, '..', 'fixtures', 'scan', 'fake-scanner.mjs');
const EICAR = ['X5O!P%@AP[4\\PZX54(P^)7CC)7}$', 'EICAR-STANDARD-ANTIVIRUS-', 'TEST-FILE!H+H*'].join('');
/** The setting as an operator would write it (quoted, as paths may hold spaces). */
const setting = (mode = '') => `"${process.execPath}" "${FAKE}"${mode ? ` ${mode}` : ''}`;
const scanner = (mode = '', extra: Partial<UploadScanner> = {}): UploadScanner => ({ ...scannerFromSetting(setting(mode), {})!, ...extra });
const infectedCsv = () => `${inventedSurvey(6)}r-99,${EICAR},en,North,1\n`;

function count(store: Store, table: 'imports' | 'documents'): number {
  return (store.db.prepare(`SELECT COUNT(*) AS n FROM ${table}`).get() as { n: number }).n;
}

function scanApp(uploadScanner: UploadScanner | undefined): TestApp {
  return makeApp({ loopbackOnly: true, uploadScanner });
}

async function newStudy(t: TestApp, name: string): Promise<number> {
  const res = await postForm(t, '/studies', { name, _csrf: LOCAL_CSRF });
  expect(res.status).toBe(303);
  return idFrom(res.headers.get('Location'));
}

describe('the scan command setting', () => {
  it('splits the scan command on white space and keeps double-quoted arguments whole', () => {
    expect(parseScanCommand('clamdscan --no-summary --fdpass -')).toEqual(['clamdscan', '--no-summary', '--fdpass', '-']);
    expect(parseScanCommand('  "/opt/my scanner/scan" --flag "" "say \\"hi\\""  ')).toEqual(['/opt/my scanner/scan', '--flag', '', 'say "hi"']);
    expect(() => parseScanCommand('scan "unclosed')).toThrow(InputError);
  });

  it('takes the flag over THEMATA_SCAN_COMMAND and scans nothing when neither is set', () => {
    expect(scannerFromSetting('clamscan -', { THEMATA_SCAN_COMMAND: 'clamdscan -' })?.command).toEqual(['clamscan', '-']);
    expect(scannerFromSetting(undefined, { THEMATA_SCAN_COMMAND: 'clamdscan -' })?.command).toEqual(['clamdscan', '-']);
    expect(scannerFromSetting(undefined, {})).toBeUndefined();
    expect(scannerFromSetting(undefined, { THEMATA_SCAN_COMMAND: '  ' })).toBeUndefined();
  });
});

describe('scanning uploads in the workbench', () => {
  let t: TestApp;
  const logged: string[] = [];
  beforeAll(() => {
    t = scanApp(scanner('', { log: (l) => logged.push(l) }));
  });
  afterAll(() => t.close());

  it('imports a clean upload after the scan and says on the Data page that uploads are scanned', async () => {
    const studyId = await newStudy(t, 'Scanned park survey');
    const page = await (await t.app.request(`/studies/${studyId}/data`)).text();
    expect(page).toContain(`Uploads are checked for viruses by ${process.execPath} before they are read.`);
    const up = await postFile(t, `/studies/${studyId}/data/upload`, { _csrf: LOCAL_CSRF }, { name: 'park.csv', bytes: inventedSurvey(12) });
    expect(up.status).toBe(200);
    const key = (await up.text()).match(/name="upload" value="([^"]+)"/)![1];
    const imp = await postForm(t, `/studies/${studyId}/data/import`, { upload: key, 'role-0': 'id', 'role-1': 'text', 'role-2': 'language', _csrf: LOCAL_CSRF });
    expect(imp.status).toBe(303);
    expect(count(t.store, 'imports')).toBe(1);
    expect(count(t.store, 'documents')).toBe(12);
  });

  it('refuses an upload holding the EICAR test string, shows the scanner report, and stores nothing', async () => {
    const studyId = await newStudy(t, 'Infected upload');
    const before = { imports: count(t.store, 'imports'), documents: count(t.store, 'documents') };
    const res = await postFile(t, `/studies/${studyId}/data/upload`, { _csrf: LOCAL_CSRF }, { name: 'wave<2>.csv', bytes: infectedCsv() });
    expect(res.status).toBe(400);
    const html = await res.text();
    expect(html).toContain('The virus scanner refused this file; nothing was imported. The scanner reported: stdin: Eicar-Test-Signature FOUND');
    expect(html).not.toContain('name="upload"'); // no mapping step: the bytes were never parsed or kept
    expect({ imports: count(t.store, 'imports'), documents: count(t.store, 'documents') }).toEqual(before);
  });

  it('refuses an upload when the scanner fails (fail closed) and logs the detail without the file contents', async () => {
    const crashing = scanApp(scanner('--crash', { log: (l) => logged.push(l) }));
    try {
      const studyId = await newStudy(crashing, 'Scanner down');
      const res = await postFile(crashing, `/studies/${studyId}/data/upload`, { _csrf: LOCAL_CSRF }, { name: 'park.csv', bytes: inventedSurvey(6) });
      expect(res.status).toBe(400);
      expect(await res.text()).toContain('The virus scan could not be completed');
      expect(count(crashing.store, 'imports')).toBe(0);
      const line = logged.at(-1)!;
      expect(line).toMatch(/^Upload scan failed \(\d+ bytes, .+\): exit code 2; scanner said: fake-scanner: cannot open the signature database$/);
      expect(line).not.toContain('playground');
    } finally {
      await crashing.close();
    }
  });

  it('refuses an upload when the scanner does not answer within the time limit', async () => {
    const hanging = scanApp(scanner('--hang', { timeoutMs: 500, log: (l) => logged.push(l) }));
    try {
      const studyId = await newStudy(hanging, 'Scanner hangs');
      const res = await postFile(hanging, `/studies/${studyId}/data/upload`, { _csrf: LOCAL_CSRF }, { name: 'park.csv', bytes: inventedSurvey(6) });
      expect(res.status).toBe(400);
      expect(await res.text()).toContain('The virus scan could not be completed');
      expect(logged.at(-1)).toContain('no answer within 1 s');
      expect(count(hanging.store, 'imports')).toBe(0);
    } finally {
      await hanging.close();
    }
  }, 15_000);

  it('refuses when the scanner program cannot be started', async () => {
    const lines: string[] = [];
    await expect(scanUpload({ command: [join(tmpdir(), 'no-such-scanner-program')], log: (l) => lines.push(l) }, new Uint8Array([1]), 'a.csv')).rejects.toThrow(
      'The virus scan could not be completed',
    );
    expect(lines[0]).toContain('could not start');
  });

  it('without a scanner uploads work as before and the Data page says they are not scanned', async () => {
    const plain = scanApp(undefined);
    try {
      const studyId = await newStudy(plain, 'Not scanned');
      expect(await (await plain.app.request(`/studies/${studyId}/data`)).text()).toContain('Uploads are not checked for viruses on this workbench');
      const up = await postFile(plain, `/studies/${studyId}/data/upload`, { _csrf: LOCAL_CSRF }, { name: 'park.csv', bytes: infectedCsv() });
      expect(up.status).toBe(200);
      expect(await up.text()).toContain('name="upload"');
    } finally {
      await plain.close();
    }
  });
});

describe('scanning with themata import', () => {
  let dir: string;
  beforeAll(() => {
    dir = mkdtempSync(join(tmpdir(), 'themata-scan-cli-'));
    writeFileSync(join(dir, 'clean.csv'), surveyCsv(surveyRows(20)));
    const rows = surveyRows(20);
    rows[3] = { ...rows[3], answer: EICAR };
    writeFileSync(join(dir, 'infected.csv'), surveyCsv(rows));
  });
  afterAll(() => rmSync(dir, { recursive: true, force: true }));
  const data = () => join(dir, 'data');
  const studies = () => {
    const store = openStore(data());
    try {
      return listStudies(store).map((s) => s.name);
    } finally {
      store.close();
    }
  };

  it('imports a clean file with --scan-command', async () => {
    const r = await cli(['--data', data(), 'import', join(dir, 'clean.csv'), '--study', 'Clean', '--scan-command', setting(), ...FIXTURE_FLAGS]);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    expect(r.stdout).toContain('Imported clean.csv into study "Clean"');
  });

  it('refuses a file holding the EICAR test string with exit code 2 and imports nothing', async () => {
    const r = await cli(['--data', data(), 'import', join(dir, 'infected.csv'), '--study', 'Infected', '--scan-command', setting(), ...FIXTURE_FLAGS]);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('The scanner reported: stdin: Eicar-Test-Signature FOUND');
    expect(studies()).not.toContain('Infected');
  });

  it('reads THEMATA_SCAN_COMMAND, fails closed when the scanner fails, and lets --scan-command win', async () => {
    const saved = process.env.THEMATA_SCAN_COMMAND;
    process.env.THEMATA_SCAN_COMMAND = setting('--crash');
    try {
      const failed = await cli(['--data', data(), 'import', join(dir, 'clean.csv'), '--study', 'Env', ...FIXTURE_FLAGS]);
      expect(failed.code).toBe(2);
      expect(failed.stderr).toContain('The virus scan could not be completed');
      expect(studies()).not.toContain('Env');
      const flagWins = await cli(['--data', data(), 'import', join(dir, 'clean.csv'), '--study', 'Env', '--scan-command', setting(), ...FIXTURE_FLAGS]);
      expect(flagWins.code).toBe(0);
    } finally {
      if (saved === undefined) delete process.env.THEMATA_SCAN_COMMAND;
      else process.env.THEMATA_SCAN_COMMAND = saved;
    }
  });
});

describe('scanning with themata serve', () => {
  let dir: string;
  const children: ChildProcess[] = [];
  beforeAll(() => {
    dir = mkdtempSync(join(tmpdir(), 'themata-scan-serve-'));
    const store = openStore(dir);
    createStudy(store, { name: 'Served' });
    store.close();
  });
  afterAll(async () => {
    await Promise.all(children.filter((c) => c.exitCode === null).map((c) => new Promise<void>((resolve) => {
      c.once('exit', () => resolve());
      c.kill('SIGTERM');
    })));
    rmSync(dir, { recursive: true, force: true });
  });

  it('startServer scans with the command in THEMATA_SCAN_COMMAND', async () => {
    const saved = process.env.THEMATA_SCAN_COMMAND;
    process.env.THEMATA_SCAN_COMMAND = setting();
    const running = await startServer({ dataDir: dir, port: 0, requestLimits: false });
    try {
      const page = await (await fetch(`${running.url}studies/1/data`)).text();
      expect(page).toContain('Uploads are checked for viruses by');
    } finally {
      if (saved === undefined) delete process.env.THEMATA_SCAN_COMMAND;
      else process.env.THEMATA_SCAN_COMMAND = saved;
      await running.close();
    }
  });

  it('themata serve --scan-command says at start that uploads are scanned', async () => {
    const bin = join(import.meta.dirname, '..', '..', 'bin', 'themata.mjs');
    const child = spawn(process.execPath, [bin, '--data', dir, 'serve', '--port', '0', '--scan-command', setting()], {
      stdio: ['ignore', 'pipe', 'pipe'],
      env: { ...process.env, THEMATA_SCAN_COMMAND: '' },
    });
    children.push(child);
    const text = await new Promise<string>((resolve, reject) => {
      let out = '';
      child.stdout!.on('data', (c: Buffer) => {
        out += c.toString();
        if (out.includes('viruses')) resolve(out);
      });
      child.stderr!.on('data', (c: Buffer) => (out += c.toString()));
      child.once('exit', (code) => reject(new Error(`themata serve stopped (exit ${code}): ${out}`)));
    });
    expect(text).toContain(`Uploads are checked for viruses by ${process.execPath} before they are read.`);
  }, 30_000);
});
