import { parseCoordinate } from '../model';
import { allowedRange, type Plan, type PlanIssue, validatePlan } from '../plan';
import type { PlanSafety } from '../safety';
import type { PlanResult, SweepPoint } from '../planner';
import type { WorkerReply } from '../worker';
import { getAt, setAt } from './paths';
import {
  checkSettings,
  DAMAGED_KEY,
  DAMAGED_TIME_KEY,
  DRAFT_KEY,
  isQuotaError,
  readDraftText,
  readSettingsText,
  SETTINGS_KEY,
  type Settings,
} from './saved-state';

export type { Settings } from './saved-state';

const HISTORY_LIMIT = 200;
/**
 * Undo and redo steps are whole plans as JSON; besides their count, their total length is
 * bounded (characters; twice that in bytes), so a few large plans cannot fill the memory.
 */
const HISTORY_CHARS = 20_000_000;
/** Least time between two progress redraws (ms). */
const PROGRESS_EMIT_MS = 250;

/** A saved draft that could not be read, kept so that nothing is lost. */
export interface DamagedDraft {
  /** The stored text exactly as it was. */
  text: string;
  /** Why it could not be read ('' for a copy kept from an earlier visit). */
  reason: string;
  /** When it was found (ISO 8601). */
  at: string;
  /** True when a copy sits in browser storage under DAMAGED_KEY. */
  stored: boolean;
  /** True when the copy was kept on an earlier visit (this visit's draft was fine). */
  earlier: boolean;
}

/** The browser's storage, or null where even looking at it is refused (privacy settings). */
function browserStorage(): Storage | null {
  try {
    return globalThis.localStorage ?? null;
  } catch {
    return null;
  }
}

const message = (e: unknown): string => (e instanceof Error ? e.message : String(e));

/** Text typed into a field that is not a value yet, with the reason. */
export interface FieldText {
  text: string;
  message: string;
}

type Draft = Record<string, unknown>;

/**
 * A plan opened without a release time gets the current time written into it, so the time (and
 * with it declination, daylight and the sign-off fingerprint) stays put until the user changes it.
 */
