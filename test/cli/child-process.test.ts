// The installed entry point (bin/themata.mjs → src/main.ts) as a user runs it: exit codes and
// where output goes.
import { spawnSync } from 'node:child_process';
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { tempDir } from '../store/helpers.js';
import { FIXTURE_FLAGS, surveyCsv, surveyRows } from '../services/survey-fixture.js';

const root = join(import.meta.dirname, '..', '..');
const t = tempDir('themata-bin-');
afterAll(() => t.cleanup());

function themata(...args: string[]) {
  return spawnSync(process.execPath, [join(root, 'bin', 'themata.mjs'), ...args], { encoding: 'utf8', cwd: t.dir, timeout: 120_000 });
}

describe('bin/themata.mjs', () => {
  it('imports with exit code 0 and refuses bad input with exit code 2 and one line on stderr', () => {
    writeFileSync(join(t.dir, 'survey.csv'), surveyCsv(surveyRows(30)));
    const ok = themata('--data', 'data', 'import', 'survey.csv', '--study', 'S', ...FIXTURE_FLAGS);
    expect(ok.stderr).toBe('');
    expect(ok.status).toBe(0);
    expect(ok.stdout).toMatch(/^Imported survey\.csv into study "S"/);
    const bad = themata('--data', 'data', 'import', 'missing.csv', '--study', 'S', '--text', 'answer');
    expect(bad.status).toBe(2);
    expect(bad.stdout).toBe('');
    expect(bad.stderr.trim().split('\n')).toEqual(['themata: There is no file missing.csv.']);
    const help = themata('--help');
    expect(help.status).toBe(0);
    for (const cmd of ['import', 'languages', 'vocabulary', 'fit', 'resume', 'export', 'apply', 'checks', 'contrasts', 'compare-k', 'users', 'serve']) expect(help.stdout).toContain(cmd);
  });
});
