/**
 * The plan store's tie to the plan library (library-store.ts): which plan is being edited,
 * autosave into it, switching plans, the first start's migration of the old single autosave, and
 * the storage quota warning. Without IndexedDB the old single autosave (localStorage) carries on.
 */
import type { PlanStore } from './plan-store';
import type { Draft } from './start-state';
import { fileBase, download } from './downloads';
import {
  addMigrated,
  addPlan,
  deleteDem,
  deletePlan,
  getDem,
  getMeta,
  getPlan,
  type LibraryDb,
  listPlans,
  makeRecord,
  MAX_NAME_CHARS,
  nameFrom,
  nameProblem,
  openLibrary,
  type PlanRecord,
  type PlanSummary,
  putBack,
  putDem,
  renamePlan,
  saveDraft,
  setMeta,
  sizeProblem,
  utf8Bytes,
  withName,
} from './library-store';
import { basemap } from './basemap-state';
import {
  archiveNames,
  copyPlanFiles,
  hasBasemapStorage,
  type PlanBasemapFiles,
  putPlanFiles,
  takePlanFiles,
} from './basemap-store';
import { readPlanFile } from './open-plan';
import { errorText, type SafeStorage, storageWhy } from './safe-storage';
import { DRAFT_KEY, readDraftText } from './saved-state';
import {
  checkStoredTerrain,
  forgetOldTerrain,
  loadOldTerrain,
  type StoredTerrain,
  terrainStorageWhy,
} from './terrain-store';

/**
 * An edit not yet in the library when the page is hidden (its write still under way, or failed),
 * kept in localStorage at once: IndexedDB writes are asynchronous and may not finish before the
 * page goes. Read back, and written to its plan, on the next start.
 */
export const UNSAVED_KEY = 'seedfall.library.unsaved.v1';

/** Share of the quota past which the status line warns (80 %). */
export const QUOTA_WARN_FRACTION = 0.8;
/** Least time between two storage estimates (ms): they are cheap, but every autosave asks. */
const QUOTA_CHECK_MS = 5000;

/** Bytes in words (kB, MB, GB; decimal, as browsers report storage). */
export function sizeText(bytes: number): string {
  if (bytes < 1e3) return `${bytes} B`;
  if (bytes < 1e6) return `${(bytes / 1e3).toFixed(1)} kB`;
  if (bytes < 1e9) return `${(bytes / 1e6).toFixed(1)} MB`;
  return `${(bytes / 1e9).toFixed(2)} GB`;
}

/** A stored record read as hostile data: its draft, or why it cannot be opened. */
export function readRecord(
  v: unknown,
):
  | { ok: true; name: string; draft: Draft; text: string }
  | { ok: false; name: string; reason: string } {
  if (v === null || typeof v !== 'object' || Array.isArray(v)) {
    return { ok: false, name: '(no name)', reason: 'the entry is not a plan record' };
  }
  const r = v as Partial<PlanRecord>;
  const name = nameFrom(r.name, '(no name)');
  if (typeof r.draft !== 'string') return { ok: false, name, reason: 'its plan text is missing' };
  const d = readDraftText(r.draft);
  if (d.kind === 'ok') return { ok: true, name, draft: d.draft, text: r.draft };
  return { ok: false, name, reason: d.kind === 'damaged' ? d.reason : 'its plan text is missing' };
}

export class LibraryLink {
  /** The id of the plan being edited (null until the library is open, or without one). */
  id: string | null = null;
  /** Why the library cannot be used (autosave then keeps one plan in localStorage). */
  failure: unknown = null;
  /** The quota warning for the status line, or null. */
  quotaWarning: string | null = null;
  /** The last deleted plan and its files, until the next delete (Undo puts it back). */
  trash: { rec: PlanRecord; dem: StoredTerrain | null; basemap: PlanBasemapFiles | null } | null =
    null;
  /** Resolves once the library is open and a plan chosen (or the library failed). */
  readonly ready: Promise<void>;

