// Temporary data folders for store tests.
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { openStore, type Store } from '../../src/store/index.js';

export function tempDir(prefix = 'themata-test-'): { dir: string; cleanup: () => void } {
  const dir = mkdtempSync(join(tmpdir(), prefix));
  return { dir, cleanup: () => rmSync(dir, { recursive: true, force: true }) };
}

export function withTempStore(): { store: Store; dir: string; cleanup: () => void } {
  const t = tempDir();
  const store = openStore(t.dir);
  return { store, dir: t.dir, cleanup: () => (store.close(), t.cleanup()) };
}
