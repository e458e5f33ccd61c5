/**
 * The hazard area and the no-drop check on many sites: the cascaded Clipper2 union against
 * turf.union of the same pieces, and the pruned no-drop check against every piece measured
 * against every zone with turf. Speed is measured in scripts/bench.ts, not here.
 */
import {
  area as turfArea,
  booleanIntersects,
  booleanPointInPolygon,
  difference,
  featureCollection,
  length as turfLength,
  point,
  polygon,
  polygonToLine,
  union,
} from '@turf/turf';
import type { Feature, Polygon } from 'geojson';
import { describe, expect, it } from 'vitest';
import { LocalFrame } from '../../app/model/geodesy';
import {
  circumscribed,
  hazardArea,
  hazardPieces,
  toRing,
  unionLocal,
} from '../../app/safety/hazard-area';
import { planDrop, type PlanResult } from '../../app/planner';
import { safetyChecks, DEFAULT_SAFETY_SETTINGS } from '../../app/safety/safety';
import type { Plan } from '../../app/plan/plan';
import { validatePlan } from '../../app/plan/validate';
import { makeField } from '../support/make-field';
import { NOW, expectClose } from './helpers';

function field(n: number, seed: number, samples = 300): { plan: Plan; result: PlanResult } {
  const file = makeField(n, seed);
  file.monteCarlo = { samples, seed: 1 };
  const v = validatePlan(file, { now: NOW });
  if (!v.ok) throw new Error(v.errors.map((e) => e.message).join('; '));
  return { plan: v.plan, result: planDrop(v.plan) };
}

describe('hazard area on many sites', () => {
  it('matches turf.union of the same pieces within a millimetre of boundary', () => {
    const { result } = field(20, 11);
    const buffer = DEFAULT_SAFETY_SETTINGS.hazardBuffer_m;
    const frame = new LocalFrame(result.releasePoint);
    // Reference library: turf.union (polyclip-ts) of every piece at once, in [lon, lat].
    const reference = union(
      featureCollection(
        hazardPieces(result, frame).map(({ piece }) =>
          polygon([
            toRing(frame, circumscribed({ ...piece, radius_m: (piece.radius_m ?? 0) + buffer })),
          ]),
        ),
      ),
    )!;
    const ours = hazardArea(result, buffer);
    const ab = difference(featureCollection([reference, ours.feature]));
    const ba = difference(featureCollection([ours.feature, reference]));
    const symmetric = (ab ? turfArea(ab) : 0) + (ba ? turfArea(ba) : 0);
    const outline_m = turfLength(polygonToLine(reference) as never, { units: 'meters' });
    // 1 mm rounding of the union moves the outline by 0.25 mm on average (common practice:
    // mean of |uniform ±0.5 mm|); allow 1 mm.
    expect(symmetric / outline_m).toBeLessThan(1e-3);
    expectClose(ours.area_m2, turfArea(reference), 1e-5 * turfArea(reference));
  }, 120_000);

  it('keeps every site of a 1,000-site plan inside one outline', () => {
    // Fewer Monte Carlo samples: the union, not the statistics, is under test.
    const { result } = field(1000, 5, 100);
    const hz = hazardArea(result, DEFAULT_SAFETY_SETTINGS.hazardBuffer_m).feature;
    for (const s of result.sites) {
      expect(booleanPointInPolygon(point([s.nominalLanding.lon, s.nominalLanding.lat]), hz)).toBe(
        true,
      );
      expect(booleanPointInPolygon(point([s.release.lon, s.release.lat]), hz)).toBe(true);
    }
  }, 300_000);

  it('gives an outer ring with its hole for pieces around an empty middle', () => {
    // Four 10 m × 40 m bars framing a 20 m × 20 m hole: area 40² − 20² = 1200 m² (hand count).
    const bar = (x0: number, y0: number, w: number, h: number) => [
      { x: x0, y: y0 },
      { x: x0 + w, y: y0 },
      { x: x0 + w, y: y0 + h },
      { x: x0, y: y0 + h },
    ];
    const tree = unionLocal([
      bar(0, 0, 40, 10),
      bar(0, 30, 40, 10),
      bar(0, 10, 10, 20),
      bar(30, 10, 10, 20),
    ]);
    expect(tree.count).toBe(1);
    const outer = tree.child(0);
    expect(outer.count).toBe(1);
    const shoelace = (p: readonly { x: number; y: number }[]) =>
      p.reduce((s, a, i) => s + a.x * p[(i + 1) % p.length].y - p[(i + 1) % p.length].x * a.y, 0) /
      2;
    expectClose(Math.abs(shoelace(outer.poly!)), 1600, 1e-6);
    expectClose(Math.abs(shoelace(outer.child(0).poly!)), 400, 1e-6);
  });
});

