import { describe, expect, it, vi } from 'vitest';
import { parseNumber } from '../../app/ui/units';
import { PlanStore } from '../../app/ui/plan-store';
import {
  DAMAGED_KEY,
  DAMAGED_TIME_KEY,
  DRAFT_KEY,
  MAX_DRAFT_CHARS,
  SETTINGS_KEY,
} from '../../app/ui/saved-state';
import demo from '../../data/demo-plan.json';

/** A stand-in for the planning worker that records what it is sent. */
class FakeWorker {
  sent: { id: number }[] = [];
  onmessage: ((ev: MessageEvent) => void) | null = null;
  onerror: ((ev: ErrorEvent) => void) | null = null;
  onmessageerror: (() => void) | null = null;
  terminate(): void {}
  postMessage(m: { id: number }): void {
    this.sent.push(m);
  }
}

/**
 * Memory storage with the Storage methods the store uses. With a capacity (characters of keys
 * and values, as browsers count their quota) a write past it throws the browser's quota error.
 */
function memoryStorage(capacity = Infinity): Storage & { full: boolean } {
  const m = new Map<string, string>();
  const used = () => [...m].reduce((n, [k, v]) => n + k.length + v.length, 0);
  return {
    full: false,
    getItem: (k: string) => m.get(k) ?? null,
    setItem(this: { full: boolean }, k: string, v: string) {
      const after = used() - (m.has(k) ? k.length + m.get(k)!.length : 0) + k.length + v.length;
      // WHATWG HTML Storage setItem: throws a "QuotaExceededError" DOMException when full.
      if (this.full || after > capacity)
        throw new DOMException('The quota has been exceeded.', 'QuotaExceededError');
      m.set(k, v);
    },
    removeItem: (k: string) => void m.delete(k),
    clear: () => m.clear(),
    key: () => null,
    get length() {
      return m.size;
    },
  } as unknown as Storage & { full: boolean };
}

const read = (t: string) => {
  const r = parseNumber(t);
  return r.ok ? { ok: true as const, value: r.value } : r;
};

describe('the plan store', () => {
  it('undoes and redoes edits in order, and a new edit clears the redo list', () => {
    const s = new PlanStore(demo as Record<string, unknown>, memoryStorage());
    s.edit('release.altitude_m', 90);
    s.edit('release.altitude_m', 80);
    s.undo();
    expect(s.get('release.altitude_m')).toBe(90);
    s.undo();
    expect(s.get('release.altitude_m')).toBe(110);
    s.redo();
    expect(s.get('release.altitude_m')).toBe(90);
    s.edit('carrier.trackDeg', 200);
    expect(s.canRedo).toBe(false);
  });

  it('keeps unreadable text with its message, and drops it when its row is deleted', () => {
    const s = new PlanStore(demo as Record<string, unknown>, memoryStorage());
    s.editText('sites[2].elevation_m', '9O', read);
    expect(s.messageAt('sites[2].elevation_m')).toMatch(/^sites\[2\]\.elevation_m: /);
    expect(s.valid).toBe(false);
    const sites = s.get('sites') as unknown[];
    s.edit(
      'sites',
      sites.filter((_, i) => i !== 1),
    );
    expect(s.texts.size).toBe(0);
    expect(s.valid).toBe(true);
  });

  it('autosaves the draft and restores it in a new store', () => {
    vi.useFakeTimers();
    const storage = memoryStorage();
    const a = new PlanStore(demo as Record<string, unknown>, storage);
    a.edit('name', 'Edited survey');
    vi.advanceTimersByTime(500);
    vi.useRealTimers();
    const b = new PlanStore(demo as Record<string, unknown>, storage);
    expect(b.get('name')).toBe('Edited survey');
  });

  it('plans again after the worker fails instead of waiting for it forever', () => {
    vi.useFakeTimers();
    const s = new PlanStore(demo as Record<string, unknown>, memoryStorage());
    const w = new FakeWorker();
    s.attachWorker(w as unknown as Worker);
    vi.advanceTimersByTime(50);
    expect(w.sent.length).toBe(1);
    w.onerror?.({ message: 'boom' } as ErrorEvent);
    expect(s.workerError).toBe('boom');
    s.edit('release.altitude_m', 100);
    vi.advanceTimersByTime(100);
    vi.useRealTimers();
    expect(w.sent.length).toBe(2);
  });
});

