// Numbered schema migrations. Each runs once, in its own transaction, and records its number in
// `schema_version`; a database newer than this program is refused rather than guessed at.
import type BetterSqlite3 from 'better-sqlite3';

export interface Migration {
  readonly version: number;
  readonly description: string;
  readonly sql: string;
}

export const MIGRATIONS: readonly Migration[] = [
  {
    version: 1,
    description: 'accounts, studies, imports, documents, vocabularies, runs and results',
    sql: `
CREATE TABLE accounts (
  id INTEGER PRIMARY KEY,
  name TEXT NOT NULL UNIQUE,
  password_hash TEXT NOT NULL,
  created_at TEXT NOT NULL
);
CREATE TABLE sessions (
  id TEXT PRIMARY KEY,              -- SHA-256 of the session token, never the token itself
  account_id INTEGER NOT NULL REFERENCES accounts(id) ON DELETE CASCADE,
  csrf TEXT NOT NULL,
  expires_at TEXT NOT NULL
);
CREATE INDEX sessions_account ON sessions(account_id);
CREATE TABLE studies (
  id INTEGER PRIMARY KEY,
  name TEXT NOT NULL UNIQUE,
  languages TEXT NOT NULL DEFAULT '[]',
  settings TEXT NOT NULL DEFAULT '{}',
  created_at TEXT NOT NULL,
  updated_at TEXT NOT NULL
);
CREATE TABLE study_members (
  study_id INTEGER NOT NULL REFERENCES studies(id) ON DELETE CASCADE,
  account_id INTEGER NOT NULL REFERENCES accounts(id) ON DELETE CASCADE,
  role TEXT NOT NULL CHECK (role IN ('owner', 'editor', 'viewer')),
  PRIMARY KEY (study_id, account_id)
);
CREATE TABLE imports (
  id INTEGER PRIMARY KEY,
  study_id INTEGER NOT NULL REFERENCES studies(id) ON DELETE CASCADE,
  file_name TEXT NOT NULL,
  format TEXT NOT NULL,
  size INTEGER NOT NULL,
  sha256 TEXT NOT NULL,
  original BLOB NOT NULL,
  encoding TEXT NOT NULL,
  mapping TEXT NOT NULL,
  summary TEXT NOT NULL DEFAULT '{}',
  created_at TEXT NOT NULL
);
CREATE INDEX imports_study ON imports(study_id);
CREATE TABLE documents (
  id INTEGER PRIMARY KEY,
  study_id INTEGER NOT NULL REFERENCES studies(id) ON DELETE CASCADE,
  import_id INTEGER NOT NULL REFERENCES imports(id) ON DELETE CASCADE,
  row_id TEXT NOT NULL,
  question TEXT NOT NULL,
  text TEXT NOT NULL,
  language TEXT,
  language_source TEXT NOT NULL,
  confidence REAL NOT NULL,
  declared_language TEXT,
  link_key TEXT,
  covariates TEXT NOT NULL DEFAULT '{}',
  weight REAL NOT NULL DEFAULT 1,
  excluded TEXT,
  tokens BLOB,
  vocabulary_language TEXT
);
CREATE INDEX documents_study_language ON documents(study_id, language);
CREATE INDEX documents_import ON documents(import_id);
CREATE TABLE vocabularies (
  study_id INTEGER NOT NULL REFERENCES studies(id) ON DELETE CASCADE,
  language TEXT NOT NULL,
  word_id INTEGER NOT NULL,
  stem TEXT NOT NULL,
  surface TEXT NOT NULL,
  count INTEGER NOT NULL,
  doc_count INTEGER NOT NULL,
  PRIMARY KEY (study_id, language, word_id)
);
CREATE TABLE study_word_lists (
  study_id INTEGER NOT NULL REFERENCES studies(id) ON DELETE CASCADE,
  language TEXT NOT NULL,            -- '*' = every language
  word TEXT NOT NULL,
  PRIMARY KEY (study_id, language, word)
);
CREATE TABLE runs (
  id INTEGER PRIMARY KEY,
  study_id INTEGER NOT NULL REFERENCES studies(id) ON DELETE CASCADE,
  name TEXT NOT NULL,
  settings TEXT NOT NULL,
  status TEXT NOT NULL CHECK (status IN ('queued', 'running', 'interrupted', 'cancelled', 'failed', 'finished')),
  progress TEXT NOT NULL DEFAULT '{}',
  error TEXT,
  created_at TEXT NOT NULL,
  started_at TEXT,
  finished_at TEXT,
  UNIQUE (study_id, name)
);
CREATE INDEX runs_status ON runs(status);
CREATE TABLE run_checkpoints (
  run_id INTEGER NOT NULL REFERENCES runs(id) ON DELETE CASCADE,
  sweep INTEGER NOT NULL,
  bytes BLOB NOT NULL,
  created_at TEXT NOT NULL,
  PRIMARY KEY (run_id, sweep)
);
CREATE TABLE run_results (
  run_id INTEGER NOT NULL REFERENCES runs(id) ON DELETE CASCADE,
  key TEXT NOT NULL,
  kind TEXT NOT NULL CHECK (kind IN ('f64', 'f32', 'i32', 'u16', 'u8', 'json')),
  shape TEXT NOT NULL DEFAULT '[]',
  bytes BLOB NOT NULL,
  PRIMARY KEY (run_id, key)
);
CREATE TABLE theme_labels (
  run_id INTEGER NOT NULL REFERENCES runs(id) ON DELETE CASCADE,
  theme INTEGER NOT NULL,
  label TEXT NOT NULL,
  PRIMARY KEY (run_id, theme)
);
CREATE TABLE run_exports (
  id INTEGER PRIMARY KEY,
  run_id INTEGER NOT NULL REFERENCES runs(id) ON DELETE CASCADE,
  file_name TEXT NOT NULL,
  media_type TEXT NOT NULL,
  bytes BLOB NOT NULL,
  created_at TEXT NOT NULL
);
CREATE INDEX run_exports_run ON run_exports(run_id);
`,
  },
  {
    version: 2,
    description: 'language each answer is written in, judged from its text alone',
    sql: `
ALTER TABLE documents ADD COLUMN written_language TEXT;
`,
  },
  {
    version: 3,
    description: 'which process runs a fit (process id, host name) and when it last gave a sign of life',
    sql: `
ALTER TABLE runs ADD COLUMN owner_pid INTEGER;
ALTER TABLE runs ADD COLUMN owner_host TEXT;
ALTER TABLE runs ADD COLUMN heartbeat_at TEXT;
`,
  },
  {
    version: 4,
    description: 'checkpoints larger than one SQLite value stored in several parts',
    // better-sqlite3 refuses to bind a value of more than about 512 MB, and a fit of a million
    // answers keeps G×K posterior sums that are larger; run_checkpoints.bytes holds part 0.
    sql: `
CREATE TABLE run_checkpoint_parts (
  run_id INTEGER NOT NULL,
  sweep INTEGER NOT NULL,
  part INTEGER NOT NULL CHECK (part >= 1),
  bytes BLOB NOT NULL,
  PRIMARY KEY (run_id, sweep, part),
  FOREIGN KEY (run_id, sweep) REFERENCES run_checkpoints(run_id, sweep) ON DELETE CASCADE
);
`,
  },
  {
    version: 5,
    description: 'when and by whom a password was last changed, and sign-ins, so the account is told of changes',
    // OWASP ASVS 4.0.3 V2.2.3, V2.5.5. password_changes counts changes; an account and each session
    // remember the count they have been told about, so "changed since" never depends on two
    // timestamps falling in different milliseconds.
    sql: `
ALTER TABLE accounts ADD COLUMN password_changed_at TEXT;
ALTER TABLE accounts ADD COLUMN password_changed_by TEXT CHECK (password_changed_by IN ('account', 'operator'));
ALTER TABLE accounts ADD COLUMN password_changes INTEGER NOT NULL DEFAULT 0;
ALTER TABLE accounts ADD COLUMN last_sign_in_at TEXT;
ALTER TABLE accounts ADD COLUMN password_changes_at_sign_in INTEGER NOT NULL DEFAULT 0;
ALTER TABLE sessions ADD COLUMN signed_in_at TEXT;
ALTER TABLE sessions ADD COLUMN previous_sign_in_at TEXT;
ALTER TABLE sessions ADD COLUMN password_changes_told INTEGER NOT NULL DEFAULT 0;
`,
  },
  {
    version: 6,
    description: 'what an import holds: answers, or a glossary whose rows become link groups of tiny documents',
    // docs/design.md §3: a glossary (one row per concept, one column per language) is imported as link
    // groups; its documents tie languages together in the fit but are never answers.
    sql: `
ALTER TABLE imports ADD COLUMN kind TEXT NOT NULL DEFAULT 'answers' CHECK (kind IN ('answers', 'glossary'));
`,
  },
  {
    version: 7,
    description: 'what the text said about the declared language, and the second language of answers written in two',
    sql: `
ALTER TABLE documents ADD COLUMN declared_check TEXT CHECK (declared_check IN ('confirmed', 'kept', 'overruled'));
ALTER TABLE documents ADD COLUMN mixed_language TEXT;
ALTER TABLE documents ADD COLUMN mixed_share REAL;
`,
  },
];

