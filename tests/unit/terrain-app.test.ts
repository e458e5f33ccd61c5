import { describe, expect, it, vi } from 'vitest';
import { Dem } from '../../app/formats';
import { type PlanFile, resolvePlan } from '../../app/plan';
import { terrainArea } from '../../app/planner';
import { PlanStore } from '../../app/ui/plan-store';
import { renderStatus } from '../../app/ui/status-area';
import { areasToRead, boxInside, grownBox } from '../../app/ui/terrain-loader';
import demo from '../../data/demo-plan.json';

/** A stand-in for the planning worker that records what it is sent and can answer. */
class FakeWorker {
  sent: { id: number; terrain?: unknown }[] = [];
  onmessage: ((ev: MessageEvent) => void) | null = null;
  onerror: ((ev: ErrorEvent) => void) | null = null;
  onmessageerror: (() => void) | null = null;
  terminate(): void {}
  postMessage(m: { id: number }): void {
    this.sent.push(m);
  }
  /** Ends the request in flight (as a failed plan), so the next one is sent. */
  answer(): void {
    const id = this.sent[this.sent.length - 1].id;
    this.onmessage?.({ data: { id, type: 'error', message: 'x' } } as MessageEvent);
  }
}

/** A 3 × 3 WGS 84 grid about the demo release (heights 100 … 108 m). */
function smallDem(): Dem {
  return new Dem({
    file: 'small.asc',
    epsg: 4326,
    cols: 3,
    rows: 3,
    x0: 21.0,
    y0: 47.6,
    dx: 0.1,
    dy: 0.1,
    values: Float32Array.from([100, 101, 102, 103, 104, 105, 106, 107, 108]),
    nodata: null,
  });
}

describe('the store hands the elevation model to the planning worker', () => {
  it('sends the grid once per model, nothing with later plans, and null once it is removed', () => {
    vi.useFakeTimers();
    try {
      const s = new PlanStore(demo as Record<string, unknown>, null);
      const w = new FakeWorker();
      s.attachWorker(w as unknown as Worker);
      vi.advanceTimersByTime(50);
      expect(w.sent.length).toBe(1);
      expect('terrain' in w.sent[0]).toBe(false);
      w.answer();

      const dem = smallDem();
      let changes = 0;
      s.addEventListener('change', () => changes++);
      s.setTerrain(dem, { name: 'small.asc', state: 'ready' });
      expect(changes).toBeGreaterThan(0);
      expect(s.dem).toBe(dem);
      expect(s.terrainStatus).toEqual({ name: 'small.asc', state: 'ready' });
      vi.advanceTimersByTime(50);
      expect(w.sent.length).toBe(2);
      expect(w.sent[1].terrain).toBe(dem.grid);
      w.answer();

      s.edit('release.altitude_m', 120);
      vi.advanceTimersByTime(100);
      expect(w.sent.length).toBe(3);
      expect('terrain' in w.sent[2]).toBe(false);
      w.answer();

      // A status alone (a failed read of another file) keeps the model: nothing is re-sent.
      s.setTerrain(dem, { name: 'bad.tif', state: 'error', message: 'bad.tif: corrupt' });
      vi.advanceTimersByTime(100);
      expect(w.sent.length).toBe(3);
      expect(s.dem).toBe(dem);

      s.setTerrain(null, { name: '', state: 'none' });
      vi.advanceTimersByTime(50);
      expect(w.sent.length).toBe(4);
      expect(w.sent[3].terrain).toBeNull();
    } finally {
      vi.useRealTimers();
    }
  });

  it('sends the model again to a new worker', () => {
    vi.useFakeTimers();
    try {
      const s = new PlanStore(demo as Record<string, unknown>, null);
      const dem = smallDem();
      s.setTerrain(dem, { name: 'small.asc', state: 'ready' });
      const a = new FakeWorker();
      s.attachWorker(a as unknown as Worker);
      vi.advanceTimersByTime(50);
      expect(a.sent[0].terrain).toBe(dem.grid);
      a.answer();
      const b = new FakeWorker();
      s.attachWorker(b as unknown as Worker);
      vi.advanceTimersByTime(50);
      expect(b.sent[0].terrain).toBe(dem.grid);
    } finally {
      vi.useRealTimers();
    }
  });
});

/** The words of Lit templates, values in place (no DOM needed). */
function words(x: unknown): string {
  if (Array.isArray(x)) return x.map(words).join('');
  const t = x as { strings?: readonly string[]; values?: unknown[] } | null;
  if (t && typeof t === 'object' && t.strings) {
    return t.strings
      .map((s, i) => s + (i < (t.values ?? []).length ? words(t.values![i]) : ''))
      .join('');
  }
  return typeof x === 'string' || typeof x === 'number' ? String(x) : '';
}

describe('the status line on the model a plan names', () => {
  it('says flat ground with no model open, and names the model in use when another is open', () => {
    const s = new PlanStore(demo as Record<string, unknown>, null);
    s.edit('terrain', { file: 'dem/valley.tif' });
    const line = () => words(renderStatus(s)).replace(/\s+/g, ' ');
    expect(line()).toContain(
      'The plan names the elevation model dem/valley.tif, which is not open here: planned over flat ground.',
    );
    s.setTerrain(smallDem(), { name: 'small.asc', state: 'ready' });
    expect(line()).toContain('which is not open here: planned over small.asc instead.');
    expect(line()).not.toContain('flat ground');
    s.setTerrain(new Dem({ ...smallDem().grid, file: 'valley.tif' }), {
      name: 'valley.tif',
      state: 'ready',
    });
    expect(line()).not.toContain('not open here');
  });
});

describe('the areas the app reads about a plan', () => {
  const plan = resolvePlan(demo as unknown as PlanFile);

  it('grows a box to twice its width and height about its centre', () => {
    // Worked by hand: centre (1, 2), half sizes 1 and 2 become 2 and 4.
    expect(grownBox({ south: 0, north: 4, west: 0, east: 2 })).toEqual({
      south: -2,
      north: 6,
      west: -1,
      east: 3,
    });
    // Clipped to the WGS 84 limits. // common practice
    expect(grownBox({ south: 60, north: 89, west: 170, east: 179 })).toEqual({
      south: 45.5,
      north: 90,
      west: 165.5,
      east: 180,
    });
  });

  it('tries the largest area first and the plan area itself last, each inside the one before', () => {
    const area = terrainArea(plan);
    const boxes = areasToRead(plan);
    expect(boxes.length).toBe(3);
    expect(boxes[2]).toEqual(area);
    expect(boxInside(boxes[2], boxes[1])).toBe(true);
    expect(boxInside(boxes[1], boxes[0])).toBe(true);
    expect(boxInside(grownBox(area), boxes[0])).toBe(true);
    // The altitude sweep's highest release (twice the height) drifts farther: a larger area.
    expect(boxes[1].north - boxes[1].south).toBeGreaterThan(area.north - area.south);
  });
});
