/** The app's one state object: the plan being edited, its checks, history, autosave and results. */
import type { Dem } from '../formats';
import { parseCoordinate } from '../model';
import { allowedRange, type Plan, type PlanIssue, validatePlan } from '../plan';
import type { PlanSafety } from '../safety';
import type { PlanResult, SweepPoint, TimelineEntry } from '../planner';
import { LibraryLink } from './library-link';
import { getAt, setAt } from './paths';
import { PlanHistory } from './plan-history';
import { PlanningRun } from './planning-run';
import { browserStorage, SafeStorage, storageWhy } from './safe-storage';
import { TerrainLoader } from './terrain-loader';
import {
  checkSettings,
  DAMAGED_KEY,
  DAMAGED_TIME_KEY,
  DRAFT_KEY,
  SETTINGS_KEY,
  type Settings,
} from './saved-state';
import { type DamagedDraft, type Draft, loadDraft, loadSettings, withTime } from './start-state';

export type { Settings } from './saved-state';
export type { DamagedDraft } from './start-state';

/** Where the elevation model stands: none, being read, read (store.dem holds it), or not readable. */
export interface TerrainStatus {
  /** the elevation model file's name ('' when there is none) */
  name: string;
  state: 'none' | 'loading' | 'ready' | 'error';
  /** why the file could not be read or kept (shown beside it), or a note on what is going on */
  message?: string;
}

/** Text typed into a field that is not a value yet, with the reason. */
export interface FieldText {
  text: string;
  message: string;
}

/**
 * The one place the app's state lives: the plan being edited (possibly invalid), text that could
 * not be read yet, validation issues, undo/redo history, autosave, and the latest planning result
 * from the worker. Components listen to its 'change' event.
 */
export class PlanStore extends EventTarget {
  draft: Draft;
  texts = new Map<string, FieldText>();
  issues: PlanIssue[] = [];
  warnings: string[] = [];
  /** The last plan that validated; results belong to it. */
  plan: Plan | null = null;
  result: PlanResult | null = null;
  /** The last altitude sweep and the plan it was computed for (printed in the brief). */
  sweep: { title: string; points: SweepPoint[]; plan: Plan } | null = null;
  /** The last release-time timeline and the plan it was computed for (printed in the brief). */
  timeline: { entries: TimelineEntry[]; plan: Plan } | null = null;
  /** The plan `result` was computed from (exports and the brief use this pair). */
  resultPlan: Plan | null = null;
  /** Safety checks of `result` (computed with it in the worker). */
  safety: PlanSafety | null = null;
  /** True while the shown result is older than the current (valid) plan. */
  computing = false;
  progress = 0;
  elapsed_ms = 0;
  workerError: string | null = null;
  settings: Settings;
  /** A one-line message for the status bar (file opened, file rejected, …). */
  notice: { kind: 'info' | 'error'; text: string } | null = null;
  /** A saved draft that could not be read (shown until dismissed; see start-state.ts). */
  damaged: DamagedDraft | null = null;
  /** Why the last autosave failed; cleared by the next one that succeeds. */
  saveError: string | null = null;
  /**
   * The elevation model the plan is flown over (the window of the opened file read about the
   * plan area), or null: flat ground at the typed elevations. Set through setTerrain.
   */
  dem: Dem | null = null;
  /** The elevation model's file and state; a failed read keeps the previous `dem`. */
  terrainStatus: TerrainStatus = { name: '', state: 'none' };

  /** Opens, keeps and re-reads the elevation model file (started with the planning worker). */
  readonly terrain = new TerrainLoader(this);

  /** The plan library: which plan is being edited, where autosave writes (library-link.ts). */
  readonly library = new LibraryLink(this);

  private history: PlanHistory;
  private readonly run = new PlanningRun(this, () => this.emit());
  private readonly storage: SafeStorage;
  /**
   * Autosave is held while the draft key still holds a damaged draft that has no copy elsewhere
   * in storage, or when storage could not be read at all: saving would overwrite it.
   */
  private holdSave = false;
  private saveTimer: ReturnType<typeof setTimeout> | undefined;
  private selected: string | null = null;