describe('a plan opened without a release time', () => {
  it('gets the current time written in once, so later validations keep the same time', () => {
    const d = structuredClone(demo) as Record<string, unknown>;
    delete d.time;
    const s = new PlanStore(d, memoryStorage());
    const t = s.get('time');
    expect(typeof t).toBe('string');
    // Within a minute of now (the time is written to the whole minute).
    expect(Math.abs(Date.parse(t as string) - Date.now())).toBeLessThan(61_000);
    s.edit('name', 'later edit');
    expect(s.get('time')).toBe(t);
    expect(s.plan?.time).toBe(t);
  });
});

/** A storage holding the given keys, for starting a store on a saved state. */
function storageWith(items: Record<string, string>, capacity = Infinity) {
  const st = memoryStorage(capacity);
  for (const [k, v] of Object.entries(items)) st.setItem(k, v);
  return st;
}

const demoName = (demo as { name: string }).name;

describe('a damaged saved draft', () => {
  // The rule for saved work (common practice for editors with autosave): damaged input is
  // reported and kept, never silently replaced.
  const cases: [string, string, RegExp][] = [
    ['text that is not JSON', 'not json', /not JSON/],
    ['a bare JSON string', '"a bare string"', /holds a piece of text, not a plan/],
    ['a JSON list', '[]', /holds a list, not a plan/],
    ['JSON null', 'null', /holds null, not a plan/],
    ['a JSON number', '5', /holds a number, not a plan/],
    ['4.5 MB of junk', 'x'.repeat(4_500_000), /not JSON/],
  ];
  for (const [what, text, reason] of cases) {
    it(`keeps ${what} under the backup key, says why, and starts on the fallback plan`, () => {
      const st = storageWith({ [DRAFT_KEY]: text });
      const s = new PlanStore(demo as Record<string, unknown>, st);
      expect(s.damaged?.reason).toMatch(reason);
      expect(s.damaged?.text).toBe(text);
      expect(s.damaged?.stored).toBe(true);
      expect(st.getItem(DAMAGED_KEY)).toBe(text);
      expect(Date.parse(st.getItem(DAMAGED_TIME_KEY) ?? '')).not.toBeNaN();
      expect(s.get('name')).toBe(demoName);
      expect(s.valid).toBe(true);
    });
  }

  it('treats a draft over the size bound as damaged without parsing it', () => {
    const text = `{"name":"${'y'.repeat(MAX_DRAFT_CHARS)}"}`;
    const parse = vi.spyOn(JSON, 'parse');
    const s = new PlanStore(demo as Record<string, unknown>, storageWith({ [DRAFT_KEY]: text }));
    expect(parse.mock.calls.some(([t]) => t === text)).toBe(false);
    parse.mockRestore();
    expect(s.damaged?.reason).toMatch(/million characters long/);
    expect(s.get('name')).toBe(demoName);
  });

  it('does not overwrite the damaged draft while storage cannot hold a copy, until dismissed', () => {
    vi.useFakeTimers();
    const text = 'z'.repeat(3000);
    // Room for the damaged draft but not for a second copy of it.
    const st = storageWith({ [DRAFT_KEY]: text }, 5000);
    const s = new PlanStore(demo as Record<string, unknown>, st);
    expect(s.damaged?.stored).toBe(false);
    expect(s.damaged?.text).toBe(text);
    expect(s.autosaveHeld).toBe(true);
    expect(st.getItem(DAMAGED_KEY)).toBeNull();
    s.edit('name', 'edited while held');
    vi.advanceTimersByTime(500);
    s.flush();
    expect(st.getItem(DRAFT_KEY)).toBe(text);
    s.dismissDamaged();
    vi.advanceTimersByTime(500);
    vi.useRealTimers();
    expect(s.autosaveHeld).toBe(false);
    expect(JSON.parse(st.getItem(DRAFT_KEY)!).name).toBe('edited while held');
  });

  it('keeps one copy at most: an older copy is not replaced, and the new one is held in memory', () => {
    const st = storageWith({ [DRAFT_KEY]: 'second damage', [DAMAGED_KEY]: 'first damage' });
    const s = new PlanStore(demo as Record<string, unknown>, st);
    expect(st.getItem(DAMAGED_KEY)).toBe('first damage');
    expect(s.damaged).toMatchObject({ text: 'second damage', stored: false });
    expect(s.autosaveHeld).toBe(true);
    s.flush();
    expect(st.getItem(DRAFT_KEY)).toBe('second damage');
  });

  it('shows a copy kept on an earlier visit again until it is deleted', () => {
    const st = storageWith({
      [DRAFT_KEY]: JSON.stringify(demo),
      [DAMAGED_KEY]: 'old damage',
      [DAMAGED_TIME_KEY]: '2026-11-30T08:00:00.000Z',
    });
    const s = new PlanStore(demo as Record<string, unknown>, st);
    expect(s.damaged).toMatchObject({ text: 'old damage', earlier: true, stored: true });
    s.dismissDamaged();
    expect(st.getItem(DAMAGED_KEY)).toBe('old damage');
    const again = new PlanStore(demo as Record<string, unknown>, st);
    expect(again.damaged?.text).toBe('old damage');
    again.deleteDamagedCopy();
    expect(again.damaged).toBeNull();
    expect(st.getItem(DAMAGED_KEY)).toBeNull();
    expect(new PlanStore(demo as Record<string, unknown>, st).damaged).toBeNull();
  });

  it('never throws when storage cannot even be read, and does not autosave over it', () => {
    const st = memoryStorage();
    st.getItem = () => {
      throw new DOMException('The operation is insecure.', 'SecurityError');
    };
    const setItem = vi.spyOn(st, 'setItem');
    const s = new PlanStore(demo as Record<string, unknown>, st);
    expect(s.get('name')).toBe(demoName);
    expect(s.saveError).toMatch(/Autosave is off: browser storage could not be read/);
    s.flush();
    expect(setItem).not.toHaveBeenCalled();
  });
});