  private db: LibraryDb | null = null;
  private markReady!: () => void;
  private started = false;
  /** Migration waits while autosave is held (a damaged old draft with no copy elsewhere). */
  private migrationPending = false;
  private storage: SafeStorage | null = null;
  private queued: string | null = null;
  /** The name the queued draft holds (the entry follows it), or undefined when it has none. */
  private queuedName: string | undefined;
  /** The draft text the library holds for the plan being edited (an unchanged draft is not written again). */
  private lastText: string | null = null;
  /** The newest draft text autosave was given, and the one kept under UNSAVED_KEY. */
  private latest: string | null = null;
  private unsavedText: string | null = null;
  private pump: Promise<void> | null = null;
  private lastQuotaCheck = 0;

  constructor(private readonly store: PlanStore) {
    this.ready = new Promise((resolve) => (this.markReady = resolve));
  }

  /** True while autosave goes to the library. */
  get active(): boolean {
    return this.db !== null && this.id !== null;
  }

  /** Opens the library (once): migrates the old autosave or opens the plan last edited. */
  start(storage: SafeStorage): void {
    if (this.started) return;
    this.started = true;
    this.storage = storage;
    void this.openDb().finally(() => {
      this.markReady();
      void basemap.switchPlan(this.id);
    });
  }

  /**
   * Autosave: queues the draft text for the plan being edited. False when the library is not in
   * use (the caller keeps the old single autosave).
   */
  save(text: string): boolean {
    if (!this.started || (this.failure !== null && !this.active)) return false;
    if (this.migrationPending) {
      this.migrationPending = false;
      void this.migrate().catch((e: unknown) => this.unusable(e));
      return true;
    }
    this.queued = text;
    this.latest = text;
    const name = this.store.get('name');
    this.queuedName =
      typeof name === 'string' && nameProblem(name) === null ? name.trim() : undefined;
    if (this.active) this.pump ??= this.writeQueued().finally(() => (this.pump = null));
    return true;
  }

  /** Page hide: the newest draft, when the library does not hold it yet, goes to UNSAVED_KEY now. */
  keepUnsaved(): void {
    const text = this.latest;
    if (!this.active || !this.storage || text === null || text === this.lastText) return;
    if (text === this.unsavedText) return;
    if (this.storage.write(UNSAVED_KEY, JSON.stringify({ id: this.id, text })) === null) {
      this.unsavedText = text;
    }
  }

  /** Waits for autosave writes under way. */
  async settled(): Promise<void> {
    while (this.pump) await this.pump;
  }

  /** Shows the Plans view (its element listens). */
  showView(): void {
    this.store.dispatchEvent(new Event('show-library'));
  }

  // ---- the Plans view's actions ----------------------------------------------------------------

  /** The plans, each with the base map kept with it (named, its bytes counted). */
  async list(): Promise<PlanSummary[]> {
    await this.ready;
    if (!this.db) return [];
    const plans = await listPlans(this.db);
    const maps = hasBasemapStorage() ? await archiveNames().catch(() => null) : null;
    return plans.map((p) => {
      const m = maps?.get(p.id);
      return m ? { ...p, bytes: p.bytes + m.bytes, basemapName: m.name } : p;
    });
  }

  /** Switches to a plan: the current one's edits are written first. A damaged one is reported and kept. */
  async open(id: string): Promise<void> {
    const db = await this.need();
    this.store.flush();
    await this.settled();
    if (this.active && this.latest !== null && this.latest !== this.lastText) {
      this.store.setNotice(
        'error',
        `Another plan was not opened: the latest edits of this one are not in the library yet${this.store.saveError ? ' (autosave failed)' : ''}. Save this plan to a file first, or try again.`,
      );
      return;
    }
    const r = readRecord(await getPlan(db, id));
    if (!r.ok) {
      this.store.setNotice(
        'error',
        `The plan “${r.name}” could not be opened: ${r.reason}. It is kept in the library as it is (Export downloads it); your current plan is unchanged.`,
      );
      return;
    }
    await setMeta(db, 'current', id);
    this.id = id;
    this.lastText = r.text;
    this.store.loadPlan(r.draft);
    this.store.setNotice('info', `Opened “${r.name}” from the library.`);
    await this.store.terrain.switchPlan();
    await basemap.switchPlan(id);
  }