  constructor(fallback: Draft, storage: Storage | null = browserStorage()) {
    super();
    this.storage = new SafeStorage(storage);
    const { settings, problem } = loadSettings(this.storage);
    this.settings = settings;
    if (problem) this.notice = { kind: 'error', text: problem };
    const start = loadDraft(this.storage, fallback);
    this.draft = start.draft;
    this.damaged = start.damaged;
    this.holdSave = start.holdSave;
    this.saveError = start.saveError;
    this.history = new PlanHistory(JSON.stringify(this.draft));
    this.revalidate();
  }

  // ---- reading -------------------------------------------------------------------------

  /** Value at a plan path. */
  get(path: string): unknown {
    return getAt(this.draft, path);
  }

  /** The array at a plan path, or [] when it is missing or not an array. */
  list<T>(path: string): T[] {
    const v = getAt(this.draft, path);
    return Array.isArray(v) ? (v as T[]) : [];
  }

  /**
   * The rows of the list at a plan path, each an object ({} stands in for an entry that is not
   * one), so a panel can read row fields of any draft; indexes match the stored list.
   */
  rows<T extends object>(path: string): Partial<T>[] {
    return this.list<unknown>(path).map((r) =>
      r !== null && typeof r === 'object' && !Array.isArray(r) ? (r as Partial<T>) : {},
    );
  }

  /** The object at a plan path, or {} when it is missing or not a plain object. */
  obj(path: string): Record<string, unknown> {
    const v = getAt(this.draft, path);
    return v !== null && typeof v === 'object' && !Array.isArray(v)
      ? (v as Record<string, unknown>)
      : {};
  }

  /** The text at a plan path (a number is written out), or fallback for anything else. */
  str(path: string, fallback = ''): string {
    const v = getAt(this.draft, path);
    return typeof v === 'string' ? v : typeof v === 'number' ? String(v) : fallback;
  }

  /** The finite number at a plan path, or undefined. */
  num(path: string): number | undefined {
    const v = getAt(this.draft, path);
    return typeof v === 'number' && Number.isFinite(v) ? v : undefined;
  }

  /** The problem to show beside the field at path (unreadable text first, then validation). */
  messageAt(path: string): string | undefined {
    const t = this.texts.get(path);
    if (t) return t.message;
    return this.issues.find((i) => i.path === path)?.message;
  }

  /** Issues whose path starts with prefix (e.g. 'sites[2]'). */
  issuesUnder(prefix: string): PlanIssue[] {
    return this.issues.filter(
      (i) =>
        i.path === prefix || i.path.startsWith(`${prefix}.`) || i.path.startsWith(`${prefix}[`),
    );
  }

  get canUndo(): boolean {
    return this.history.canUndo;
  }
  get canRedo(): boolean {
    return this.history.canRedo;
  }
  /** A result exists and belongs to the current plan (nothing is being recomputed). */
  get current(): boolean {
    return this.result !== null && !this.computing && this.resultPlan === this.plan;
  }

  /** The plan is valid and has no unreadable field text. */
  get valid(): boolean {
    return this.issues.length === 0 && this.texts.size === 0;
  }

  // ---- editing -------------------------------------------------------------------------

  /**
   * Sets a plan value. A transient edit (during a drag) updates the plan and results but makes
   * no undo step until commit().
   */
  edit(path: string, value: unknown, opts: { transient?: boolean } = {}): void {
    // Text typed under this path (a row of a list, a field of an object) no longer applies.
    for (const key of [...this.texts.keys()]) {
      if (key === path || key.startsWith(`${path}.`) || key.startsWith(`${path}[`))
        this.texts.delete(key);
    }
    this.draft = setAt(this.draft, path, value);
    if (!opts.transient) this.commit();
    this.changed(opts.transient ? 120 : 40);
  }