describe('a saved draft of the wrong shape', () => {
  const wrong = {
    name: 3,
    sites: 5,
    variants: {},
    winds: null,
    release: 'r',
    safety: { noDropZones: 'x', checklist: 7 },
  };

  it('opens like any opened file: kept as it is, with problems naming the fields', () => {
    const st = storageWith({ [DRAFT_KEY]: JSON.stringify(wrong) });
    const s = new PlanStore(demo as Record<string, unknown>, st);
    expect(s.damaged).toBeNull();
    expect(s.get('sites')).toBe(5);
    expect(s.valid).toBe(false);
    const paths = s.issues.map((i) => i.path);
    // docs/plan-format.md: sites and variants are lists, release an object.
    for (const p of ['sites', 'variants', 'release']) expect(paths).toContain(p);
  });

  it('reads through the typed getters without throwing', () => {
    const st = storageWith({
      [DRAFT_KEY]: JSON.stringify({ ...wrong, variants: [null, 7, { id: 'a' }, [1]] }),
    });
    const s = new PlanStore(demo as Record<string, unknown>, st);
    expect(s.list('sites')).toEqual([]);
    expect(s.list('safety.noDropZones')).toEqual([]);
    expect(s.rows('variants')).toEqual([{}, {}, { id: 'a' }, {}]);
    expect(s.obj('winds')).toEqual({});
    expect(s.obj('release')).toEqual({});
    expect(s.str('name')).toBe('3');
    expect(s.str('release.reference', 'AGL')).toBe('AGL');
    expect(s.num('name')).toBe(3);
    expect(s.num('release')).toBeUndefined();
  });
});

describe('saved settings', () => {
  const load = (text: string) =>
    new PlanStore(demo as Record<string, unknown>, storageWith({ [SETTINGS_KEY]: text }));

  it('fall back to the defaults field by field, naming each damaged field', () => {
    const s = load('{"units": 5, "tileUrl": [], "paper": "A3"}');
    expect(s.settings).toEqual({
      units: { length: 'm', speed: 'm/s', coords: 'decimal' },
      tileUrl: '',
      tileAttribution: '',
      paper: 'A4',
      // No saved layer switches: every layer takes its default (app/ui/saved-state.ts).
      mapLayers: {},
    });
    expect(s.notice?.kind).toBe('error');
    expect(s.notice?.text).toMatch(/units must be an object, not a number/);
    expect(s.notice?.text).toMatch(/tileUrl must be text, not a list/);
    expect(s.notice?.text).toMatch(/paper "A3" is not one of A4, Letter/);
  });

  it('keep the good fields of partly damaged units', () => {
    const s = load('{"units": {"length": "ft", "speed": 5, "coords": "utm"}, "paper": "Letter"}');
    expect(s.settings.units).toEqual({ length: 'ft', speed: 'm/s', coords: 'utm' });
    expect(s.settings.paper).toBe('Letter');
    expect(s.notice?.text).toMatch(/units\.speed 5 is not one of m\/s, kt, km\/h/);
  });

  it('that are not JSON give the defaults with a notice', () => {
    const s = load('nope');
    expect(s.settings.units.coords).toBe('decimal');
    expect(s.notice?.text).toMatch(/settings are not JSON/);
  });

  it('bound the tile URL and attribution, and a too long value typed in changes nothing', () => {
    const s = load(JSON.stringify({ tileAttribution: 'a'.repeat(501) }));
    expect(s.settings.tileAttribution).toBe('');
    expect(s.notice?.text).toMatch(/tileAttribution is 501 characters, over the 500 allowed/);
    s.setSettings({ tileUrl: 'https://tiles.invalid/{z}/{x}/{y}.png' });
    expect(s.settings.tileUrl).toBe('https://tiles.invalid/{z}/{x}/{y}.png');
    s.setSettings({ tileUrl: `https://x.invalid/${'p'.repeat(2100)}` });
    expect(s.settings.tileUrl).toBe('https://tiles.invalid/{z}/{x}/{y}.png');
    expect(s.notice?.text).toMatch(/Setting not changed: tileUrl is \d+ characters, over the 2048/);
  });

  it('apply for the visit when storage is full, with a notice', () => {
    const st = memoryStorage();
    const s = new PlanStore(demo as Record<string, unknown>, st);
    st.full = true;
    s.setSettings({ paper: 'Letter' });
    expect(s.settings.paper).toBe('Letter');
    expect(s.notice?.text).toMatch(
      /could not be stored for the next visit: browser storage is full/,
    );
  });
});

