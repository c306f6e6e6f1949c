// This installation's key for signing saved-run bundles (bundle.ts): 32 random bytes made once per
// data folder and kept beside the database in `bundle-signing.key`, readable by its owner only
// (mode 0600). Anyone who can read the data folder can read the key, as they can read the studies
// themselves; the key only shows that a bundle is unchanged since this installation wrote it.
import { randomBytes } from 'node:crypto';
import { chmodSync, linkSync, mkdirSync, readFileSync, statSync, unlinkSync, writeFileSync } from 'node:fs';
import { join, resolve } from 'node:path';

export const BUNDLE_KEY_FILE = 'bundle-signing.key';
const KEY_BYTES = 32; // HMAC-SHA256 key as long as the hash output (RFC 2104 §3)

/** The data folder's signing key, created on first use. */
export function installationKey(dataDir: string): Uint8Array {
  const dir = resolve(dataDir);
  const file = join(dir, BUNDLE_KEY_FILE);
  mkdirSync(dir, { recursive: true });
  // Written under a unique name, then linked into place: two processes starting at once end up
  // with one key (link fails if the file exists), and nobody reads a half-written one.
  const temporary = join(dir, `.${BUNDLE_KEY_FILE}.${process.pid}.${randomBytes(6).toString('hex')}`);
  writeFileSync(temporary, randomBytes(KEY_BYTES), { mode: 0o600, flag: 'wx' });
  try {
    linkSync(temporary, file);
  } catch (e) {
    if ((e as NodeJS.ErrnoException).code !== 'EEXIST') throw e;
  } finally {
    unlinkSync(temporary);
  }
  if ((statSync(file).mode & 0o077) !== 0) chmodSync(file, 0o600);
  const key = readFileSync(file);
  if (key.length !== KEY_BYTES) {
    throw new Error(`${file} is not a bundle signing key (${key.length} bytes instead of ${KEY_BYTES}). Move it away; Themata then makes a new one, and bundles saved before can only be applied with --trust-bundle.`);
  }
  return new Uint8Array(key);
}
