/** What the app starts on: saved settings and draft, a damaged draft kept aside, release time. */
import {
  DAMAGED_KEY,
  DAMAGED_TIME_KEY,
  DRAFT_KEY,
  readDraftText,
  readSettingsText,
  SETTINGS_KEY,
  type Settings,
} from './saved-state';
import { errorText, type SafeStorage } from './safe-storage';

export type Draft = Record<string, unknown>;

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

/**
 * A plan opened without a release time gets the current time written into it, so the time (and
 * with it declination, daylight and the sign-off fingerprint) stays put until the user changes it.
 */
export function withTime(d: Draft): Draft {
  if (d.time !== undefined) return d;
  const now = new Date();
  now.setSeconds(0, 0);
  return { ...d, time: now.toISOString().replace('.000Z', 'Z') };
}

/** The saved settings (defaults where they had problems) and the notice explaining those. */
export function loadSettings(st: SafeStorage): { settings: Settings; problem: string | null } {
  const raw = st.read(SETTINGS_KEY);
  const { settings, problems } = readSettingsText(typeof raw === 'string' ? raw : null);
  if (raw !== null && typeof raw === 'object') {
    problems.push(`settings could not be read from browser storage (${errorText(raw.error)})`);
  }
  const problem = problems.length
    ? `Saved settings had problems, so their defaults are used: ${problems.join('; ')}.`
    : null;
  return { settings, problem };
}

/** The draft to start on, with what the store must know about the saved one. */
export interface StartDraft {
  draft: Draft;
  damaged: DamagedDraft | null;
  /** Autosave must wait: saving would overwrite a draft that has no copy elsewhere. */
  holdSave: boolean;
  saveError: string | null;
}

/**
 * The saved draft when it is a plan object (checked like any opened file, so a draft of the
 * wrong shape shows its problems beside the fields); otherwise the fallback, with the saved
 * text kept aside (keepDamaged) and never overwritten before a copy of it is safe.
 */
export function loadDraft(st: SafeStorage, fallback: Draft): StartDraft {
  const start = (): Draft => withTime(structuredClone(fallback));
  const raw = st.read(DRAFT_KEY);
  if (raw !== null && typeof raw === 'object') {
    // Storage exists but cannot be read: there may be a draft in it that must not be replaced.
    return {
      draft: start(),
      damaged: null,
      holdSave: true,
      saveError: `Autosave is off: browser storage could not be read (${errorText(raw.error)}) — save the plan to a file (Save) to keep your edits`,
    };
  }
  const r = readDraftText(raw);
  if (r.kind === 'ok') {
    try {
      const d = withTime(r.draft);
      JSON.stringify(d); // undo steps and autosave need it as JSON (too deep a nesting throws)
      return { draft: d, damaged: keptEarlier(st), holdSave: false, saveError: null };
    } catch (e) {
      return {
        draft: start(),
        ...keepDamaged(st, raw as string, `it could not be read (${errorText(e)})`),
      };
    }
  }
  if (r.kind === 'damaged') return { draft: start(), ...keepDamaged(st, r.text, r.reason) };
  return { draft: start(), damaged: keptEarlier(st), holdSave: false, saveError: null };
}

/**
 * Keeps a damaged draft: a copy under DAMAGED_KEY (one at most; a copy already there from an
 * earlier visit is not replaced), and in memory for download. Without a copy in storage,
 * autosave is held until the user dismisses the notice, so the original stays in the draft key.
 */
function keepDamaged(st: SafeStorage, text: string, reason: string): Omit<StartDraft, 'draft'> {
  const at = new Date().toISOString();
  const existing = st.read(DAMAGED_KEY);
  let stored = existing === text;
  if (existing === null) {
    stored = st.write(DAMAGED_KEY, text) === null && st.read(DAMAGED_KEY) === text;
    if (stored) st.write(DAMAGED_TIME_KEY, at);
    else st.remove(DAMAGED_KEY); // no partial copy
  }
  return {
    damaged: { text, reason, at, stored, earlier: false },
    holdSave: !stored,
    saveError: null,
  };
}

/** A damaged draft kept on an earlier visit is shown again until its copy is deleted. */
function keptEarlier(st: SafeStorage): DamagedDraft | null {
  const text = st.read(DAMAGED_KEY);
  if (typeof text !== 'string') return null;
  const at = st.read(DAMAGED_TIME_KEY);
  return {
    text,
    reason: '',
    at: typeof at === 'string' ? at.slice(0, 40) : '',
    stored: true,
    earlier: true,
  };
}
