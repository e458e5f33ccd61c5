import { parseCoordinate } from '../core/coords';
import type { Plan } from '../core/plan';
import type { PlanSafety } from '../core/plan-safety';
import type { PlanResult } from '../core/planner';
import type { SweepPoint } from '../core/wind-plots';
import { DEFAULT_UNITS, type UnitPrefs } from '../core/units';
import { allowedRange, validatePlan, type PlanIssue } from '../core/validate';
import type { WorkerReply } from '../worker/protocol';
import { getAt, setAt } from './paths';

/** User settings kept apart from the plan. */
export interface Settings {
  units: UnitPrefs;
  /** Tile URL template for online use ('' = no tiles: grid only). */
  tileUrl: string;
  tileAttribution: string;
  /** Paper of the printed brief. */
  paper: 'A4' | 'Letter';
}

const DRAFT_KEY = 'seedfall.draft.v1';
const SETTINGS_KEY = 'seedfall.settings.v1';
const HISTORY_LIMIT = 200;

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

  private past: string[] = [];
  private future: string[] = [];
  private worker: Worker | null = null;
  private nextId = 1;
  private inFlight = 0;
  private pending: Plan | null = null;
  private sentPlan: Plan | null = null;
  private computeTimer: ReturnType<typeof setTimeout> | undefined;
  private saveTimer: ReturnType<typeof setTimeout> | undefined;
  private committed: string;

  constructor(
    fallback: Draft,
    private readonly storage: Storage | null = globalThis.localStorage ?? null,
  ) {
    super();
    this.settings = this.loadSettings();
    const saved = this.read(DRAFT_KEY);
    this.draft = withTime(
      saved && typeof saved === 'object' ? (saved as Draft) : structuredClone(fallback),
    );
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
    if (this.past.length > HISTORY_LIMIT) this.past.shift();
    this.future = [];
    this.committed = now;
  }

  undo(): void {
    const prev = this.past.pop();
    if (prev === undefined) return;
    this.future.push(this.committed);
    this.restore(prev);
  }

  redo(): void {
    const next = this.future.pop();
    if (next === undefined) return;
    this.past.push(this.committed);
    this.restore(next);
  }

  setSettings(patch: Partial<Settings>): void {
    this.settings = { ...this.settings, ...patch };
    this.storage?.setItem(SETTINGS_KEY, JSON.stringify(this.settings));
    this.emit();
  }

  /** Asks the map to show a site (results table row click). */
  focusSite(id: string): void {
    this.dispatchEvent(new CustomEvent<string>('focus-site', { detail: id }));
  }

  /** Writes the draft to storage now (page hide). */
  flush(): void {
    clearTimeout(this.saveTimer);
    this.storage?.setItem(DRAFT_KEY, JSON.stringify(this.draft));
  }

  setNotice(kind: 'info' | 'error', text: string): void {
    this.notice = { kind, text };
    this.emit();
  }

  /** Sends plans to a planning worker (the app starts one; tests may run without). */
  attachWorker(worker: Worker): void {
    this.worker = worker;
    worker.onmessage = (ev: MessageEvent<WorkerReply>) => this.onReply(ev.data);
    worker.onerror = (ev) => {
      // Forget the lost request so the next edit is planned again.
      this.workerError = ev.message || 'the planning worker stopped';
      this.inFlight = 0;
      this.pending = null;
      this.computing = false;
      this.emit();
    };
    this.changed(0);
  }

  // ---- internals -----------------------------------------------------------------------

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
    this.saveTimer = setTimeout(
      () => this.storage?.setItem(DRAFT_KEY, JSON.stringify(this.draft)),
      200,
    );
  }

  private read(key: string): unknown {
    try {
      const s = this.storage?.getItem(key);
      return s ? JSON.parse(s) : null;
    } catch {
      return null;
    }
  }

  private loadSettings(): Settings {
    const s = this.read(SETTINGS_KEY) as Partial<Settings> | null;
    return {
      units: { ...DEFAULT_UNITS, ...(s?.units ?? {}) },
      tileUrl: typeof s?.tileUrl === 'string' ? s.tileUrl : '',
      tileAttribution: typeof s?.tileAttribution === 'string' ? s.tileAttribution : '',
      paper: s?.paper === 'Letter' ? 'Letter' : 'A4',
    };
  }

  private emit(): void {
    this.dispatchEvent(new Event('change'));
  }
}
