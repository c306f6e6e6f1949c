// The one-way dependencies of DESIGN §2, checked by reading every import in src/.
// The pure core (text, model, eval, stats) must not reach SQL, HTTP or the file system, and must
// not import the layers above it; server and CLI never import each other's modules.
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join, relative, sep } from 'node:path';
import { describe, expect, it } from 'vitest';

const root = join(import.meta.dirname, '..', '..');
const src = join(root, 'src');

function sourceFiles(dir: string): string[] {
  const out: string[] = [];
  for (const name of readdirSync(dir)) {
    const path = join(dir, name);
    if (statSync(path).isDirectory()) out.push(...sourceFiles(path));
    else if (/\.(ts|tsx)$/.test(name)) out.push(path);
  }
  return out;
}

function importsOf(file: string): string[] {
  const text = readFileSync(file, 'utf8');
  const found: string[] = [];
  const pattern = /(?:import|export)\s[^'"]*?from\s*['"]([^'"]+)['"]|import\(\s*['"]([^'"]+)['"]\s*\)|require\(\s*['"]([^'"]+)['"]\s*\)/g;
  for (const match of text.matchAll(pattern)) found.push(match[1] ?? match[2] ?? match[3]);
  return found;
}

const pureLayers = ['text', 'model', 'eval', 'stats'];
const forbiddenInPure = [/^better-sqlite3$/, /^hono/, /^@hono\//, /^(node:)?fs(\/promises)?$/, /^(node:)?path$/, /^(node:)?https?$/, /^(node:)?net$/];
const higherLayers = ['store', 'jobs', 'server', 'services', 'cli'];

describe('layering (DESIGN §2)', () => {
  for (const layer of pureLayers) {
    it(`src/${layer} imports no SQL, HTTP, file-system module or higher layer`, () => {
      const offences: string[] = [];
      for (const file of sourceFiles(join(src, layer))) {
        for (const spec of importsOf(file)) {
          const rel = relative(src, file);
          if (forbiddenInPure.some((re) => re.test(spec))) offences.push(`${rel} imports ${spec}`);
          if (spec.startsWith('.')) {
            const target = relative(src, join(file, '..', spec)).split(sep)[0];
            if (higherLayers.includes(target.replace(/\.(js|ts)$/, ''))) offences.push(`${rel} imports ${spec}`);
          }
        }
      }
      expect(offences).toEqual([]);
    });
  }

  it('the server never imports the command line', () => {
    const offences: string[] = [];
    for (const file of sourceFiles(join(src, 'server'))) {
      for (const spec of importsOf(file)) if (/cli(\.js|\/)/.test(spec)) offences.push(`${relative(src, file)} imports ${spec}`);
    }
    expect(offences).toEqual([]);
  });
});
