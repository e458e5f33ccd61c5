/**
 * The elevation model file kept in the browser (IndexedDB) so it comes back with the autosaved
 * plan on the next visit and works offline. One file is kept — the one in use — so storage
 * never grows past one model; opening another replaces it.
 */
import { errorText } from './safe-storage';

const DB_NAME = 'seedfall-terrain';
const DB_VERSION = 1;
const STORE = 'files';
/** The one record's key. */
const CURRENT = 'current';

/** What is kept: the file's bytes and how to read them again. */
export interface StoredTerrain {
  /** the file's name (messages name it; its ending picks the reader) */
  name: string;
  file: Blob;
  /** when it was stored (ISO 8601) */
  savedAt: string;
}

/** Why IndexedDB refused, in words for a message. */
export function terrainStorageWhy(e: unknown): string {
  const name = e instanceof DOMException ? e.name : '';
  if (name === 'QuotaExceededError') return 'browser storage is full';
  if (name === 'InvalidStateError' || name === 'SecurityError' || name === 'UnknownError') {
    return `the browser does not allow storing files here (private window or site settings: ${errorText(e)})`;
  }
  return `the browser refused to store it (${errorText(e)})`;
}

function open(): Promise<IDBDatabase> {
  return new Promise((resolve, reject) => {
    let req: IDBOpenDBRequest;
    try {
      if (typeof indexedDB === 'undefined') throw new Error('this browser has no IndexedDB');
      req = indexedDB.open(DB_NAME, DB_VERSION);
    } catch (e) {
      reject(e instanceof Error ? e : new Error(String(e)));
      return;
    }
    req.onupgradeneeded = () => {
      if (!req.result.objectStoreNames.contains(STORE)) req.result.createObjectStore(STORE);
    };
    req.onsuccess = () => resolve(req.result);
    req.onerror = () => reject(req.error ?? new Error('IndexedDB could not be opened'));
    req.onblocked = () => reject(new Error('IndexedDB is held by another tab of this app'));
  });
}

/** Runs one request in a transaction; resolves once the transaction has committed. */
async function run<T>(
  mode: IDBTransactionMode,
  op: (s: IDBObjectStore) => IDBRequest<T>,
): Promise<T> {
  const db = await open();
  try {
    return await new Promise<T>((resolve, reject) => {
      const tx = db.transaction(STORE, mode);
      const req = op(tx.objectStore(STORE));
      tx.oncomplete = () => resolve(req.result);
      tx.onerror = () => reject(tx.error ?? req.error ?? new Error('the transaction failed'));
      tx.onabort = () => reject(tx.error ?? new Error('the transaction was aborted'));
    });
  } finally {
    db.close();
  }
}

/** Keeps the file in use (replacing any earlier one); rejects with the browser's reason. */
export async function storeTerrain(t: StoredTerrain): Promise<void> {
  await run('readwrite', (s) => s.put(t, CURRENT));
}

/** The file kept, or null when none is; rejects when storage cannot be read. */
export async function loadTerrain(): Promise<StoredTerrain | null> {
  const v: unknown = await run('readonly', (s) => s.get(CURRENT));
  if (v === undefined || v === null) return null;
  const r = v as Partial<StoredTerrain>;
  if (typeof r.name !== 'string' || !(r.file instanceof Blob)) {
    throw new Error('the kept elevation model record is damaged');
  }
  return {
    name: r.name,
    file: r.file,
    savedAt: typeof r.savedAt === 'string' ? r.savedAt : '',
  };
}

/** Forgets the kept file; rejects with the browser's reason. */
export async function forgetTerrain(): Promise<void> {
  await run('readwrite', (s) => s.delete(CURRENT));
}

/** True when the browser has IndexedDB at all (Node tests, some embedded views have none). */
export function hasTerrainStorage(): boolean {
  try {
    return typeof indexedDB !== 'undefined';
  } catch {
    return false;
  }
}
