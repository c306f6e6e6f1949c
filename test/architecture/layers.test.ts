// The one-way dependencies of docs/design.md §2, checked by reading every import in src/.
// The pure core (text, model, eval, stats) must not reach SQL, HTTP or the file system, and must
// not import the layers above it; server and CLI never import each other's modules.
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { dirname, join, relative, resolve, sep } from 'node:path';
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

describe('layering (docs/design.md §2)', () => {
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

  it('the command line never imports the server (src/main.ts, the composition root, wires them)', () => {
    const offences: string[] = [];
    for (const file of sourceFiles(join(src, 'cli'))) {
      for (const spec of importsOf(file)) if (/(^|\/)server(\.js|\/)/.test(spec)) offences.push(`${relative(src, file)} imports ${spec}`);
    }
    expect(offences).toEqual([]);
    expect(importsOf(join(src, 'main.ts'))).toEqual(['./cli/index.js', './server/index.js']);
  });

  it('no module is imported by a computed name, which this test could not see', () => {
    // The worker launchers build the boot script of a worker thread as text; it imports by URL there.
    const launchers = new Set(['platform/typescript-runtime.ts', 'model/parallel/spawn.ts']);
    const offences: string[] = [];
    for (const file of sourceFiles(src)) {
      const rel = relative(src, file).split(sep).join('/');
      if (launchers.has(rel)) continue;
      const text = readFileSync(file, 'utf8').replace(/\/\/.*$/gm, '');
      for (const m of text.matchAll(/\bimport\(\s*([^'"\s)])/g)) offences.push(`${rel}: import(${m[1]}…`);
    }
    expect(offences).toEqual([]);
  });

  it('operating-system adapters live in src/platform: child processes and worker threads', () => {
    const offences: string[] = [];
    for (const file of sourceFiles(src)) {
      const rel = relative(src, file).split(sep).join('/');
      if (rel.startsWith('platform/')) continue;
      if (importsOf(file).some((spec) => /^(node:)?child_process$/.test(spec))) offences.push(`${rel} starts child processes`);
      // The parallel sampler's launcher (lead's src/model/parallel/spawn.ts) is the one known exception.
      if (rel !== 'model/parallel/spawn.ts' && /new Worker\(/.test(readFileSync(file, 'utf8'))) offences.push(`${rel} starts worker threads`);
    }
    expect(offences).toEqual([]);
  });

  it("imports across folders go through the folder's index.ts", () => {
    const found: string[] = [];
    for (const file of sourceFiles(src)) {
      const from = relative(src, file);
      const top = from.split(sep)[0].replace(/\.(ts|tsx)$/, '');
      for (const spec of importsOf(file)) {
        if (!spec.startsWith('.')) continue;
        const target = relative(src, resolve(dirname(file), spec));
        if (target.startsWith('..')) continue; // views/ and the like
        const parts = target.split(sep);
        if (parts[0].replace(/\.(js|ts|tsx)$/, '') === top || parts.length === 1) continue;
        if (parts.length === 2 && /^index\.(js|ts)$/.test(parts[1])) continue;
        found.push(`${from.split(sep).join('/')}: ${spec}`);
      }
    }
    expect(found.sort()).toEqual([]);
  });
});
