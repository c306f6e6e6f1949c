import { existsSync } from 'node:fs';
import { join } from 'node:path';
import Database from 'better-sqlite3';
import { afterEach, describe, expect, it } from 'vitest';
import { DATABASE_FILE, MIGRATIONS, SCHEMA_VERSION, migrate, openStore, schemaVersion } from '../../src/store/index.js';
import { tempDir } from './helpers.js';

const cleanups: (() => void)[] = [];
afterEach(() => cleanups.splice(0).forEach((f) => f()));

describe('openStore', () => {
  it('creates the data folder and one SQLite file in WAL mode with foreign keys on', () => {
    const t = tempDir();
    cleanups.push(t.cleanup);
    const dir = join(t.dir, 'nested', 'data');
    const store = openStore(dir);
    cleanups.unshift(() => store.close());
    expect(existsSync(join(dir, DATABASE_FILE))).toBe(true);
    expect(store.db.pragma('journal_mode', { simple: true })).toBe('wal');
    expect(store.db.pragma('foreign_keys', { simple: true })).toBe(1);
    expect(Number(store.db.pragma('busy_timeout', { simple: true }))).toBeGreaterThan(0);
    expect(schemaVersion(store.db)).toBe(SCHEMA_VERSION);
  });

  it('applies each migration once: reopening applies nothing and keeps data', () => {
    const t = tempDir();
    cleanups.push(t.cleanup);
    const first = openStore(t.dir);
    first.db.prepare("INSERT INTO studies (name, created_at, updated_at) VALUES ('kept', 'x', 'x')").run();
    first.close();
    const again = openStore(t.dir);
    cleanups.unshift(() => again.close());
    expect(migrate(again.db)).toEqual([]);
    expect((again.db.prepare('SELECT COUNT(*) AS n FROM schema_version').get() as { n: number }).n).toBe(MIGRATIONS.length);
    expect((again.db.prepare('SELECT name FROM studies').get() as { name: string }).name).toBe('kept');
  });

  it('upgrades a version-1 database in place, keeping its documents', () => {
    const t = tempDir();
    cleanups.push(t.cleanup);
    const db = new Database(join(t.dir, DATABASE_FILE));
    migrate(db, MIGRATIONS.slice(0, 1));
    db.prepare("INSERT INTO studies (id, name, created_at, updated_at) VALUES (1, 'old', 'x', 'x')").run();
    db.prepare("INSERT INTO imports (id, study_id, file_name, format, size, sha256, original, encoding, mapping, created_at) VALUES (1, 1, 'a.csv', 'csv', 1, 'h', x'00', 'UTF-8', '{}', 'x')").run();
    db.prepare("INSERT INTO documents (study_id, import_id, row_id, question, text, language, language_source, confidence) VALUES (1, 1, 'r1', 'q', 'hello', 'en', 'detected', 0.9)").run();
    db.close();
    const store = openStore(t.dir);
    cleanups.unshift(() => store.close());
    expect(schemaVersion(store.db)).toBe(SCHEMA_VERSION);
    expect(store.db.prepare('SELECT row_id, written_language FROM documents').get()).toEqual({ row_id: 'r1', written_language: null });
  });

  it('rolls a failing migration back entirely and records no version for it', () => {
    const db = new Database(':memory:');
    const broken = [
      { version: 1, description: 'ok', sql: 'CREATE TABLE a (x INTEGER);' },
      { version: 2, description: 'fails half-way', sql: 'CREATE TABLE b (x INTEGER); INSERT INTO nope VALUES (1);' },
    ];
    expect(() => migrate(db, broken)).toThrow();
    expect(schemaVersion(db)).toBe(1);
    const tables = (db.prepare("SELECT name FROM sqlite_master WHERE type = 'table'").all() as { name: string }[]).map((r) => r.name);
    expect(tables).toContain('a');
    expect(tables).not.toContain('b');
    db.close();
  });

  it('refuses a database written by a newer schema', () => {
    const db = new Database(':memory:');
    migrate(db, [{ version: 1, description: 'x', sql: 'CREATE TABLE a (x INTEGER);' }, { version: 2, description: 'y', sql: 'CREATE TABLE b (x INTEGER);' }]);
    expect(() => migrate(db, [{ version: 1, description: 'x', sql: 'CREATE TABLE a (x INTEGER);' }])).toThrow(/newer Themata/);
    db.close();
  });
});
