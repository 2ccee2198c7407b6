/**
 * The browser host's storage key: a random per-install secret that the page fetches from its own server
 * and uses to encrypt what it keeps between visits (the working campaign, its run files, the recent
 * list). Browser storage is already private to one origin (scheme, host and port); the key adds that a
 * different program later serving on the same address cannot read what an earlier visit left there.
 */
import { randomBytes } from 'node:crypto';
import { mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { homedir } from 'node:os';
import { join } from 'node:path';

/** Path the page fetches the key from (relative to the page). */
export const STORAGE_KEY_PATH = '/host/storage-key';

/** A fresh 256-bit key, base64. */
export function newStorageKey(): string {
  return randomBytes(32).toString('base64');
}

/** Folder of per-user settings: $SWEEPBOOK_CONFIG_DIR, else $XDG_CONFIG_HOME/sweepbook, else ~/.config/sweepbook. */
export function configDir(env: NodeJS.ProcessEnv = process.env): string {
  if (env['SWEEPBOOK_CONFIG_DIR']) return env['SWEEPBOOK_CONFIG_DIR'];
  return join(env['XDG_CONFIG_HOME'] || join(homedir(), '.config'), 'sweepbook');
}

/**
 * The install's key, made on first use and kept readable by the user only. A key file that is not a
 * 256-bit base64 key is replaced (what was kept under the old one can no longer be read, and is not).
 */
export function installStorageKey(dir: string = configDir()): string {
  const file = join(dir, 'browser-storage-key');
  try {
    const text = readFileSync(file, 'utf8').trim();
    if (Buffer.from(text, 'base64').length === 32) return text;
  } catch {
    // not made yet
  }
  mkdirSync(dir, { recursive: true, mode: 0o700 });
  const key = newStorageKey();
  writeFileSync(file, key + '\n', { mode: 0o600 });
  return key;
}

/**
 * Whether a request for the key may be answered: never to another site's or another port's page
 * (Fetch Metadata: Sec-Fetch-Site is "same-origin" only for the page's own requests). Requests without
 * the header come from programs run by a local user, who can read the key file anyway.
 */
export function mayHaveKey(secFetchSite: string | string[] | undefined): boolean {
  return secFetchSite === undefined || secFetchSite === 'same-origin';
}