  async duplicate(id: string): Promise<void> {
    const db = await this.need();
    if (id === this.id) {
      this.store.flush();
      await this.settled();
    }
    const v = (await getPlan(db, id)) as Partial<PlanRecord> | undefined;
    if (!v || typeof v.draft !== 'string') throw new Error('the plan has no plan text to copy');
    const name = `${nameFrom(v.name, 'Plan').slice(0, MAX_NAME_CHARS - 7)} (copy)`;
    let dem: StoredTerrain | null;
    try {
      dem = checkStoredTerrain(await getDem(db, id));
    } catch {
      dem = null; // a damaged model stays with the original only
    }
    const rec = makeRecord(name, String(withName(v.draft, name)));
    await addPlan(db, rec, dem);
    try {
      if (hasBasemapStorage()) await copyPlanFiles(id, rec.id);
    } catch (e) {
      this.store.setNotice('error', `Made “${name}”, without its base map: ${storageWhy(e)}.`);
      return;
    }
    this.store.setNotice('info', `Made “${name}”.`);
  }

  /**
   * Renames a plan and its name field; the problem with the name (shown beside it), or null when
   * renamed. The plan being edited is renamed as an edit (one undo step; autosave stores it).
   */
  async rename(id: string, name: string): Promise<string | null> {
    const problem = nameProblem(name);
    if (problem) return problem;
    const db = await this.need();
    if (id === this.id) {
      this.store.edit('name', name.trim());
      this.store.flush();
      await this.settled();
    } else await renamePlan(db, id, name.trim());
    return null;
  }

  /** Deletes a plan other than the one being edited; it waits in the trash until the next delete. */
  async remove(id: string): Promise<void> {
    if (id === this.id)
      throw new Error('the plan being edited cannot be deleted: open another first');
    const gone = await deletePlan(await this.need(), id);
    if (!gone) return;
    // Its base map goes with it (the files wait in the trash with the plan for Undo).
    let files: PlanBasemapFiles | null = null;
    try {
      if (hasBasemapStorage()) files = await takePlanFiles(id);
    } catch (e) {
      this.store.setNotice(
        'error',
        `The base map of “${nameFrom(gone.rec.name, 'Plan')}” was not deleted: ${storageWhy(e)}.`,
      );
    }
    this.trash = { ...gone, basemap: files };
  }

  async undoDelete(): Promise<void> {
    const t = this.trash;
    if (!t) return;
    await putBack(await this.need(), t.rec, t.dem);
    this.trash = null;
    if (t.basemap) {
      try {
        await putPlanFiles(t.rec.id, t.basemap);
      } catch (e) {
        this.store.setNotice(
          'error',
          `“${nameFrom(t.rec.name, 'Plan')}” is back in the library, without its base map: ${storageWhy(e)}.`,
        );
        return;
      }
    }
    this.store.setNotice('info', `“${nameFrom(t.rec.name, 'Plan')}” is back in the library.`);
  }

  /** Adds a plan file to the library, checked as Open checks it; refused files are named in the notice. */
  async importFile(file: File): Promise<void> {
    const db = await this.need();
    const r = await readPlanFile(file);
    if (!r.ok) {
      this.store.setNotice('error', `${file.name} was not imported: ${r.why}`);
      return;
    }
    const name = nameFrom(
      (r.raw as { name?: unknown }).name,
      nameFrom(file.name.replace(/\.json$/i, ''), 'Imported plan'),
    );
    await addPlan(db, makeRecord(name, JSON.stringify(r.raw)));
    this.store.setNotice('info', `Imported ${file.name} into the library as “${name}”.`);
  }

  /** Downloads a plan as stored (a damaged one as its text, to recover by hand). */
  async exportPlan(id: string): Promise<void> {
    const db = await this.need();
    if (id === this.id) {
      this.store.flush();
      await this.settled();
    }
    const v = await getPlan(db, id);
    const r = readRecord(v);
    if (r.ok) {
      const name = `${fileBase(r.name)}.json`;
      download(`${JSON.stringify(r.draft, null, 2)}\n`, 'application/json', name);
      this.store.setNotice('info', `Exported ${name}.`);
    } else {
      const raw = (v as Partial<PlanRecord> | undefined)?.draft;
      download(
        typeof raw === 'string' ? raw : '',
        'text/plain',
        `${fileBase(r.name)}-as-stored.txt`,
      );
      this.store.setNotice('error', `Exported “${r.name}” as stored: ${r.reason}.`);
    }
  }

