// docs/design.md §2: only src/store speaks SQL. sql-boundary.test.ts catches calls on a connection; this
// one catches SQL text itself (a statement built in services, the CLI, jobs, the server or a view
// and handed to the store to run), so repository functions stay the only place queries live.
import { existsSync, readdirSync, readFileSync, statSync } from 'node:fs';
import { join, relative, sep } from 'node:path';
import { describe, expect, it } from 'vitest';

const root = join(import.meta.dirname, '..', '..');

function files(dir: string): string[] {
  if (!existsSync(dir)) return [];
  return readdirSync(dir).flatMap((name) => {
    const path = join(dir, name);
    return statSync(path).isDirectory() ? files(path) : /\.(ts|tsx)$/.test(name) ? [path] : [];
  });
}

/** Statement shapes of SQLite's grammar (SQLite documentation, "SQL As Understood By SQLite"). */
const SQL = [
  /\bSELECT\b[\s\S]{1,200}?\bFROM\s+[a-z_]+/,
  /\bINSERT\s+(OR\s+[A-Z]+\s+)?INTO\s+[a-z_]+/,
  /\bUPDATE\s+[a-z_]+\s+SET\b/,
  /\bDELETE\s+FROM\s+[a-z_]+/,
  /\b(CREATE|DROP|ALTER)\s+(TABLE|INDEX|TRIGGER|VIEW)\b/,
  /\bPRAGMA\s+[a-z_]+/,
  /\bjson_(each|extract)\s*\(/,
];

/** String and template literals of a source file (comments left out). */
function literals(text: string): string[] {
  const noComments = text.replace(/\/\*[\s\S]*?\*\//g, '').replace(/(^|[^:'"`\\])\/\/.*$/gm, '$1');
  return [...noComments.matchAll(/'(?:[^'\\\n]|\\.)*'|"(?:[^"\\\n]|\\.)*"|`(?:[^`\\]|\\.)*`/g)].map((m) => m[0]);
}

describe('SQL text only in src/store', () => {
  it('finds SQL in a literal (the check can fail)', () => {
    expect(literals("const q = store.db.prepare('SELECT id FROM runs WHERE x = ?'); // SELECT a FROM b").some((l) => SQL.some((re) => re.test(l)))).toBe(true);
    expect(literals('// SELECT id FROM runs\nconst a = "select the file";').some((l) => SQL.some((re) => re.test(l)))).toBe(false);
  });

  it('no file in src/services, src/cli, src/jobs, src/server, src/main.ts or views holds an SQL statement', () => {
    const offences: string[] = [];
    const targets = ['services', 'cli', 'jobs', 'server'].flatMap((d) => files(join(root, 'src', d)));
    targets.push(join(root, 'src', 'main.ts'), ...files(join(root, 'views')));
    for (const file of targets) {
      if (!existsSync(file)) continue;
      const rel = relative(root, file).split(sep).join('/');
      for (const lit of literals(readFileSync(file, 'utf8'))) {
        if (SQL.some((re) => re.test(lit))) offences.push(`${rel}: ${lit.slice(0, 80)}`);
      }
    }
    expect(offences).toEqual([]);
  });
});
