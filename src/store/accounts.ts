// Accounts, sessions and study membership for the workbench. Session tokens are random and
// only their SHA-256 is stored, so a copy of the database does not let anyone log in. Password
// rules and hashing live in password.ts.
import { createHash, randomBytes } from 'node:crypto';
import { inTransaction, now, type Store } from './database.js';
import { assertPasswordAllowed, decoyHash, hashPassword, needsRehash, PASSWORD_COST, verifyPassword, type ScryptCost } from './password.js';

export { MAX_PASSWORD_LENGTH, MIN_PASSWORD_LENGTH } from './password.js';

export interface Account {
  readonly id: number;
  readonly name: string;
  readonly createdAt: string;
}

export type StudyRole = 'owner' | 'editor' | 'viewer';

/**
 * The scrypt cost for new hashes. Production passes nothing and gets PASSWORD_COST; tests may
 * pass a lower cost explicitly so that they run quickly (never read from the environment).
 */
export interface PasswordOptions {
  readonly cost?: ScryptCost;
}

/** Add an account; throws PasswordRuleError when the password breaks a rule (password.ts). */
export function createAccount(store: Store, name: string, password: string, options: PasswordOptions = {}): Account {
  const clean = name.trim();
  if (!clean) throw new Error('An account needs a name.');
  assertPasswordAllowed(password);
  if (getAccountByName(store, clean)) throw new Error(`An account named "${clean}" already exists.`);
  const info = store.db.prepare('INSERT INTO accounts (name, password_hash, created_at) VALUES (?, ?, ?)').run(clean, hashPassword(password, options.cost), now());
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

type AccountRow = Account & { hash: string };

const ACCOUNT_ROW = 'SELECT id, name, created_at AS createdAt, password_hash AS hash FROM accounts';

function accountRowByName(store: Store, name: string): AccountRow | undefined {
  return store.db.prepare(`${ACCOUNT_ROW} WHERE name = ?`).get(name.trim()) as AccountRow | undefined;
}

function accountRowById(store: Store, id: number): AccountRow | undefined {
  return store.db.prepare(`${ACCOUNT_ROW} WHERE id = ?`).get(id) as AccountRow | undefined;
}

/** True when the password is the account's; a hash made at a lower cost is upgraded on the way. */
function verifyAndUpgrade(store: Store, row: AccountRow, password: string, cost: ScryptCost): boolean {
  if (!verifyPassword(password, row.hash)) return false;
  if (needsRehash(row.hash, cost)) {
    store.db.prepare('UPDATE accounts SET password_hash = ? WHERE id = ? AND password_hash = ?').run(hashPassword(password, cost), row.id, row.hash);
  }
  return true;
}

/**
 * The account if name and password match, else undefined. A hash stored at a lower cost than the
 * current one is replaced by one at the current cost (OWASP ASVS 4.0.3 V2.4.6 for old accounts).
 */
export function checkPassword(store: Store, name: string, password: string, options: PasswordOptions = {}): Account | undefined {
  const cost = options.cost ?? PASSWORD_COST;
  const row = accountRowByName(store, name);
  if (!row) {
    verifyPassword(password, decoyHash(cost)); // the same cost either way: timing does not tell names apart
    return undefined;
  }
  return verifyAndUpgrade(store, row, password, cost) ? { id: row.id, name: row.name, createdAt: row.createdAt } : undefined;
}

/**
 * Set a new password (the operator on the command line) and end every session of the account;
 * returns how many sessions ended. Throws PasswordRuleError when the password breaks a rule.
 */
export function setPassword(store: Store, accountId: number, password: string, options: PasswordOptions = {}): number {
  assertPasswordAllowed(password);
  const hash = hashPassword(password, options.cost);
  return inTransaction(store, () => {
    recordPasswordChange(store, accountId, hash, 'operator');
    return store.db.prepare('DELETE FROM sessions WHERE account_id = ?').run(accountId).changes;
  });
}

/** Who changed a password: the account itself (Account page) or the server's operator (command line). */
export type PasswordChangedBy = 'account' | 'operator';

/** Store a new hash and note when and by whom it was set (OWASP ASVS 4.0.3 V2.2.3, V2.5.5). */
function recordPasswordChange(store: Store, accountId: number, hash: string, by: PasswordChangedBy): void {
  store.db
    .prepare('UPDATE accounts SET password_hash = ?, password_changed_at = ?, password_changed_by = ?, password_changes = password_changes + 1 WHERE id = ?')
    .run(hash, now(), by, accountId);
}

export type PasswordChange = { readonly changed: true; readonly endedSessions: number } | { readonly changed: false };

/**
 * A signed-in person changes their own password (OWASP ASVS 4.0.3 V2.1.5, V2.1.6): the current
 * password must be right (else `changed: false`), the new one must meet the rules (else a
 * PasswordRuleError), and every other session of the account ends; the session whose cookie
 * token is `keepSessionToken` stays signed in.
 */
export function changePassword(
  store: Store,
  accountId: number,
  current: string,
  next: string,
  options: PasswordOptions & { readonly keepSessionToken?: string } = {},
): PasswordChange {
  const cost = options.cost ?? PASSWORD_COST;
  const row = accountRowById(store, accountId);
  if (!row || !verifyPassword(current, row.hash)) return { changed: false };
  assertPasswordAllowed(next);
  const hash = hashPassword(next, cost);
  const keep = options.keepSessionToken ? tokenHash(options.keepSessionToken) : '';
  const endedSessions = inTransaction(store, () => {
    recordPasswordChange(store, accountId, hash, 'account');
    // The session that made the change has just been told so on the page: no notice for it.
    store.db
      .prepare('UPDATE sessions SET password_changes_told = (SELECT password_changes FROM accounts WHERE id = ?) WHERE id = ? AND account_id = ?')
      .run(accountId, keep, accountId);
    return store.db.prepare('DELETE FROM sessions WHERE account_id = ? AND id <> ?').run(accountId, keep).changes;
  });
  return { changed: true, endedSessions };
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

/**
 * Sign the account in: create a session (12 hours by default, a working day; common practice) and
 * record the sign-in. Returns the token for the cookie (only its hash is stored) and the CSRF
 * token. The new session has been told of the password changes the account's previous sign-in
 * saw, so a change made since then is shown once (takePasswordNotice).
 */
export function createSession(store: Store, accountId: number, ttlMs = 12 * 3600_000): { token: string; csrf: string; expiresAt: string } {
  const token = randomBytes(32).toString('base64url');
  const csrf = randomBytes(24).toString('base64url');
  const expiresAt = new Date(Date.now() + ttlMs).toISOString();
  const at = now();
  inTransaction(store, () => {
    const before = store.db.prepare('SELECT last_sign_in_at AS lastAt, password_changes_at_sign_in AS seen FROM accounts WHERE id = ?').get(accountId) as
      | { lastAt: string | null; seen: number }
      | undefined;
    store.db
      .prepare('INSERT INTO sessions (id, account_id, csrf, expires_at, signed_in_at, previous_sign_in_at, password_changes_told) VALUES (?, ?, ?, ?, ?, ?, ?)')
      .run(tokenHash(token), accountId, csrf, expiresAt, at, before?.lastAt ?? null, before?.seen ?? 0);
    store.db.prepare('UPDATE accounts SET last_sign_in_at = ?, password_changes_at_sign_in = password_changes WHERE id = ?').run(at, accountId);
  });
  return { token, csrf, expiresAt };
}

/** A password change the session has not been told of yet. */
export interface PasswordNotice {
  readonly changedAt: string;
  readonly by: PasswordChangedBy;
  /** How many changes the session had not been told of (the notice names the latest). */
  readonly changes: number;
}

/**
 * The password change this session has not yet been told of, if any, marked as told in the same
 * step, so it is shown once (OWASP ASVS 4.0.3 V2.2.3, V2.5.5). The mark lives in the database, not
 * in anything the browser holds.
 */
export function takePasswordNotice(store: Store, token: string): PasswordNotice | undefined {
  const id = tokenHash(token);
  return inTransaction(store, () => {
    const row = store.db
      .prepare(
        'SELECT a.password_changed_at AS changedAt, a.password_changed_by AS by, a.password_changes AS total, s.password_changes_told AS told FROM sessions s JOIN accounts a ON a.id = s.account_id WHERE s.id = ?',
      )
      .get(id) as { changedAt: string | null; by: PasswordChangedBy | null; total: number; told: number } | undefined;
    if (!row || row.total <= row.told || !row.changedAt || !row.by) return undefined;
    const marked = store.db.prepare('UPDATE sessions SET password_changes_told = ? WHERE id = ? AND password_changes_told < ?').run(row.total, id, row.total).changes;
    return marked === 1 ? { changedAt: row.changedAt, by: row.by, changes: row.total - row.told } : undefined;
  });
}

/** What the Account page shows about sign-ins and the password, so an owner can spot misuse. */
export interface SignInHistory {
  /** The account's latest sign-in (this session's, unless another began since). */
  readonly lastSignInAt: string | null;
  /** When this session signed in (null for sessions from before sign-ins were recorded). */
  readonly thisSignInAt: string | null;
  /** The account's sign-in before this session's. */
  readonly previousSignInAt: string | null;
  readonly passwordChangedAt: string | null;
  readonly passwordChangedBy: PasswordChangedBy | null;
}

export function signInHistory(store: Store, token: string): SignInHistory | undefined {
  return store.db
    .prepare(
      'SELECT a.last_sign_in_at AS lastSignInAt, s.signed_in_at AS thisSignInAt, s.previous_sign_in_at AS previousSignInAt, a.password_changed_at AS passwordChangedAt, a.password_changed_by AS passwordChangedBy FROM sessions s JOIN accounts a ON a.id = s.account_id WHERE s.id = ?',
    )
    .get(tokenHash(token)) as SignInHistory | undefined;
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
