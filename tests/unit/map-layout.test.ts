import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { laneSide, placeLabels, windowLanes } from '../../app/map/layout';
import { checkSettings } from '../../app/ui/saved-state';

const overlap = (
  a: { x0: number; y0: number; x1: number; y1: number },
  b: { x0: number; y0: number; x1: number; y1: number },
) => a.x0 < b.x1 && b.x0 < a.x1 && a.y0 < b.y1 && b.y0 < a.y1;

describe('release window lanes', () => {
  // common practice: greedy colouring of intervals by start time uses as many colours as the
  // most intervals that overlap at one moment (interval graphs are perfect).
  it('never puts overlapping windows in one lane, and uses as few lanes as the deepest overlap', () => {
    fc.assert(
      fc.property(
        fc.array(
          fc.tuple(
            fc.double({ min: -60, max: 60, noNaN: true }),
            fc.double({ min: 0.1, max: 30, noNaN: true }),
          ),
          { maxLength: 40 },
        ),
        (raw) => {
          const w = raw.map(([open_s, len]) => ({ open_s, close_s: open_s + len }));
          const lanes = windowLanes(w, 1000);
          for (let i = 0; i < w.length; i++)
            for (let j = i + 1; j < w.length; j++)
              if (lanes[i] === lanes[j])
                expect(w[i].close_s < w[j].open_s || w[j].close_s < w[i].open_s).toBe(true);
          let depth = 0;
          for (const p of w)
            depth = Math.max(
              depth,
              w.filter((q) => q.open_s <= p.open_s && p.open_s <= q.close_s).length,
            );
          expect(new Set(lanes).size).toBe(depth);
        },
      ),
    );
  });

  it('reuses lanes past the maximum, and alternates sides never on the track itself', () => {
    const w = Array.from({ length: 5 }, () => ({ open_s: 0, close_s: 10 }));
    expect(windowLanes(w, 3)).toEqual([0, 1, 2, 0, 1]);
    expect([0, 1, 2, 3, 4].map(laneSide)).toEqual([1, -1, 2, -2, 3]);
  });
});

describe('site label placement', () => {
  it('places labels so that no two overlap and none covers a marker, or leaves them out', () => {
    fc.assert(
      fc.property(
        fc.array(
          fc.record({
            x: fc.integer({ min: 0, max: 300 }),
            y: fc.integer({ min: 0, max: 200 }),
            width: fc.integer({ min: 10, max: 60 }),
          }),
          { maxLength: 80 },
        ),
        (raw) => {
          const labels = raw.map((r) => ({ ...r, height: 15 }));
          const places = placeLabels(labels, { markerSize: 14 });
          const boxes = places.flatMap((p, i) =>
            p
              ? [
                  {
                    i,
                    x0: labels[i].x + p.dx,
                    y0: labels[i].y + p.dy,
                    x1: labels[i].x + p.dx + labels[i].width,
                    y1: labels[i].y + p.dy + 15,
                  },
                ]
              : [],
          );
          for (let a = 0; a < boxes.length; a++)
            for (let b = a + 1; b < boxes.length; b++)
              expect(overlap(boxes[a], boxes[b])).toBe(false);
          for (const b of boxes)
            for (const l of labels)
              expect(overlap(b, { x0: l.x - 7, y0: l.y - 7, x1: l.x + 7, y1: l.y + 7 })).toBe(
                false,
              );
        },
      ),
    );
  });

  it('places both labels of two close markers, on their outer sides (no merged label)', () => {
    const places = placeLabels(
      [
        { x: 100, y: 100, width: 30, height: 15 },
        { x: 120, y: 100, width: 30, height: 15 },
      ],
      { markerSize: 14 },
    );
    // The neighbour's marker blocks the first label's right: it goes left (7 + 3 + 30 px).
    expect(places[0]).toEqual({ dx: -40, dy: -7.5, leader: false });
    expect(places[1]).toEqual({ dx: 10, dy: -7.5, leader: false });
  });

  it('leaves a label out when every place around its marker is taken', () => {
    // A marker ringed closely by others: the first label takes a place, a crowd blocks the rest.
    const crowd = [];
    for (let x = 0; x <= 200; x += 14)
      for (let y = 0; y <= 200; y += 14) crowd.push({ x, y, width: 30, height: 15 });
    const places = placeLabels(crowd, { markerSize: 14 });
    expect(places.filter((p) => p === null).length).toBeGreaterThan(crowd.length / 2);
  });
});

describe('map layer switches in settings', () => {
  it('keeps known switches, drops unknown keys, names a wrong value with what it may be', () => {
    const { settings, problems } = checkSettings({
      mapLayers: { reach: true, landing: false, hazard: 'yes', sparkles: true },
    });
    expect(settings.mapLayers).toEqual({ reach: true, landing: false });
    expect(problems).toEqual(['mapLayers.hazard "yes" is not true or false']);
    expect(checkSettings({ mapLayers: [1] }).problems).toEqual([
      'mapLayers must be an object, not a list',
    ]);
    // Settings saved before the switches were kept: the map's defaults, no problem.
    expect(checkSettings({ paper: 'A4' })).toEqual({
      settings: expect.objectContaining({ mapLayers: {} }),
      problems: [],
    });
  });
});
