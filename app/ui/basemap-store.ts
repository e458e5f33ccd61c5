/**
 * The base map kept in the browser (IndexedDB, its own database), per plan of the plan library:
 * each plan's opened PMTiles archive (keyed by plan id) and the tiles fetched for its area from
 * the tile URL setting (keyed [plan id, template and z/x/y]). Without a library the key is
 * LEGACY_PLAN, where an earlier version kept its one archive. Everything read back is hostile: a
 * damaged record is refused with a message, never drawn.
 */
const DB_NAME = 'seedfall-basemap';
const ARCHIVES = 'archives';
const TILES = 'tiles';
/** The archive key of an earlier version's one archive, and of the base map without a library. */
export const LEGACY_PLAN = 'current';

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

/** Keeps `file` as the archive of plan `plan` (replacing its other). */
export async function saveArchive(plan: string, name: string, file: Blob): Promise<void> {
  const tx = (await db()).transaction(ARCHIVES, 'readwrite');
  const rec: StoredArchive = { name, file, savedAt: new Date().toISOString() };
  tx.objectStore(ARCHIVES).put(rec, plan);
  await done(tx);
}

/** A stored archive record read as hostile; throws when damaged. */
function checkArchive(v: unknown): StoredArchive | null {
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

/** The archive kept with plan `plan`, null when there is none; rejects when the record is damaged. */
export async function loadArchive(plan: string): Promise<StoredArchive | null> {
  const tx = (await db()).transaction(ARCHIVES);
  return checkArchive(await request(tx.objectStore(ARCHIVES).get(plan)));
}

/** Deletes the archive kept with plan `plan`. */
export async function forgetArchive(plan: string): Promise<void> {
  const tx = (await db()).transaction(ARCHIVES, 'readwrite');
  tx.objectStore(ARCHIVES).delete(plan);
  await done(tx);
}

/** The name and size of each plan's kept archive (damaged records left out), by plan id. */
export async function archiveNames(): Promise<Map<string, { name: string; bytes: number }>> {
  const tx = (await db()).transaction(ARCHIVES);
  const store = tx.objectStore(ARCHIVES);
  const [keys, values] = await Promise.all([
    request(store.getAllKeys()),
    request(store.getAll() as IDBRequest<unknown[]>),
  ]);
  const out = new Map<string, { name: string; bytes: number }>();
  keys.forEach((k, i) => {
    const r = values[i] as Partial<StoredArchive> | undefined;
    if (typeof k === 'string' && typeof r?.name === 'string' && r.file instanceof Blob) {
      out.set(k, { name: r.name.slice(0, 1000), bytes: r.file.size });
    }
  });
  return out;
}

const tileKey = (plan: string, template: string, z: number, x: number, y: number): IDBValidKey => [
  plan,
  `${template}\n${z}/${x}/${y}`,
];

/** Every tile key of one plan: [plan, text] sorts between [plan] and [plan, []] (arrays after strings). */
const planTiles = (plan: string): IDBKeyRange => IDBKeyRange.bound([plan], [plan, []]);

/** Keeps one fetched tile of `template` with plan `plan`. */
export async function saveTile(
  plan: string,
  template: string,
  z: number,
  x: number,
  y: number,
  blob: Blob,
): Promise<void> {
  const tx = (await db()).transaction(TILES, 'readwrite');
  const rec: StoredTile = { blob };
  tx.objectStore(TILES).put(rec, tileKey(plan, template, z, x, y));
  await done(tx);
}

/** A tile of `template` kept with plan `plan`, or null; a damaged record counts as none. */
export async function loadTile(
  plan: string,
  template: string,
  z: number,
  x: number,
  y: number,
): Promise<Blob | null> {
  const tx = (await db()).transaction(TILES);
  const v: unknown = await request(tx.objectStore(TILES).get(tileKey(plan, template, z, x, y)));
  const blob = (v as Partial<StoredTile> | undefined)?.blob;
  return blob instanceof Blob ? blob : null;
}

/** How many tiles are kept with plan `plan` (of any template). */
export async function countTiles(plan: string): Promise<number> {
  const tx = (await db()).transaction(TILES);
  return request(tx.objectStore(TILES).count(planTiles(plan)));
}

/** Deletes the tiles kept with plan `plan` (a new fetch replaces its set: storage never grows without bound). */
export async function forgetTiles(plan: string): Promise<void> {
  const tx = (await db()).transaction(TILES, 'readwrite');
  tx.objectStore(TILES).delete(planTiles(plan));
  await done(tx);
}

/** A plan's base-map files as taken out of storage (kept by the caller for undo). */
export interface PlanBasemapFiles {
  archive: StoredArchive | null;
  /** [text key, record] of each kept tile */
  tiles: [string, unknown][];
}

async function readPlanFiles(tx: IDBTransaction, plan: string): Promise<PlanBasemapFiles> {
  const tiles = tx.objectStore(TILES);
  const [a, keys, values] = await Promise.all([
    request(tx.objectStore(ARCHIVES).get(plan) as IDBRequest<unknown>),
    request(tiles.getAllKeys(planTiles(plan))),
    request(tiles.getAll(planTiles(plan)) as IDBRequest<unknown[]>),
  ]);
  let archive: StoredArchive | null;
  try {
    archive = checkArchive(a);
  } catch {
    archive = null; // a damaged archive is not carried on
  }
  return {
    archive,
    tiles: keys.map((k, i) => [String((k as unknown[])[1]), values[i]]),
  };
}

function writePlanFiles(tx: IDBTransaction, plan: string, f: PlanBasemapFiles): void {
  if (f.archive) tx.objectStore(ARCHIVES).put(f.archive, plan);
  for (const [k, v] of f.tiles) tx.objectStore(TILES).put(v, [plan, k]);
}

/** Removes the base-map files of plan `plan` and returns them. */
export async function takePlanFiles(plan: string): Promise<PlanBasemapFiles> {
  const tx = (await db()).transaction([ARCHIVES, TILES], 'readwrite');
  const f = await readPlanFiles(tx, plan);
  tx.objectStore(ARCHIVES).delete(plan);
  tx.objectStore(TILES).delete(planTiles(plan));
  await done(tx);
  return f;
}

/** Puts files taken by takePlanFiles back (undo of a delete). */
export async function putPlanFiles(plan: string, f: PlanBasemapFiles): Promise<void> {
  const tx = (await db()).transaction([ARCHIVES, TILES], 'readwrite');
  writePlanFiles(tx, plan, f);
  await done(tx);
}

/** Copies the base-map files of plan `from` to plan `to` (a duplicated plan). */
export async function copyPlanFiles(from: string, to: string): Promise<void> {
  const tx = (await db()).transaction([ARCHIVES, TILES], 'readwrite');
  writePlanFiles(tx, to, await readPlanFiles(tx, from));
  await done(tx);
}

/**
 * An earlier version's one archive and tiles (archive key LEGACY_PLAN, tile keys plain text)
 * become plan `plan`'s, in one transaction: the old records go only with the new ones written.
 * An archive the plan already has is kept. True when anything moved.
 */
export async function adoptLegacy(plan: string): Promise<boolean> {
  const tx = (await db()).transaction([ARCHIVES, TILES], 'readwrite');
  const archives = tx.objectStore(ARCHIVES);
  const tiles = tx.objectStore(TILES);
  // Text keys sort before array keys: the range holds exactly the old tiles.
  const old = IDBKeyRange.bound('', [], false, true);
  const [legacy, own, keys, values] = await Promise.all([
    plan === LEGACY_PLAN ? Promise.resolve(undefined) : request(archives.get(LEGACY_PLAN)),
    request(archives.get(plan) as IDBRequest<unknown>),
    request(tiles.getAllKeys(old)),
    request(tiles.getAll(old) as IDBRequest<unknown[]>),
  ]);
  const moved = legacy !== undefined || keys.length > 0;
  if (legacy !== undefined) {
    if (own === undefined) archives.put(legacy, plan);
    archives.delete(LEGACY_PLAN);
  }
  keys.forEach((k, i) => tiles.put(values[i], [plan, String(k)]));
  if (keys.length > 0) tiles.delete(old);
  await done(tx);
  return moved;
}