  /** Text typed into a numeric field: kept as typed; the plan changes only when it reads. */
  editText(
    path: string,
    text: string,
    read: (t: string) => { ok: true; value: number } | { ok: false; message: string },
  ): void {
    const r = read(text);
    if (r.ok) {
      this.edit(path, r.value);
      return;
    }
    const range = allowedRange(path);
    this.texts.set(path, { text, message: `${path}: ${r.message}${range ? ` (${range})` : ''}` });
    this.saveSoon();
    this.emit();
  }

  /**
   * A position typed in any supported form (decimal, DMS, UTM, MGRS) for the object at path
   * (`release`, `sites[2]`): sets lat and lon together, or keeps the text with the reason.
   */
  editPosition(path: string, text: string): void {
    const key = `${path}.position`;
    const r = parseCoordinate(text);
    if (!r.ok) {
      this.texts.set(key, { text, message: `${key}: ${r.message}` });
      this.emit();
      return;
    }
    this.texts.delete(key);
    const cur = this.get(path);
    const base = cur && typeof cur === 'object' ? (cur as Record<string, unknown>) : {};
    this.edit(path, { ...base, lat: +r.lat.toFixed(7), lon: +r.lon.toFixed(7) });
  }

  /** Replaces the whole plan (open file, load demo) as one undo step. */
  replace(draft: Draft, notice?: string): void {
    this.texts.clear();
    this.draft = withTime(structuredClone(draft));
    this.commit();
    if (notice) this.notice = { kind: 'info', text: notice };
    this.changed(0);
  }

  /**
   * Starts editing another plan of the library: its own undo history from here (undo never
   * crosses into another plan), no typed text or results of the one before.
   */
  loadPlan(draft: Draft): void {
    this.texts.clear();
    this.draft = withTime(draft);
    this.history = new PlanHistory(JSON.stringify(this.draft));
    this.sweep = null;
    this.timeline = null;
    this.selectSite(null);
    this.changed(0);
  }

  /** Makes the current plan an undo step (after transient edits). */
  commit(): void {
    this.history.commit(JSON.stringify(this.draft));
  }

  /** Characters held by the undo and redo steps. */
  get historyChars(): number {
    return this.history.chars;
  }

  undo(): void {
    const prev = this.history.undo();
    if (prev !== undefined) this.restore(prev);
  }

  redo(): void {
    const next = this.history.redo();
    if (next !== undefined) this.restore(next);
  }

  /**
   * Changes settings. A value outside what settings may hold changes nothing and is explained in
   * the notice; a setting that cannot be stored still applies for this visit.
   */
  setSettings(patch: Partial<Settings>): void {
    const { settings, problems } = checkSettings({ ...this.settings, ...patch });
    if (problems.length) {
      this.setNotice('error', `Setting not changed: ${problems.join('; ')}.`);
      return;
    }
    this.settings = settings;
    const err = this.storage.write(SETTINGS_KEY, JSON.stringify(settings));
    if (err !== null) {
      this.notice = {
        kind: 'error',
        text: `Settings apply now but could not be stored for the next visit: ${storageWhy(err)}.`,
      };
    }
    this.emit();
  }

  /** Asks the map to show a site (results table row click). */
  focusSite(id: string): void {
    this.dispatchEvent(new CustomEvent<string>('focus-site', { detail: id }));
  }

  /**
   * The site the crew is looking at (its details view is open; the map highlights its windows),
   * or null. Views listen for 'select-site' (detail: the id or null); an id that is no longer in
   * the plan reads as no selection.
   */
  get selectedSite(): string | null {
    const id = this.selected;
    return id !== null && this.list<{ id?: unknown }>('sites').some((s) => s?.id === id)
      ? id
      : null;
  }

  /** Selects a site (or none) and tells the views. */
  selectSite(id: string | null): void {
    if (this.selected === id) return;
    this.selected = id;
    this.dispatchEvent(new CustomEvent<string | null>('select-site', { detail: id }));
  }

