// SECURITY.md maps ASVS 4.0.3 level 1 items to tests by file and name (`file › name`, or
// `› name` for another test of the file named just before). This keeps the map honest: every
// test it names must exist under that exact name (a name ending in "…" is matched by its start).
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';

const ROOT = join(import.meta.dirname, '..', '..');

function citations(): { file: string; name: string; line: number }[] {
  const found: { file: string; name: string; line: number }[] = [];
  let file = '';
  readFileSync(join(ROOT, 'SECURITY.md'), 'utf8')
    .split('\n')
    .forEach((text, i) => {
      for (const m of text.matchAll(/`(test\/[^`\s]+)? ?› ([^`]+)`/g)) {
        if (m[1]) file = m[1];
        found.push({ file, name: m[2].trim(), line: i + 1 });
      }
    });
  return found;
}

describe('SECURITY.md', () => {
  it('names only tests that exist, under their exact names', () => {
    const cited = citations();
    expect(cited.length).toBeGreaterThan(60);
    const missing: string[] = [];
    for (const { file, name, line } of cited) {
      const path = join(ROOT, file);
      if (!file || !existsSync(path)) {
        missing.push(`line ${line}: no file ${file}`);
        continue;
      }
      const source = readFileSync(path, 'utf8');
      const wanted = name.endsWith('…') ? name.slice(0, -1).trim() : name;
      const quoted = [`'${wanted}`, `"${wanted}`, `\`${wanted}`];
      const whole = name.endsWith('…') ? quoted : quoted.map((q) => `${q}${q[0]}`);
      if (!whole.some((q) => source.includes(q))) missing.push(`line ${line}: ${file} › ${name}`);
    }
    expect(missing).toEqual([]);
  });
});
