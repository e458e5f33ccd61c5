/**
 * The base map kept in the browser (IndexedDB, its own database): one opened PMTiles archive, and
 * the tiles fetched for the plan area from the tile URL setting. Self-contained on purpose (save,
 * load, forget), so the plan library can later keep such files per plan. Everything read back is
 * hostile: a damaged record is refused with a message, never drawn.
 */
const DB_NAME = 'seedfall-basemap';
const ARCHIVES = 'archives';
const TILES = 'tiles';
const ARCHIVE_KEY = 'current';

/** The opened archive as kept: the file's name and bytes. */
export interface StoredArchive {
  name: string;
  file: Blob;
  /** when it was stored (ISO 8601) */
  savedAt: string;
}

/** A fetched tile as kept, under the URL template it came from. */
interface StoredTile {
  blob: Blob;
}

let opening: Promise<IDBDatabase> | undefined;

function db(): Promise<IDBDatabase> {
  opening ??= new Promise<IDBDatabase>((resolve, reject) => {
    const req = indexedDB.open(DB_NAME, 1);
    req.onupgradeneeded = () => {
      const d = req.result;
      if (!d.objectStoreNames.contains(ARCHIVES)) d.createObjectStore(ARCHIVES);
      if (!d.objectStoreNames.contains(TILES)) d.createObjectStore(TILES);
    };
    req.onsuccess = () => resolve(req.result);
    req.onerror = () => reject(req.error ?? new Error('IndexedDB could not be opened'));
    req.onblocked = () => reject(new Error('IndexedDB is held by another tab of this app'));
  }).catch((e: unknown) => {
    opening = undefined;
    throw e;
  });
  return opening;
}

function request<T>(req: IDBRequest<T>): Promise<T> {
  return new Promise((resolve, reject) => {
    req.onsuccess = () => resolve(req.result);
    req.onerror = () => reject(req.error ?? new Error('IndexedDB refused the request'));
  });
}

function done(tx: IDBTransaction): Promise<void> {
  return new Promise((resolve, reject) => {
    tx.oncomplete = () => resolve();
    tx.onerror = () => reject(tx.error ?? new Error('IndexedDB refused to store it'));
    tx.onabort = () => reject(tx.error ?? new Error('IndexedDB refused to store it'));
  });
}

/** True when the browser has IndexedDB at all. */
export function hasBasemapStorage(): boolean {
  try {
    return typeof indexedDB !== 'undefined';
  } catch {
    return false;
  }
}

/** Keeps `file` as the one archive (replacing any other). */
export async function saveArchive(name: string, file: Blob): Promise<void> {
  const tx = (await db()).transaction(ARCHIVES, 'readwrite');
  const rec: StoredArchive = { name, file, savedAt: new Date().toISOString() };
  tx.objectStore(ARCHIVES).put(rec, ARCHIVE_KEY);
  await done(tx);
}

/** The kept archive, null when there is none; rejects when the record is damaged. */
export async function loadArchive(): Promise<StoredArchive | null> {
  const tx = (await db()).transaction(ARCHIVES);
  const v: unknown = await request(tx.objectStore(ARCHIVES).get(ARCHIVE_KEY));
  if (v === undefined || v === null) return null;
  const r = v as Partial<StoredArchive>;
  if (typeof r.name !== 'string' || !(r.file instanceof Blob)) {
    throw new Error('the kept base map archive record is damaged');
  }
  return {
    name: r.name.slice(0, 1000),
    file: r.file,
    savedAt: typeof r.savedAt === 'string' ? r.savedAt.slice(0, 40) : '',
  };
}

/** Deletes the kept archive. */
export async function forgetArchive(): Promise<void> {
  const tx = (await db()).transaction(ARCHIVES, 'readwrite');
  tx.objectStore(ARCHIVES).delete(ARCHIVE_KEY);
  await done(tx);
}

const tileKey = (template: string, z: number, x: number, y: number): string =>
  `${template}\n${z}/${x}/${y}`;

/** Keeps one fetched tile of `template`. */
export async function saveTile(
  template: string,
  z: number,
  x: number,
  y: number,
  blob: Blob,
): Promise<void> {
  const tx = (await db()).transaction(TILES, 'readwrite');
  const rec: StoredTile = { blob };
  tx.objectStore(TILES).put(rec, tileKey(template, z, x, y));
  await done(tx);
}

/** A kept tile of `template`, or null; a damaged record counts as none. */
export async function loadTile(
  template: string,
  z: number,
  x: number,
  y: number,
): Promise<Blob | null> {
  const tx = (await db()).transaction(TILES);
  const v: unknown = await request(tx.objectStore(TILES).get(tileKey(template, z, x, y)));
  const blob = (v as Partial<StoredTile> | undefined)?.blob;
  return blob instanceof Blob ? blob : null;
}

/** How many tiles are kept (of any template). */
export async function countTiles(): Promise<number> {
  const tx = (await db()).transaction(TILES);
  return request(tx.objectStore(TILES).count());
}

/** Deletes every kept tile (a new fetch replaces the set: storage never grows without bound). */
export async function forgetTiles(): Promise<void> {
  const tx = (await db()).transaction(TILES, 'readwrite');
  tx.objectStore(TILES).clear();
  await done(tx);
}
