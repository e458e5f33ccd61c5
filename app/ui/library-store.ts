/**
 * The plan library kept in the browser (IndexedDB through `idb`, docs/decisions/0010): named
 * plans, each with its draft as JSON text, its last change time and the files it uses (the
 * elevation model's bytes, kept per plan). Everything read back is hostile: a record of the
 * wrong shape is reported by the caller, never replaced.
 */
import { type DBSchema, type IDBPDatabase, openDB } from 'idb';
import { MAX_PLAN_BYTES } from '../plan';
import type { StoredTerrain } from './terrain-store';

const DB_NAME = 'seedfall-library';
const DB_VERSION = 1;

/** Most plans the library holds: ample for a season's work, and a list a person can scan. */
export const MAX_PLANS = 200;
/** Longest plan name in the library (as the plan file's own name field, plan.schema.json). */
export const MAX_NAME_CHARS = 200;
export { MAX_PLAN_BYTES };

/** One plan as stored. */
export interface PlanRecord {
  id: string;
  name: string;
  /** last change (ISO 8601) */
  updatedAt: string;
  /** the plan draft as JSON text, exactly as autosave wrote it */
  draft: string;
  /** the draft's size in UTF-8 bytes */
  bytes: number;
  /** unused: a plan's base-map files are kept under its id in the base map store (basemap-store.ts) */
  baseMaps: string[];
}

/** A plan as listed: name, last change and size, read defensively from a record. */
export interface PlanSummary {
  id: string;
  name: string;
  updatedAt: string;
  /** draft bytes plus the kept elevation model's */
  bytes: number;
  /** the elevation model kept with it ('' for none) */
  demName: string;
  /** the base map archive kept with it (set by the caller, basemap-store.ts) */
  basemapName?: string;
}

interface LibrarySchema extends DBSchema {
  plans: { key: string; value: PlanRecord };
  /** the elevation model file each plan uses, keyed by plan id */
  dems: { key: string; value: StoredTerrain };
  /** 'current': the id of the plan being edited; 'migrated': when the old autosave moved in */
  meta: { key: string; value: string };
}

export type LibraryDb = IDBPDatabase<LibrarySchema>;

/** Opens (and on first use creates) the library; rejects with the browser's reason. */
export async function openLibrary(): Promise<LibraryDb> {
  if (typeof indexedDB === 'undefined') throw new Error('this browser has no IndexedDB');
  const db: LibraryDb = await openDB<LibrarySchema>(DB_NAME, DB_VERSION, {
    upgrade(up) {
      if (!up.objectStoreNames.contains('plans')) up.createObjectStore('plans', { keyPath: 'id' });
      if (!up.objectStoreNames.contains('dems')) up.createObjectStore('dems');
      if (!up.objectStoreNames.contains('meta')) up.createObjectStore('meta');
    },
    blocking() {
      // A newer version of the app in another tab must upgrade the database: this tab lets it
      // (its later writes fail and are reported as autosave failures; the edits stay in the page).
      db.close();
    },
  });
  return db;
}

/** Ends a transaction unwritten and throws err (the transaction's own rejection is expected). */
function abortWith(tx: { abort(): void; done: Promise<void> }, err: Error): never {
  tx.done.catch(() => undefined);
  tx.abort();
  throw err;
}

/** UTF-8 size of a text, bytes. */
export const utf8Bytes = (text: string): number => new TextEncoder().encode(text).length;

/** A new plan id. */
export function newId(): string {
  try {
    return crypto.randomUUID();
  } catch {
    return `p${Date.now().toString(36)}${Math.random().toString(36).slice(2, 10)}`;
  }
}

/** Why a name cannot be used (or null): 1–200 characters, no control characters. */
export function nameProblem(name: string): string | null {
  const n = name.trim();
  if (n.length === 0) return 'The name is empty: give the plan a name of 1 to 200 characters.';
  if (n.length > MAX_NAME_CHARS) {
    return `The name is ${n.length} characters long; a plan name has 1 to ${MAX_NAME_CHARS}.`;
  }
  if (/\p{Cc}/u.test(n))
    return 'The name holds control characters (line breaks, tabs): use plain text.';
  return null;
}