  // ---- the elevation model kept with the plan being edited --------------------------------------

  async getDem(): Promise<StoredTerrain | null> {
    await this.ready;
    if (!this.db || !this.id) return null;
    return checkStoredTerrain(await getDem(this.db, this.id));
  }

  async putDem(t: StoredTerrain): Promise<void> {
    const db = await this.need();
    if (!this.id) throw new Error('no plan of the library is being edited');
    await putDem(db, this.id, t);
    void this.checkQuota(true);
  }

  async deleteDem(): Promise<void> {
    await this.ready;
    if (this.db && this.id) await deleteDem(this.db, this.id);
  }

  /** Warns in the status line when storage passes QUOTA_WARN_FRACTION of the quota. */
  async checkQuota(force = false): Promise<void> {
    const now = Date.now();
    if (!force && now - this.lastQuotaCheck < QUOTA_CHECK_MS) return;
    this.lastQuotaCheck = now;
    let usage: number | undefined;
    let quota: number | undefined;
    try {
      ({ usage, quota } = await navigator.storage.estimate());
    } catch {
      return; // no estimate: nothing to warn about
    }
    let warning: string | null = null;
    if (Number.isFinite(usage) && Number.isFinite(quota) && quota! > 0) {
      const used = usage! / quota!;
      if (used >= QUOTA_WARN_FRACTION) {
        warning = `Browser storage is ${Math.min(100, Math.round(used * 100))} % full: ${sizeText(Math.max(0, quota! - usage!))} left of ${sizeText(quota!)}. Export plans you no longer need and delete them (Plans).`;
      }
    }
    if (warning !== this.quotaWarning) {
      this.quotaWarning = warning;
      this.emit();
    }
  }

  // ---- internals -------------------------------------------------------------------------------

  private async need(): Promise<LibraryDb> {
    await this.ready;
    if (!this.db) {
      throw this.failure ?? new Error('the plan library is not open');
    }
    return this.db;
  }

  private async openDb(): Promise<void> {
    try {
      this.db = await openLibrary();
    } catch (e) {
      this.unusable(e);
      return;
    }
    try {
      if ((await getMeta(this.db, 'migrated')) === undefined) {
        if (this.store.autosaveHeld) this.migrationPending = true;
        else await this.migrate();
      } else await this.openCurrent(this.db);
    } catch (e) {
      this.unusable(e);
    }
    void this.checkQuota(true);
  }

  /** The library cannot be used: autosave goes on as before the library (nothing queued is lost). */
  private unusable(e: unknown): void {
    this.failure = e;
    this.db = null;
    this.id = null;
    this.store.notice = {
      kind: 'error',
      text: `The plan library cannot be used here (${terrainStorageWhy(e)}): autosave keeps this one plan in browser storage as before.`,
    };
    if (this.queued !== null) {
      this.queued = null;
      this.store.flush();
    }
    this.emit();
  }

  /**
   * The edit kept under UNSAVED_KEY for plan id when it differs from what the library holds
   * (text as kept, draft read as any stored draft); anything else there is removed.
   */
  private async unsavedFor(
    db: LibraryDb,
    id: string,
    stored: string,
  ): Promise<{ text: string; draft: Draft } | null> {
    const raw = this.storage?.read(UNSAVED_KEY);
    if (typeof raw !== 'string') return null;
    let v: { id?: unknown; text?: unknown } = {};
    try {
      v = JSON.parse(raw) as typeof v;
    } catch {
      // not what this app wrote: dropped below
    }
    if (typeof v.text === 'string' && readDraftText(v.text).kind === 'ok') {
      const d = readDraftText(v.text);
      if (v.id === id && v.text !== stored && d.kind === 'ok')
        return { text: v.text, draft: d.draft };
      if (typeof v.id === 'string' && v.id !== id && (await getPlan(db, v.id)) !== undefined) {
        // An edit of another plan of the library: it goes to that plan.
        await saveDraft(db, v.id, v.text, utf8Bytes(v.text));
      }
    }
    this.storage?.remove(UNSAVED_KEY);
    return null;
  }

