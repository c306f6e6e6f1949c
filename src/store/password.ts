// Password hashing with scrypt (Percival, "Stronger key derivation via sequential memory-hard
// functions", BSDCan 2009; RFC 7914). Cost N = 2^15, r = 8, p = 1 follows the OWASP Password
// Storage Cheat Sheet's scrypt minimum (common practice). Stored as
// `scrypt$N$r$p$salt$hash` (base64) so parameters can be raised later without breaking old hashes.
import { randomBytes, scryptSync, timingSafeEqual } from 'node:crypto';

const N = 1 << 15;
const R = 8;
const P = 1;
const KEY_LENGTH = 32;

function scrypt(password: string, salt: Buffer, n: number, r: number, p: number): Buffer {
  return scryptSync(password.normalize('NFKC'), salt, KEY_LENGTH, { N: n, r, p, maxmem: 256 * n * r });
}

export function hashPassword(password: string): string {
  const salt = randomBytes(16);
  return `scrypt$${N}$${R}$${P}$${salt.toString('base64')}$${scrypt(password, salt, N, R, P).toString('base64')}`;
}

export function verifyPassword(password: string, stored: string): boolean {
  const parts = stored.split('$');
  if (parts.length !== 6 || parts[0] !== 'scrypt') return false;
  const [n, r, p] = parts.slice(1, 4).map(Number);
  if (![n, r, p].every((x) => Number.isInteger(x) && x > 0)) return false;
  const expected = Buffer.from(parts[5], 'base64');
  const got = scrypt(password, Buffer.from(parts[4], 'base64'), n, r, p);
  return got.length === expected.length && timingSafeEqual(got, expected);
}
