// Accounts, sessions and study membership for the workbench. Session tokens are random and
// only their SHA-256 is stored, so a copy of the database does not let anyone log in.
import { createHash, randomBytes } from 'node:crypto';
import { inTransaction, now, type Store } from './database.js';
import { hashPassword, verifyPassword } from './password.js';

export interface Account {
  readonly id: number;
  readonly name: string;
  readonly createdAt: string;
}

export type StudyRole = 'owner' | 'editor' | 'viewer';

/** Shortest password accepted: 12 characters (OWASP ASVS 4.0.3, requirement 2.1.1). */
export const MIN_PASSWORD_LENGTH = 12;

export function createAccount(store: Store, name: string, password: string): Account {
  const clean = name.trim();
  if (!clean) throw new Error('An account needs a name.');
  // Characters, not UTF-16 units: an emoji counts once (ASVS 2.1.1 counts characters).
  if ([...password].length < MIN_PASSWORD_LENGTH) throw new Error(`Choose a password of at least ${MIN_PASSWORD_LENGTH} characters.`);
  if (getAccountByName(store, clean)) throw new Error(`An account named "${clean}" already exists.`);
  const info = store.db.prepare('INSERT INTO accounts (name, password_hash, created_at) VALUES (?, ?, ?)').run(clean, hashPassword(password), now());
  return getAccount(store, Number(info.lastInsertRowid))!;
}

export function getAccount(store: Store, id: number): Account | undefined {
  return store.db.prepare('SELECT id, name, created_at AS createdAt FROM accounts WHERE id = ?').get(id) as Account | undefined;
}

export function getAccountByName(store: Store, name: string): Account | undefined {
  return store.db.prepare('SELECT id, name, created_at AS createdAt FROM accounts WHERE name = ?').get(name.trim()) as Account | undefined;
}

export function listAccounts(store: Store): Account[] {
  return store.db.prepare('SELECT id, name, created_at AS createdAt FROM accounts ORDER BY name').all() as Account[];
}

export function countAccounts(store: Store): number {
  return (store.db.prepare('SELECT COUNT(*) AS n FROM accounts').get() as { n: number }).n;
}

/** The account if name and password match, else undefined. */
export function checkPassword(store: Store, name: string, password: string): Account | undefined {
  const row = store.db.prepare('SELECT id, name, created_at AS createdAt, password_hash AS hash FROM accounts WHERE name = ?').get(name.trim()) as (Account & { hash: string }) | undefined;
  if (!row) {
    verifyPassword(password, 'scrypt$32768$8$1$AAAAAAAAAAAAAAAAAAAAAA==$AAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAA='); // same cost either way
    return undefined;
  }
  return verifyPassword(password, row.hash) ? { id: row.id, name: row.name, createdAt: row.createdAt } : undefined;
}

export function setPassword(store: Store, accountId: number, password: string): void {
  if ([...password].length < MIN_PASSWORD_LENGTH) throw new Error(`Choose a password of at least ${MIN_PASSWORD_LENGTH} characters.`);
  inTransaction(store, () => {
    store.db.prepare('UPDATE accounts SET password_hash = ? WHERE id = ?').run(hashPassword(password), accountId);
    store.db.prepare('DELETE FROM sessions WHERE account_id = ?').run(accountId);
  });
}

function tokenHash(token: string): string {
  return createHash('sha256').update(token).digest('hex');
}

export interface Session {
  readonly accountId: number;
  readonly accountName: string;
  readonly csrf: string;
  readonly expiresAt: string;
}

/** Create a session (12 hours by default, a working day; common practice); returns the token for the cookie (only its hash is stored) and the CSRF token. */
export function createSession(store: Store, accountId: number, ttlMs = 12 * 3600_000): { token: string; csrf: string; expiresAt: string } {
  const token = randomBytes(32).toString('base64url');
  const csrf = randomBytes(24).toString('base64url');
  const expiresAt = new Date(Date.now() + ttlMs).toISOString();
  store.db.prepare('INSERT INTO sessions (id, account_id, csrf, expires_at) VALUES (?, ?, ?, ?)').run(tokenHash(token), accountId, csrf, expiresAt);
  return { token, csrf, expiresAt };
}

/** The live session for a cookie token, or undefined (expired sessions are deleted). */
export function getSession(store: Store, token: string): Session | undefined {
  const row = store.db
    .prepare('SELECT s.account_id AS accountId, a.name AS accountName, s.csrf, s.expires_at AS expiresAt FROM sessions s JOIN accounts a ON a.id = s.account_id WHERE s.id = ?')
    .get(tokenHash(token)) as Session | undefined;
  if (!row) return undefined;
  if (row.expiresAt <= now()) {
    deleteSession(store, token);
    return undefined;
  }
  return row;
}

export function deleteSession(store: Store, token: string): void {
  store.db.prepare('DELETE FROM sessions WHERE id = ?').run(tokenHash(token));
}

export function deleteExpiredSessions(store: Store): number {
  return store.db.prepare('DELETE FROM sessions WHERE expires_at <= ?').run(now()).changes;
}

export function addStudyMember(store: Store, studyId: number, accountId: number, role: StudyRole = 'owner'): void {
  store.db.prepare('INSERT OR REPLACE INTO study_members (study_id, account_id, role) VALUES (?, ?, ?)').run(studyId, accountId, role);
}

export function removeStudyMember(store: Store, studyId: number, accountId: number): void {
  store.db.prepare('DELETE FROM study_members WHERE study_id = ? AND account_id = ?').run(studyId, accountId);
}

/** The account's role in the study, or undefined when it is not a member. */
export function studyRole(store: Store, studyId: number, accountId: number): StudyRole | undefined {
  const row = store.db.prepare('SELECT role FROM study_members WHERE study_id = ? AND account_id = ?').get(studyId, accountId) as { role: StudyRole } | undefined;
  return row?.role;
}

export function listStudyMembers(store: Store, studyId: number): { accountId: number; name: string; role: StudyRole }[] {
  return store.db
    .prepare('SELECT m.account_id AS accountId, a.name, m.role FROM study_members m JOIN accounts a ON a.id = m.account_id WHERE m.study_id = ? ORDER BY a.name')
    .all(studyId) as { accountId: number; name: string; role: StudyRole }[];
}

/**
 * Give every study without any member (made by the command line or the demo import before any
 * account existed) to the first account created, as owner; returns the studies given, by name.
 * One transaction.
 */
export function giveOwnerlessStudiesToFirstAccount(store: Store): { account: Account; studies: string[] } | undefined {
  return inTransaction(store, () => {
    const first = store.db.prepare('SELECT id, name, created_at AS createdAt FROM accounts ORDER BY id LIMIT 1').get() as Account | undefined;
    if (!first) return undefined;
    const rows = store.db
      .prepare('SELECT id, name FROM studies s WHERE NOT EXISTS (SELECT 1 FROM study_members m WHERE m.study_id = s.id) ORDER BY id')
      .all() as { id: number; name: string }[];
    const add = store.db.prepare("INSERT INTO study_members (study_id, account_id, role) VALUES (?, ?, 'owner')");
    for (const r of rows) add.run(r.id, first.id);
    return { account: first, studies: rows.map((r) => r.name) };
  });
}