function withTime(d: Draft): Draft {
  if (d.time !== undefined) return d;
  const now = new Date();
  now.setSeconds(0, 0);
  return { ...d, time: now.toISOString().replace('.000Z', 'Z') };
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
  /** A saved draft that could not be read (shown until dismissed; see keepDamaged). */
  damaged: DamagedDraft | null = null;
  /** Why the last autosave failed; cleared by the next one that succeeds. */
  saveError: string | null = null;

  private past: string[] = [];
  private future: string[] = [];
  /**
   * Autosave is held while the draft key still holds a damaged draft that has no copy elsewhere
   * in storage, or when storage could not be read at all: saving would overwrite it.
   */
  private holdSave = false;
  private worker: Worker | null = null;
  /** The planning worker could not start: no plan is sent (and nothing shows "Planning…"). */
  private workerDead = false;
  private nextId = 1;
  private inFlight = 0;
  private progressShownAt = -Infinity;
  private pending: Plan | null = null;
  private sentPlan: Plan | null = null;
  private computeTimer: ReturnType<typeof setTimeout> | undefined;
  private saveTimer: ReturnType<typeof setTimeout> | undefined;
  private committed: string;

  constructor(
    fallback: Draft,
    private readonly storage: Storage | null = browserStorage(),
  ) {
    super();
    this.settings = this.loadSettings();
    this.draft = this.loadDraft(fallback);
    this.committed = JSON.stringify(this.draft);
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
    return this.past.length > 0;
  }
  get canRedo(): boolean {
    return this.future.length > 0;
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

  /** Makes the current plan an undo step (after transient edits). */
  commit(): void {
    const now = JSON.stringify(this.draft);
    if (now === this.committed) return;
    this.past.push(this.committed);
    this.future = [];
    this.committed = now;
    this.trimHistory();
  }

  /** Characters held by the undo and redo steps. */
  get historyChars(): number {
    let n = 0;
    for (const h of this.past) n += h.length;
    for (const h of this.future) n += h.length;
    return n;
  }

  undo(): void {
    const prev = this.past.pop();
    if (prev === undefined) return;
    this.future.push(this.committed);
    this.trimHistory();
    this.restore(prev);
  }

  redo(): void {
    const next = this.future.pop();
    if (next === undefined) return;
    this.past.push(this.committed);
    this.trimHistory();
    this.restore(next);
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
    const err = this.tryWrite(SETTINGS_KEY, JSON.stringify(settings));
    if (err !== null) {
      this.notice = {
        kind: 'error',
        text: `Settings apply now but could not be stored for the next visit: ${this.storageWhy(err)}.`,
      };
    }
    this.emit();
  }

  /** Asks the map to show a site (results table row click). */
  focusSite(id: string): void {
    this.dispatchEvent(new CustomEvent<string>('focus-site', { detail: id }));
  }

  /** Writes the draft to storage now (page hide). */
  flush(): void {
    clearTimeout(this.saveTimer);
    this.writeDraft();
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
    this.tryRemove(DAMAGED_KEY);
    this.tryRemove(DAMAGED_TIME_KEY);
    if (this.damaged?.stored) this.damaged = null;
    this.emit();
  }

  setNotice(kind: 'info' | 'error', text: string): void {
    this.notice = { kind, text };
    this.emit();
  }

  /** Starts the planning worker made by make(); a worker that cannot be made is reported. */
  startWorker(make: () => Worker): void {
    let w: Worker;
    try {
      w = make();
    } catch (e) {
      this.workerFailed(`the planning worker could not start (${message(e)})`);
      return;
    }
    this.attachWorker(w);
  }

  /** Sends plans to a planning worker (the app starts one; tests may run without). */
  attachWorker(worker: Worker): void {
    this.worker = worker;
    this.workerDead = false;
    worker.onmessage = (ev: MessageEvent<WorkerReply>) => this.onReply(ev.data);
    worker.onerror = (ev) => {
      // An error with a message comes from the running worker's code: forget the lost request so
      // the next edit is planned again. One without a message is a script that never loaded.
      if (typeof ev.message === 'string' && ev.message) {
        this.workerError = ev.message;
        this.forgetRequest();
        return;
      }
      ev.preventDefault?.();
      worker.terminate?.();
      this.workerFailed(
        'the planning worker could not start (its script did not load). Reload the page to try again; your plan is kept',
      );
    };
    worker.onmessageerror = () => {
      this.workerError = 'a planning result could not be read';
      this.forgetRequest();
    };
    this.changed(0);
  }

  // ---- internals -----------------------------------------------------------------------

  private forgetRequest(): void {
    this.inFlight = 0;
    this.pending = null;
    this.computing = false;
    this.emit();
  }

  private workerFailed(why: string): void {
    this.worker = null;
    this.workerDead = true;
    this.workerError = why;
    clearTimeout(this.computeTimer);
    this.forgetRequest();
  }

  /** Drops the oldest undo steps (then the farthest redo steps) past the count or size bound. */
  private trimHistory(): void {
    while (this.past.length > HISTORY_LIMIT) this.past.shift();
    let chars = this.historyChars;
    while (chars > HISTORY_CHARS && this.past.length + this.future.length > 0) {
      const dropped = this.past.length > 0 ? this.past.shift() : this.future.shift();
      chars -= dropped?.length ?? 0;
    }
  }

  private restore(json: string): void {
    this.committed = json;
    this.draft = JSON.parse(json) as Draft;
    this.texts.clear();
    this.changed(0);
  }

  private changed(delay_ms: number): void {
    this.revalidate();
    this.saveSoon();
    if (this.plan && this.issues.length === 0) this.computeSoon(delay_ms);
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

  private computeSoon(delay_ms: number): void {
    if (this.workerDead) return;
    clearTimeout(this.computeTimer);
    this.computing = true;
    this.computeTimer = setTimeout(() => this.send(), delay_ms);
  }

  private send(): void {
    if (!this.worker || !this.plan) return;
    if (this.inFlight) {
      this.pending = this.plan;
      return;
    }
    this.inFlight = this.nextId++;
    this.progress = 0;
    this.sentPlan = this.plan;
    this.worker.postMessage({ id: this.inFlight, plan: this.plan });
  }

  private onReply(m: WorkerReply): void {
    if (m.id !== this.inFlight) return;
    if (m.type === 'progress') {
      this.progress = m.done / m.total;
      // The worker reports every site; each change event re-renders the map and the panels, so
      // the bar is redrawn at most every PROGRESS_EMIT_MS (the result itself is always shown).
      const now = performance.now();
      if (now - this.progressShownAt < PROGRESS_EMIT_MS) return;
      this.progressShownAt = now;
      this.emit();
      return;
    }
    this.inFlight = 0;
    if (m.type === 'result') {
      this.result = m.result;
      this.resultPlan = this.sentPlan;
      this.safety = m.safety;
      this.elapsed_ms = m.elapsed_ms;
      this.workerError = m.safetyError ? `safety checks failed: ${m.safetyError}` : null;
    } else {
      this.workerError = m.message;
    }
    if (this.pending) {
      this.pending = null;
      this.send();
    } else {
      this.computing = false;
    }
    this.emit();
  }

  private saveSoon(): void {
    clearTimeout(this.saveTimer);
    this.saveTimer = setTimeout(() => this.writeDraft(), 200);
  }

  /** Autosave: a failure keeps the edit in memory and stands in saveError until a save works. */
  private writeDraft(): void {
    if (this.holdSave || !this.storage) return;
    let err: unknown;
    try {
      err = this.tryWrite(DRAFT_KEY, JSON.stringify(this.draft));
    } catch (e) {
      err = e; // a draft that cannot be written as JSON
    }
    const before = this.saveError;
    this.saveError =
      err === null
        ? null
        : `Autosave failed: ${this.storageWhy(err)} — save the plan to a file (Save) to keep your edits`;
    if (this.saveError !== before) this.emit();
  }

  private storageWhy(err: unknown): string {
    return isQuotaError(err)
      ? 'browser storage is full'
      : `the browser refused to store it (${message(err)})`;
  }

  /** setItem that never throws: the error, or null when the value was stored. */
  private tryWrite(key: string, value: string): unknown {
    if (!this.storage) return new Error('browser storage is not available');
    try {
      this.storage.setItem(key, value);
      return null;
    } catch (e) {
      return e ?? new Error('unknown storage error');
    }
  }

  private tryRemove(key: string): void {
    try {
      this.storage?.removeItem(key);
    } catch {
      // Nothing to do: the copy stays, which loses nothing.
    }
  }

  /** getItem that never throws: the text, null when absent, or the error. */
  private tryRead(key: string): string | null | { error: unknown } {
    try {
      return this.storage?.getItem(key) ?? null;
    } catch (e) {
      return { error: e };
    }
  }

  private loadSettings(): Settings {
    const raw = this.tryRead(SETTINGS_KEY);
    const { settings, problems } = readSettingsText(typeof raw === 'string' ? raw : null);
    if (raw !== null && typeof raw === 'object') {
      problems.push(`settings could not be read from browser storage (${message(raw.error)})`);
    }
    if (problems.length) {
      this.notice = {
        kind: 'error',
        text: `Saved settings had problems, so their defaults are used: ${problems.join('; ')}.`,
      };
    }
    return settings;
  }

  /**
   * The saved draft when it is a plan object (checked like any opened file, so a draft of the
   * wrong shape shows its problems beside the fields); otherwise the fallback, with the saved
   * text kept aside (keepDamaged) and never overwritten before a copy of it is safe.
   */
  private loadDraft(fallback: Draft): Draft {
    const raw = this.tryRead(DRAFT_KEY);
    if (raw !== null && typeof raw === 'object') {
      // Storage exists but cannot be read: there may be a draft in it that must not be replaced.
      this.holdSave = true;
      this.saveError = `Autosave is off: browser storage could not be read (${message(raw.error)}) — save the plan to a file (Save) to keep your edits`;
      return withTime(structuredClone(fallback));
    }
    const r = readDraftText(raw);
    if (r.kind === 'ok') {
      try {
        const d = withTime(r.draft);
        JSON.stringify(d); // undo steps and autosave need it as JSON (too deep a nesting throws)
        this.keptEarlier();
        return d;
      } catch (e) {
        this.keepDamaged(raw as string, `it could not be read (${message(e)})`);
      }
    } else if (r.kind === 'damaged') {
      this.keepDamaged(r.text, r.reason);
    } else {
      this.keptEarlier();
    }
    return withTime(structuredClone(fallback));
  }

  /**
   * Keeps a damaged draft: a copy under DAMAGED_KEY (one at most; a copy already there from an
   * earlier visit is not replaced), and in memory for download. Without a copy in storage,
   * autosave is held until the user dismisses the notice, so the original stays in the draft key.
   */
  private keepDamaged(text: string, reason: string): void {
    const at = new Date().toISOString();
    const existing = this.tryRead(DAMAGED_KEY);
    let stored = existing === text;
    if (existing === null) {
      stored = this.tryWrite(DAMAGED_KEY, text) === null && this.tryRead(DAMAGED_KEY) === text;
      if (stored) this.tryWrite(DAMAGED_TIME_KEY, at);
      else this.tryRemove(DAMAGED_KEY); // no partial copy
    }
    this.holdSave = !stored;
    this.damaged = { text, reason, at, stored, earlier: false };
  }

  /** A damaged draft kept on an earlier visit is shown again until its copy is deleted. */
  private keptEarlier(): void {
    const text = this.tryRead(DAMAGED_KEY);
    if (typeof text !== 'string') return;
    const at = this.tryRead(DAMAGED_TIME_KEY);
    this.damaged = {
      text,
      reason: '',
      at: typeof at === 'string' ? at.slice(0, 40) : '',
      stored: true,
      earlier: true,
    };
  }

  private emit(): void {
    this.dispatchEvent(new Event('change'));
  }
}