describe('autosave when storage is full', () => {
  it('keeps the edit in memory, says so, and clears the notice after a save that works', () => {
    vi.useFakeTimers();
    const st = memoryStorage();
    const s = new PlanStore(demo as Record<string, unknown>, st);
    st.full = true;
    s.edit('name', 'unsaved edit');
    expect(() => vi.advanceTimersByTime(500)).not.toThrow();
    expect(s.saveError).toBe(
      'Autosave failed: browser storage is full — save the plan to a file (Save) to keep your edits',
    );
    expect(s.get('name')).toBe('unsaved edit');
    expect(() => s.flush()).not.toThrow();
    st.full = false;
    s.edit('name', 'saved edit');
    vi.advanceTimersByTime(500);
    vi.useRealTimers();
    expect(s.saveError).toBeNull();
    expect(JSON.parse(st.getItem(DRAFT_KEY)!).name).toBe('saved edit');
  });
});

describe('undo history', () => {
  it('is bounded in total size as well as in steps', () => {
    // common practice: 200 steps of a 1 MB plan would hold 200 MB; the size bound keeps 20 M chars.
    const big = { ...(demo as Record<string, unknown>), notes: 'n'.repeat(1_000_000) };
    const s = new PlanStore(big, memoryStorage());
    for (let i = 0; i < 40; i++) s.edit('release.altitude_m', 60 + i);
    expect(s.historyChars).toBeLessThanOrEqual(20_000_000);
    expect(s.historyChars).toBeGreaterThan(15_000_000);
    // The latest steps are the ones kept.
    s.undo();
    expect(s.get('release.altitude_m')).toBe(98);
  });
});

describe('the planning worker', () => {
  it('that cannot load its script is reported and not waited for', () => {
    vi.useFakeTimers();
    const s = new PlanStore(demo as Record<string, unknown>, memoryStorage());
    const w = new FakeWorker();
    s.attachWorker(w as unknown as Worker);
    vi.advanceTimersByTime(50);
    // HTML Standard, "run a worker": a script that fails to fetch fires a plain "error" event.
    w.onerror?.({ type: 'error' } as ErrorEvent);
    expect(s.workerError).toMatch(/could not start/);
    expect(s.computing).toBe(false);
    s.edit('release.altitude_m', 100);
    vi.advanceTimersByTime(100);
    vi.useRealTimers();
    expect(s.computing).toBe(false);
    expect(w.sent.length).toBe(1);
  });

  it('that cannot be constructed is reported', () => {
    const s = new PlanStore(demo as Record<string, unknown>, memoryStorage());
    s.startWorker(() => {
      throw new DOMException('Access to the script is denied', 'SecurityError');
    });
    expect(s.workerError).toMatch(/could not start \(Access to the script is denied\)/);
    expect(s.computing).toBe(false);
  });

  it('whose reply cannot be read lets the next edit plan again', () => {
    vi.useFakeTimers();
    const s = new PlanStore(demo as Record<string, unknown>, memoryStorage());
    const w = new FakeWorker();
    s.attachWorker(w as unknown as Worker);
    vi.advanceTimersByTime(50);
    w.onmessageerror?.();
    expect(s.workerError).toMatch(/could not be read/);
    expect(s.computing).toBe(false);
    s.edit('release.altitude_m', 100);
    vi.advanceTimersByTime(100);
    vi.useRealTimers();
    expect(w.sent.length).toBe(2);
  });
});
