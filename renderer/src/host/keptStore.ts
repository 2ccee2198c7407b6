/**
 * What the browser host keeps between visits (the working campaign, its run files, the recent list), in
 * IndexedDB, each value encrypted with AES-GCM (NIST SP 800-38D) under the key the page's own server hands
 * out (app/serve/storageKey.ts). IndexedDB belongs to one origin, so pages on other ports never see it;
 * the encryption means a different program later serving on the same address cannot read it either.
 * Where the server has no key (a development server), values are kept unencrypted, still per origin.
 */

export interface KeptStore {
  /** Whether values are encrypted under the server's key. */
  readonly sealed: boolean;
  get(key: string): Promise<Uint8Array | null>;
  put(key: string, value: Uint8Array): Promise<void>;
  delete(key: string): Promise<void>;
  keys(): Promise<string[]>;
}

const DB_NAME = 'sweepbook-kept';
const STORE = 'values';
const KEY_PATH = 'host/storage-key';

function request<T>(r: IDBRequest<T>): Promise<T> {
  return new Promise((resolve, reject) => {
    r.onsuccess = () => resolve(r.result);
    r.onerror = () => reject(r.error ?? new Error('storage request failed'));
  });
}

function openDb(idb: IDBFactory): Promise<IDBDatabase> {
  const r = idb.open(DB_NAME, 1);
  r.onupgradeneeded = () => {
    if (!r.result.objectStoreNames.contains(STORE)) r.result.createObjectStore(STORE);
  };
  return request(r);
}

function fromBase64(text: string): Uint8Array {
  const bin = atob(text);
  const out = new Uint8Array(bin.length);
  for (let i = 0; i < bin.length; i++) out[i] = bin.charCodeAt(i);
  return out;
}

/** The server's key as an AES-GCM key, or null when the server offers none. */
async function serverKey(win: Window): Promise<CryptoKey | null> {
  const subtle = win.crypto?.subtle;
  if (!subtle) return null;
  let res: Response;
  try {
    res = await win.fetch(new URL(KEY_PATH, win.document.baseURI), { cache: 'no-store', credentials: 'same-origin' });
  } catch {
    return null;
  }
  if (!res.ok) return null;
  const body = (await res.json().catch(() => null)) as { key?: unknown } | null;
  if (typeof body?.key !== 'string') return null;
  const raw = fromBase64(body.key);
  if (raw.length !== 32) return null;
  return subtle.importKey('raw', raw as BufferSource, { name: 'AES-GCM' }, false, ['encrypt', 'decrypt']);
}

/** Open the kept store; null where the browser has no IndexedDB (a private window may refuse it). */
export async function openKeptStore(win: Window): Promise<KeptStore | null> {
  const idb = win.indexedDB;
  if (!idb) return null;
  let db: IDBDatabase;
  try {
    db = await openDb(idb);
  } catch {
    return null;
  }
  const key = await serverKey(win);
  const subtle = win.crypto?.subtle;
  const tx = (mode: IDBTransactionMode) => db.transaction(STORE, mode).objectStore(STORE);

  async function seal(value: Uint8Array): Promise<Uint8Array> {
    if (!key || !subtle) return value;
    const iv = win.crypto.getRandomValues(new Uint8Array(12));
    const data = new Uint8Array(await subtle.encrypt({ name: 'AES-GCM', iv }, key, value as BufferSource));
    const out = new Uint8Array(12 + data.length);
    out.set(iv);
    out.set(data, 12);
    return out;
  }

  async function open(value: Uint8Array): Promise<Uint8Array | null> {
    if (!key || !subtle) return value;
    try {
      return new Uint8Array(await subtle.decrypt({ name: 'AES-GCM', iv: value.slice(0, 12) }, key, value.slice(12)));
    } catch {
      // kept under another key (another install, or a program that held this address before): unreadable by design
      return null;
    }
  }

  return {
    sealed: key !== null,
    async get(k) {
      const v = (await request(tx('readonly').get(k))) as unknown;
      if (!(v instanceof Uint8Array) && !(v instanceof ArrayBuffer)) return null;
      return open(v instanceof Uint8Array ? v : new Uint8Array(v));
    },
    async put(k, value) {
      const sealed = await seal(value);
      await request(tx('readwrite').put(sealed, k));
    },
    async delete(k) {
      await request(tx('readwrite').delete(k));
    },
    async keys() {
      return ((await request(tx('readonly').getAllKeys())) as IDBValidKey[]).map(String);
    },
  };
}

const encoder = new TextEncoder();
const decoder = new TextDecoder();

export async function getJson<T>(store: KeptStore, key: string): Promise<T | null> {
  const bytes = await store.get(key);
  if (!bytes) return null;
  try {
    return JSON.parse(decoder.decode(bytes)) as T;
  } catch {
    return null;
  }
}

export function putJson(store: KeptStore, key: string, value: unknown): Promise<void> {
  return store.put(key, encoder.encode(JSON.stringify(value)));
}