/** A usable name from any value: its text cut to the limit, or fallback. */
export function nameFrom(v: unknown, fallback: string): string {
  if (typeof v !== 'string') return fallback;
  const n = v
    .replace(/\p{Cc}+/gu, ' ')
    .trim()
    .slice(0, MAX_NAME_CHARS)
    .trim();
  return n || fallback;
}

/** Why a draft text cannot be kept (over MAX_PLAN_BYTES), or null. */
export function sizeProblem(bytes: number): string | null {
  if (bytes <= MAX_PLAN_BYTES) return null;
  const mib = (b: number) => (b / 1024 / 1024).toFixed(1);
  return `the plan is ${mib(bytes)} MiB, over the ${mib(MAX_PLAN_BYTES)} MiB a plan in the library may take`;
}

/** The limit message when the library is full. */
export const FULL_MESSAGE = `The library holds ${MAX_PLANS} plans, its limit: export plans you no longer need and delete them to make room.`;

/** The draft text with its name field set, or the text unchanged when it is not a plan object. */
export function withName<T>(draft: T, name: string): T | string {
  if (typeof draft !== 'string') return draft;
  try {
    const v: unknown = JSON.parse(draft);
    if (v === null || typeof v !== 'object' || Array.isArray(v)) return draft;
    return JSON.stringify({ ...(v as object), name });
  } catch {
    return draft;
  }
}

/** A new record for a draft text. */
export function makeRecord(name: string, draft: string): PlanRecord {
  return {
    id: newId(),
    name,
    updatedAt: new Date().toISOString(),
    draft,
    bytes: utf8Bytes(draft),
    baseMaps: [],
  };
}

/** The listing, newest change first; fields of the wrong type are shown as such, not trusted. */
export async function listPlans(db: LibraryDb): Promise<PlanSummary[]> {
  const tx = db.transaction(['plans', 'dems']);
  const [plans, keys, dems] = await Promise.all([
    tx.objectStore('plans').getAll(),
    tx.objectStore('dems').getAllKeys(),
    tx.objectStore('dems').getAll(),
  ]);
  const demOf = new Map<string, StoredTerrain>();
  keys.forEach((k, i) => demOf.set(String(k), dems[i]));
  const out = plans.map((p: Partial<PlanRecord>) => {
    const id = String(p.id);
    const dem = demOf.get(id) as Partial<StoredTerrain> | undefined;
    const demBytes = dem?.file instanceof Blob ? dem.file.size : 0;
    return {
      id,
      name: nameFrom(p.name, '(no name)'),
      updatedAt: typeof p.updatedAt === 'string' ? p.updatedAt.slice(0, 40) : '',
      bytes: (typeof p.draft === 'string' ? utf8Bytes(p.draft) : 0) + demBytes,
      demName: typeof dem?.name === 'string' ? dem.name.slice(0, 1000) : '',
    };
  });
  return out.sort((a, b) => (a.updatedAt < b.updatedAt ? 1 : a.updatedAt > b.updatedAt ? -1 : 0));
}

/** Number of plans held. */
export async function countPlans(db: LibraryDb): Promise<number> {
  return db.count('plans');
}

/** Adds a record (and its model), refusing past MAX_PLANS; rejects with the reason. */
export async function addPlan(
  db: LibraryDb,
  rec: PlanRecord,
  dem?: StoredTerrain | null,
): Promise<void> {
  const problem = sizeProblem(rec.bytes);
  if (problem) throw new Error(`${rec.name} was not added: ${problem}`);
  const tx = db.transaction(['plans', 'dems'], 'readwrite');
  if ((await tx.objectStore('plans').count()) >= MAX_PLANS) abortWith(tx, new Error(FULL_MESSAGE));
  await tx.objectStore('plans').add(rec);
  if (dem) await tx.objectStore('dems').put(dem, rec.id);
  await tx.done;
}

/**
 * Writes the draft text of a plan (autosave) and, when given, the name the draft holds; rejects
 * when the plan is gone or storage refuses.
 */
