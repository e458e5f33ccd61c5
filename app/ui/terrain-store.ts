/**
 * The elevation model file kept in the browser with the plan that uses it (the plan library's
 * `dems` store, keyed by plan id: library-store.ts), so it comes back with the plan on the next
 * visit and works offline. One file per plan; opening another replaces it. Before the library,
 * one file was kept in its own database: the migration reads it once (loadOldTerrain).
 */
import { errorText } from './safe-storage';

/** The database of the single kept model before the plan library. */
const OLD_DB_NAME = 'seedfall-terrain';
const OLD_STORE = 'files';
const OLD_KEY = 'current';

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

/** A kept model read back as hostile data: the record, or an error naming what is wrong. */
export function checkStoredTerrain(v: unknown): StoredTerrain | null {
  if (v === undefined || v === null) return null;
  const r = v as Partial<StoredTerrain>;
  if (typeof r.name !== 'string' || !(r.file instanceof Blob)) {
    throw new Error('the kept elevation model record is damaged');
  }
  return {
    name: r.name.slice(0, 1000),
    file: r.file,
    savedAt: typeof r.savedAt === 'string' ? r.savedAt.slice(0, 40) : '',
  };
}

/**
 * The old database when it exists (never creates it: indexedDB.databases() lists it), or null.
 * Browsers without databases() are asked to open it; an empty one made by that is deleted.
 */
async function openOld(): Promise<IDBDatabase | null> {
  if (typeof indexedDB.databases === 'function') {
    const list = await indexedDB.databases();
    if (!list.some((d) => d.name === OLD_DB_NAME)) return null;
  }
  return new Promise((resolve, reject) => {
    const req = indexedDB.open(OLD_DB_NAME);
    let created = false;
    req.onupgradeneeded = () => {
      created = true;
    };
    req.onsuccess = () => {
      const db = req.result;
      if (created || !db.objectStoreNames.contains(OLD_STORE)) {
        db.close();
        if (created) indexedDB.deleteDatabase(OLD_DB_NAME);
        resolve(null);
      } else resolve(db);
    };
    req.onerror = () => reject(req.error ?? new Error('IndexedDB could not be opened'));
    req.onblocked = () => reject(new Error('IndexedDB is held by another tab of this app'));
  });
}

/** The one model kept before the plan library, or null; rejects when it cannot be read. */
export async function loadOldTerrain(): Promise<StoredTerrain | null> {
  const db = await openOld();
  if (!db) return null;
  try {
    const v = await new Promise<unknown>((resolve, reject) => {
      const req = db.transaction(OLD_STORE).objectStore(OLD_STORE).get(OLD_KEY);
      req.onsuccess = () => resolve(req.result);
      req.onerror = () => reject(req.error ?? new Error('the kept file could not be read'));
    });
    return checkStoredTerrain(v);
  } finally {
    db.close();
  }
}

/** Deletes the old database (after its model moved into the library); failures lose nothing. */
export function forgetOldTerrain(): void {
  try {
    indexedDB.deleteDatabase(OLD_DB_NAME);
  } catch {
    // the copy stays where it was
  }
}

/** True when the browser has IndexedDB at all (Node tests, some embedded views have none). */
export function hasTerrainStorage(): boolean {
  try {
    return typeof indexedDB !== 'undefined';
  } catch {
    return false;
  }
}
