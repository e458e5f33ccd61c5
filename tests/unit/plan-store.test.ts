import { describe, expect, it, vi } from 'vitest';
import { parseNumber } from '../../app/core/units';
import { PlanStore } from '../../app/ui/plan-store';
import demo from '../../data/demo-plan.json';

/** A stand-in for the planning worker that records what it is sent. */
class FakeWorker {
  sent: { id: number }[] = [];
  onmessage: ((ev: MessageEvent) => void) | null = null;
  onerror: ((ev: ErrorEvent) => void) | null = null;
  postMessage(m: { id: number }): void {
    this.sent.push(m);
  }
}

/** Memory storage with the Storage methods the store uses. */
function memoryStorage(): Storage {
  const m = new Map<string, string>();
  return {
    getItem: (k: string) => m.get(k) ?? null,
    setItem: (k: string, v: string) => void m.set(k, v),
    removeItem: (k: string) => void m.delete(k),
    clear: () => m.clear(),
    key: () => null,
    get length() {
      return m.size;
    },
  } as Storage;
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
