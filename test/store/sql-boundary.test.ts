// docs/design.md §2: src/store is the only code that speaks SQL. Checked by reading every source file.
import { existsSync, readdirSync, readFileSync, statSync } from 'node:fs';
import { join, relative } from 'node:path';
import { describe, expect, it } from 'vitest';

const root = join(import.meta.dirname, '..', '..');

function files(dir: string): string[] {
  if (!existsSync(dir)) return [];
  return readdirSync(dir).flatMap((name) => {
    const path = join(dir, name);
    return statSync(path).isDirectory() ? files(path) : /\.(ts|tsx)$/.test(name) ? [path] : [];
  });
}

describe('SQL boundary', () => {
  it('no file outside src/store imports better-sqlite3 or runs SQL on a store connection', () => {
    const offences: string[] = [];
    for (const file of [...files(join(root, 'src')), ...files(join(root, 'views'))]) {
      const rel = relative(root, file);
      if (rel.startsWith(join('src', 'store'))) continue;
      const text = readFileSync(file, 'utf8');
      if (/from\s+['"]better-sqlite3['"]/.test(text)) offences.push(`${rel} imports better-sqlite3`);
      if (/\.db\s*\.\s*(prepare|exec|pragma|transaction|function)\s*\(/.test(text)) offences.push(`${rel} runs SQL`);
    }
    expect(offences).toEqual([]);
  });
});