describe('no-drop check on many sites', () => {
  /** A rectangle (local metres) as a [lon, lat] polygon feature. */
  function zone(frame: LocalFrame, name: string, x0: number, y0: number, x1: number, y1: number) {
    const ring = toRing(frame, [
      { x: x0, y: y0 },
      { x: x1, y: y0 },
      { x: x1, y: y1 },
      { x: x0, y: y1 },
    ]);
    return polygon([ring], { name }) as Feature<Polygon>;
  }

  it('reports the same site–zone pairs and least clearance as every piece against every zone', () => {
    const { plan, result } = field(60, 23);
    const frame = new LocalFrame(result.releasePoint);
    const zones = [
      zone(frame, 'inside', -30, -20, 10, 10),
      zone(frame, 'strip', -400, -160, 400, -150),
      zone(frame, 'far', 2000, 2000, 2100, 2100),
    ];
    const buffer = 25;
    const report = safetyChecks(plan, result, {
      ...DEFAULT_SAFETY_SETTINGS,
      noDropZones: zones,
      noDropBuffer_m: buffer,
    });
    const check = report.checks.find((c) => c.id === 'no-drop-zones')!;
    // Reference: each landing piece against each zone; overlap by turf.booleanIntersects, else
    // the least vertex-to-edge distance either way (the distance of two disjoint polygons).
    const expected: { site: string; zone: string; clearance_m: number }[] = [];
    let least = Infinity;
    for (const hp of hazardPieces(result, frame).filter((p) => p.kind === 'landing')) {
      const ring = circumscribed(hp.piece);
      const shape = polygon([toRing(frame, ring)]);
      for (const z of zones) {
        const local = z.geometry.coordinates[0]
          .slice(0, -1)
          .map(([lon, lat]) => frame.toLocal({ lat, lon }));
        const c = booleanIntersects(shape, z) ? 0 : polygonGap(ring, local);
        least = Math.min(least, c);
        if (c < buffer)
          expected.push({ site: hp.site, zone: String(z.properties!.name), clearance_m: c });
      }
    }
    expect(expected.length).toBeGreaterThan(0);
    expect(check.items!.map((i) => [i.site, i.zone])).toEqual(
      expected.map((e) => [e.site, e.zone]),
    );
    check.items!.forEach((item, i) =>
      expectClose(item.clearance_m as number, expected[i].clearance_m, 0.051),
    );
    expectClose(check.numbers.leastClearance_m as number, least, 0.051);
  }, 120_000);
});

type XY = { x: number; y: number };

/** Least distance between two disjoint polygons: vertex to edge, both ways (from memory). */
function polygonGap(a: readonly XY[], b: readonly XY[]): number {
  const seg = (p: XY, q: XY, r: XY) => {
    const dx = r.x - q.x;
    const dy = r.y - q.y;
    const t = Math.max(0, Math.min(1, ((p.x - q.x) * dx + (p.y - q.y) * dy) / (dx * dx + dy * dy)));
    return Math.hypot(p.x - q.x - t * dx, p.y - q.y - t * dy);
  };
  let best = Infinity;
  for (const [u, v] of [
    [a, b],
    [b, a],
  ] as const) {
    for (const p of u)
      for (let i = 0; i < v.length; i++) best = Math.min(best, seg(p, v[i], v[(i + 1) % v.length]));
  }
  return best;
}