  /**
   * Selects a site and tells the views even when it was selected already: its details view opens
   * and takes the focus (Enter on the map).
   */
  openSite(id: string): void {
    this.selected = id;
    this.dispatchEvent(new CustomEvent<string | null>('select-site', { detail: id }));
  }

  /** Writes the draft to storage now (page hide). */
  flush(): void {
    clearTimeout(this.saveTimer);
    this.writeDraft();
    this.library.keepUnsaved();
  }

  /** True while autosave is held back (see holdSave), for the notice. */
  get autosaveHeld(): boolean {
    return this.holdSave;
  }

  /**
   * The user has dealt with the damaged draft notice. A copy in storage stays there (see
   * deleteDamagedCopy); a damaged draft with no copy in storage is given up only now, so autosave
   * may overwrite it from here on.
   */
  dismissDamaged(): void {
    if (!this.damaged) return;
    if (!this.damaged.stored) {
      this.holdSave = false;
      this.saveSoon();
    }
    this.damaged = null;
    this.emit();
  }

  /** Removes the copy of a damaged draft from storage (after the user downloaded it). */
  deleteDamagedCopy(): void {
    this.storage.remove(DAMAGED_KEY);
    this.storage.remove(DAMAGED_TIME_KEY);
    if (this.damaged?.stored) this.damaged = null;
    this.emit();
  }

  setNotice(kind: 'info' | 'error', text: string): void {
    this.notice = { kind, text };
    this.emit();
  }

  /**
   * Sets the elevation model (null: none) and its status, and replans when the model changed.
   * A status alone (loading, an error) changes nothing else: the model and results stay.
   */
  setTerrain(dem: Dem | null, status: TerrainStatus): void {
    const changed = dem !== this.dem;
    this.dem = dem;
    this.terrainStatus = status;
    if (changed && this.plan && this.issues.length === 0) this.run.planSoon(0);
    this.emit();
  }

  /** Starts the planning worker made by make(); a worker that cannot be made is reported. */
  startWorker(make: () => Worker): void {
    this.library.start(this.storage);
    this.terrain.start();
    if (this.run.start(make)) this.changed(0);
  }

  /** Sends plans to a planning worker (the app starts one; tests may run without). */
  attachWorker(worker: Worker): void {
    this.run.attach(worker);
    this.changed(0);
  }

  // ---- internals -----------------------------------------------------------------------

  private restore(json: string): void {
    this.draft = JSON.parse(json) as Draft;
    this.texts.clear();
    this.changed(0);
  }

  private changed(delay_ms: number): void {
    this.revalidate();
    this.saveSoon();
    if (this.plan && this.issues.length === 0) this.run.planSoon(delay_ms);
    this.emit();
  }

  private revalidate(): void {
    const v = validatePlan(this.draft);
    if (v.ok) {
      this.issues = [];
      this.warnings = v.warnings;
      this.plan = v.plan;
    } else {
      this.issues = v.errors;
      this.warnings = [];
    }
  }

  private saveSoon(): void {
    clearTimeout(this.saveTimer);
    this.saveTimer = setTimeout(() => this.writeDraft(), 200);
  }

  /** Autosave: a failure keeps the edit in memory and stands in saveError until a save works. */
  private writeDraft(): void {
    if (this.holdSave) return;
    let text: string | null = null;
    let err: unknown = null;
    try {
      text = JSON.stringify(this.draft);
    } catch (e) {
      err = e; // a draft that cannot be written as JSON
    }
    // The plan library takes it (library-link.ts); without one, the single autosave of old.
    if (text !== null && this.library.save(text)) return;
    if (!this.storage.storage) return;
    if (text !== null) err = this.storage.write(DRAFT_KEY, text);
    const before = this.saveError;
    this.saveError =
      err === null
        ? null
        : `Autosave failed: ${storageWhy(err)} — save the plan to a file (Save) to keep your edits`;
    if (this.saveError !== before) this.emit();
  }

  private emit(): void {
    this.dispatchEvent(new Event('change'));
  }
}
