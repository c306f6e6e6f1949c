// Passwords: the rules a new password must meet, and hashing with scrypt (Percival, "Stronger key
// derivation via sequential memory-hard functions", BSDCan 2009; RFC 7914).
//
// Rules (OWASP ASVS 4.0.3): 12 to 128 characters, counted as code points so an emoji counts once
// (V2.1.1, V2.1.2); no composition rules (V2.1.9); not on a public list of common passwords
// (V2.1.7). The list is the "passwords-common" dictionary of @zxcvbn-ts/language-common 4.1.3 (MIT),
// which its data script (data-scripts/_generators/PasswordGenerator.ts in zxcvbn-ts) derives from
// Mark Burnett's "ten million passwords" set published by Xato in 2015: the passwords seen more
// than ten times, lower-cased, 49,233 in all. It is read from the installed package, never
// fetched. The comparison is case-insensitive after Unicode NFKC, like the hashing below.
//
// Cost: N = 2^17, r = 8, p = 1, the OWASP Password Storage Cheat Sheet's scrypt parameters (ASVS
// 4.0.3 V2.4.6, level 2, asks for N ≥ 2^16). Hashes are stored as `scrypt$N$r$p$salt$hash`
// (base64), so a hash made at a lower cost still verifies, and `needsRehash` says when to hash the
// password again at the current cost (done at the next successful sign-in).
import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { randomBytes, scryptSync, timingSafeEqual } from 'node:crypto';

export interface ScryptCost {
  readonly N: number;
  readonly r: number;
  readonly p: number;
}

/** The cost of every new hash in production. */
export const PASSWORD_COST: ScryptCost = { N: 1 << 17, r: 8, p: 1 };

/** Shortest password accepted: 12 characters (OWASP ASVS 4.0.3, requirement 2.1.1). */
export const MIN_PASSWORD_LENGTH = 12;
/** Longest password accepted: 128 characters (OWASP ASVS 4.0.3, requirement 2.1.2). */
export const MAX_PASSWORD_LENGTH = 128;

const KEY_LENGTH = 32;
// A stored hash names its own cost; refuse costs no Themata ever wrote (2^20 × 8 × 128 bytes is
// already 1 GiB), so an edited database cannot make a sign-in exhaust memory.
const MAX_N = 1 << 20;

/** A password that breaks one of the rules; its message says what to do. */
export class PasswordRuleError extends Error {
  override readonly name = 'PasswordRuleError';
}

let common: Set<string> | undefined;

function commonPasswords(): Set<string> {
  if (!common) {
    const require = createRequire(import.meta.url);
    const file = require.resolve('@zxcvbn-ts/language-common/src/passwords.json');
    const list = JSON.parse(readFileSync(file, 'utf8')) as string[];
    common = new Set(list.map(fold));
  }
  return common;
}

function fold(password: string): string {
  return password.normalize('NFKC').toLowerCase();
}

/** True when the password is on the public list of common passwords (case-insensitive, after NFKC). */
export function isCommonPassword(password: string): boolean {
  return commonPasswords().has(fold(password));
}

/** What is wrong with a new password, in words a person can act on; undefined when it is fine. */
export function passwordProblem(password: string): string | undefined {
  const length = [...password].length;
  if (length < MIN_PASSWORD_LENGTH) return `Choose a password of at least ${MIN_PASSWORD_LENGTH} characters.`;
  if (length > MAX_PASSWORD_LENGTH) return `Choose a password of at most ${MAX_PASSWORD_LENGTH} characters (this one has ${length}).`;
  if (isCommonPassword(password)) {
    return 'That password is on a public list of common passwords, so it would be among the first guessed. Choose another: a few unrelated words make a long password that is easy to remember.';
  }
  return undefined;
}

/** Throw a PasswordRuleError when the password breaks a rule. */
export function assertPasswordAllowed(password: string): void {
  const problem = passwordProblem(password);
  if (problem) throw new PasswordRuleError(problem);
}

function scrypt(password: string, salt: Buffer, cost: ScryptCost): Buffer {
  // Node refuses more than 32 MiB by default; scrypt needs 128 · N · r bytes, so allow twice that.
  return scryptSync(password.normalize('NFKC'), salt, KEY_LENGTH, { N: cost.N, r: cost.r, p: cost.p, maxmem: 256 * cost.N * cost.r });
}

/** Hash a password at `cost` (production: PASSWORD_COST; tests may pass a lower one explicitly). */
export function hashPassword(password: string, cost: ScryptCost = PASSWORD_COST): string {
  const salt = randomBytes(16);
  return `scrypt$${cost.N}$${cost.r}$${cost.p}$${salt.toString('base64')}$${scrypt(password, salt, cost).toString('base64')}`;
}

function parse(stored: string): { cost: ScryptCost; salt: Buffer; hash: Buffer } | undefined {
  const parts = stored.split('$');
  if (parts.length !== 6 || parts[0] !== 'scrypt') return undefined;
  const [N, r, p] = parts.slice(1, 4).map(Number);
  if (![N, r, p].every((x) => Number.isInteger(x) && x > 0)) return undefined;
  if (N < 2 || N > MAX_N || (N & (N - 1)) !== 0 || r > 32 || p > 16) return undefined;
  return { cost: { N, r, p }, salt: Buffer.from(parts[4], 'base64'), hash: Buffer.from(parts[5], 'base64') };
}

export function verifyPassword(password: string, stored: string): boolean {
  const parsed = parse(stored);
  if (!parsed) return false;
  const got = scrypt(password, parsed.salt, parsed.cost);
  return got.length === parsed.hash.length && timingSafeEqual(got, parsed.hash);
}

/** True when a stored hash was made at a lower cost than `cost` (or cannot be read). */
export function needsRehash(stored: string, cost: ScryptCost = PASSWORD_COST): boolean {
  const parsed = parse(stored);
  if (!parsed) return true;
  return parsed.cost.N < cost.N || parsed.cost.r < cost.r || parsed.cost.p < cost.p;
}

/** A hash that matches no password, at `cost`: checking it costs as much as checking a real one. */
export function decoyHash(cost: ScryptCost = PASSWORD_COST): string {
  return `scrypt$${cost.N}$${cost.r}$${cost.p}$${'A'.repeat(22)}==$${'A'.repeat(43)}=`;
}