/** Highest migration number this program knows. */
export const SCHEMA_VERSION = MIGRATIONS[MIGRATIONS.length - 1].version;

/** Current schema version of `db` (0 when empty). */
export function schemaVersion(db: BetterSqlite3.Database): number {
  db.exec('CREATE TABLE IF NOT EXISTS schema_version (version INTEGER PRIMARY KEY, applied_at TEXT NOT NULL)');
  const row = db.prepare('SELECT MAX(version) AS v FROM schema_version').get() as { v: number | null };
  return row.v ?? 0;
}

/** Apply every pending migration, each in its own transaction. Returns the versions applied. */
export function migrate(db: BetterSqlite3.Database, migrations: readonly Migration[] = MIGRATIONS): number[] {
  const current = schemaVersion(db);
  const newest = migrations.length ? migrations[migrations.length - 1].version : 0;
  if (current > newest) {
    throw new Error(`This data folder was written by a newer Themata (schema ${current}; this program knows up to ${newest}). Update Themata before opening it.`);
  }
  const applied: number[] = [];
  for (const m of migrations) {
    if (m.version <= current) continue;
    db.transaction(() => {
      db.exec(m.sql);
      db.prepare('INSERT INTO schema_version (version, applied_at) VALUES (?, ?)').run(m.version, new Date().toISOString());
    })();
    applied.push(m.version);
  }
  return applied;
}