export async function saveDraft(
  db: LibraryDb,
  id: string,
  draft: string,
  bytes: number,
  name?: string,
): Promise<void> {
  const tx = db.transaction('plans', 'readwrite');
  const rec = await tx.store.get(id);
  if (!rec) abortWith(tx, new Error('the plan is no longer in the library'));
  const updatedAt = new Date().toISOString();
  await tx.store.put({ ...rec, draft, bytes, updatedAt, ...(name ? { name } : {}) });
  await tx.done;
}

/** The stored record, untrusted (undefined when there is none). */
export async function getPlan(db: LibraryDb, id: string): Promise<unknown> {
  return db.get('plans', id);
}

/**
 * Renames a plan (the name checked by the caller): the entry and the plan's own name field, so
 * the file it exports and the title it opens with say the same; a draft that does not read
 * keeps its text as it is.
 */
export async function renamePlan(db: LibraryDb, id: string, name: string): Promise<void> {
  const tx = db.transaction('plans', 'readwrite');
  const rec = await tx.store.get(id);
  if (!rec) abortWith(tx, new Error('the plan is no longer in the library'));
  const draft = withName(rec.draft, name);
  const bytes = typeof draft === 'string' ? utf8Bytes(draft) : rec.bytes;
  await tx.store.put({ ...rec, name, draft, bytes, updatedAt: new Date().toISOString() });
  await tx.done;
}

/** Removes a plan and its files, returning them (kept by the caller for undo). */
export async function deletePlan(
  db: LibraryDb,
  id: string,
): Promise<{ rec: PlanRecord; dem: StoredTerrain | null } | null> {
  const tx = db.transaction(['plans', 'dems'], 'readwrite');
  const rec = await tx.objectStore('plans').get(id);
  const dem = (await tx.objectStore('dems').get(id)) ?? null;
  await tx.objectStore('plans').delete(id);
  await tx.objectStore('dems').delete(id);
  await tx.done;
  return rec ? { rec, dem } : null;
}

/** Puts a deleted plan back as it was. */
export async function putBack(
  db: LibraryDb,
  rec: PlanRecord,
  dem: StoredTerrain | null,
): Promise<void> {
  const tx = db.transaction(['plans', 'dems'], 'readwrite');
  if ((await tx.objectStore('plans').count()) >= MAX_PLANS) abortWith(tx, new Error(FULL_MESSAGE));
  await tx.objectStore('plans').put(rec);
  if (dem) await tx.objectStore('dems').put(dem, rec.id);
  await tx.done;
}

export async function getMeta(
  db: LibraryDb,
  key: 'current' | 'migrated',
): Promise<string | undefined> {
  const v: unknown = await db.get('meta', key);
  return typeof v === 'string' ? v : undefined;
}

export async function setMeta(
  db: LibraryDb,
  key: 'current' | 'migrated',
  value: string,
): Promise<void> {
  await db.put('meta', value, key);
}

/** The elevation model kept with a plan, untrusted (undefined for none). */
export async function getDem(db: LibraryDb, id: string): Promise<unknown> {
  return db.get('dems', id);
}

export async function putDem(db: LibraryDb, id: string, t: StoredTerrain): Promise<void> {
  await db.put('dems', t, id);
}

export async function deleteDem(db: LibraryDb, id: string): Promise<void> {
  await db.delete('dems', id);
}

/**
 * The first start with a library: the old single autosave (draft text and elevation model) becomes
 * one plan, made current and marked migrated in one transaction, so it is there or not at all.
 */
export async function addMigrated(
  db: LibraryDb,
  rec: PlanRecord,
  dem: StoredTerrain | null,
): Promise<void> {
  const tx = db.transaction(['plans', 'dems', 'meta'], 'readwrite');
  await tx.objectStore('plans').put(rec);
  if (dem) await tx.objectStore('dems').put(dem, rec.id);
  await tx.objectStore('meta').put(rec.id, 'current');
  await tx.objectStore('meta').put(new Date().toISOString(), 'migrated');
  await tx.done;
}
