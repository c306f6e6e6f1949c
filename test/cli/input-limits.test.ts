// Issue 14: the command line printed a 2 MB error line for a header of 200,000 columns. Every
// message built from a file is bounded: one short line on stderr, exit code 2.
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { tempDir } from '../store/helpers.js';
import { cli } from './cli-harness.js';

let t: ReturnType<typeof tempDir>;
beforeAll(() => {
  t = tempDir('themata-cli-limits-');
  const wide = Array.from({ length: 200_000 }, (_, i) => `c${i}`);
  writeFileSync(join(t.dir, 'wide.csv'), `${wide.join(',')}\n${wide.map(() => 'x').join(',')}\n`);
  const many = Array.from({ length: 900 }, (_, i) => `question_${i}`);
  writeFileSync(join(t.dir, 'many.csv'), `${many.join(',')}\n${many.map(() => 'x').join(',')}\n`);
});
afterAll(() => t.cleanup());

describe('command-line messages from a file stay short', () => {
  it('refuses a header of 200,000 columns in one short line', async () => {
    const r = await cli(['--data', join(t.dir, 'data'), 'import', join(t.dir, 'wide.csv'), '--study', 'Wide', '--languages', 'en', '--text', 'c1']);
    expect(r.code).toBe(2);
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
    expect(r.stderr).toContain('over the limit of 1,000 columns for one import');
    expect(r.stderr.length).toBeLessThan(500);
  });

  it('names a missing column with at most a dozen of the file\'s 900 columns', async () => {
    const r = await cli(['--data', join(t.dir, 'data'), 'import', join(t.dir, 'many.csv'), '--study', 'Many', '--languages', 'en', '--text', 'answer']);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('there is no column "answer" (chosen as text column)');
    expect(r.stderr).toContain('"question_11" … and 888 more.');
    expect(r.stderr.length).toBeLessThan(600);
  });
});