  /** Opens the plan last edited; a damaged one is reported and kept, and a new plan is begun. */
  private async openCurrent(db: LibraryDb): Promise<void> {
    const cur = await getMeta(db, 'current');
    const v = cur === undefined ? undefined : await getPlan(db, cur);
    if (cur !== undefined && v !== undefined) {
      const r = readRecord(v);
      if (r.ok) {
        this.id = cur;
        this.lastText = r.text;
        const unsaved = await this.unsavedFor(db, cur, r.text);
        if (unsaved) {
          this.unsavedText = unsaved.text;
          this.store.notice = {
            kind: 'info',
            text: 'Edits made just before the page last closed were not yet in the library; they are back.',
          };
          this.store.loadPlan(unsaved.draft);
          return;
        }
        // The page started on the same plan (no edit since): nothing to replace or plan again.
        if (r.text !== JSON.stringify(this.store.draft)) this.store.loadPlan(r.draft);
        this.emit();
        return;
      }
      this.store.notice = {
        kind: 'error',
        text: `The plan “${r.name}” in the library could not be opened: ${r.reason}. It is kept there as it is (Plans → Export downloads it); a new plan was begun.`,
      };
    }
    const rec = makeRecord(
      nameFrom(this.store.get('name'), 'Untitled plan'),
      JSON.stringify(this.store.draft),
    );
    await addPlan(db, rec);
    await setMeta(db, 'current', rec.id);
    this.id = rec.id;
    this.lastText = rec.draft;
    this.emit();
  }

  /**
   * The old single autosave (and the one elevation model kept then) becomes the library's first
   * plan. The old key is removed only once the library holds the plan.
   */
  private async migrate(): Promise<void> {
    const db = this.db;
    if (!db) return;
    const raw = this.storage?.read(DRAFT_KEY);
    const had = typeof raw === 'string';
    let dem: StoredTerrain | null = null;
    let demProblem = '';
    try {
      dem = await loadOldTerrain();
    } catch (e) {
      demProblem = errorText(e);
    }
    const text = JSON.stringify(this.store.draft);
    const name = nameFrom(this.store.get('name'), had ? 'Migrated plan' : 'Untitled plan');
    const rec = makeRecord(name, text);
    const tooBig = sizeProblem(utf8Bytes(text));
    if (tooBig) throw new Error(tooBig);
    await addMigrated(db, rec, dem);
    this.id = rec.id;
    this.lastText = rec.draft;
    if (had) this.storage?.remove(DRAFT_KEY);
    if (dem) forgetOldTerrain();
    if (demProblem) {
      this.store.setNotice(
        'error',
        `The elevation model kept before the plan library could not be read (${demProblem}); it is left where it was.`,
      );
    } else if (had) {
      this.store.setNotice(
        'info',
        `Your autosaved plan is now “${name}” in the plan library (Plans).`,
      );
    }
    if (this.queued !== null) this.save(JSON.stringify(this.store.draft));
    this.emit();
  }

  private async writeQueued(): Promise<void> {
    const db = this.db;
    while (db && this.id && this.queued !== null) {
      const text = this.queued;
      const name = this.queuedName;
      this.queued = null;
      if (text === this.lastText) continue;
      const bytes = utf8Bytes(text);
      const tooBig = sizeProblem(bytes);
      let error: string | null = null;
      if (tooBig)
        error = `Autosave failed: ${tooBig} — save the plan to a file (Save) to keep your edits`;
      else {
        try {
          await saveDraft(db, this.id, text, bytes, name);
          this.lastText = text;
          if (text === this.unsavedText) {
            this.storage?.remove(UNSAVED_KEY);
            this.unsavedText = null;
          }
        } catch (e) {
          error = `Autosave failed: ${storageWhy(e)} — save the plan to a file (Save) to keep your edits`;
        }
      }
      if (error !== this.store.saveError) {
        this.store.saveError = error;
        this.emit();
      }
    }
    void this.checkQuota();
  }

  private emit(): void {
    this.store.dispatchEvent(new Event('change'));
  }
}
