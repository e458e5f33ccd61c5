/** Descents meeting the ground: planes, a cone hill and a ridge against their closed forms. */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  type Crossing,
  type DescentPath,
  flatGround,
  glideRays,
  type Ground,
  groundCrossing,
  hiddenGround,
  linePath,
  reachPolygon,
  CROSS_GROUND,
  fastCrossing,
  firstCrossing,
  type PathAt,
  sampledGround,
} from '../../app/model';
import { expectClose } from './helpers';

function landed(c: Crossing) {
  expect(c.kind).toBe('ground');
  return c;
}

describe('groundCrossing', () => {
  it('on flat ground equals the flat answer to the millimetre', () => {
    // A curving path (drift turning with height): on level ground h it lands where it passes h (common practice).
    const path: DescentPath = {
      at: (z) => ({
        x: 0.4 * (900 - z) + 30 * Math.sin(z / 70),
        y: -0.2 * (900 - z) + 12 * Math.cos(z / 45),
      }),
      top_m: 900,
      bottom_m: -500,
    };
    for (const h of [0, 123.4, 512.25, 899]) {
      const c = landed(groundCrossing(flatGround(h), path));
      const flat = path.at(h);
      expectClose(c.z, h, 1e-3, `altitude at h ${h}`);
      expectClose(c.x, flat.x, 1e-3, 'x');
      expectClose(c.y, flat.y, 1e-3, 'y');
    }
  });

  it('on an inclined plane in a uniform wind meets it at the closed-form time', () => {
    // z(t) = z0 − w·t, x(t) = x0 + u·t meets z = a·x + c at t* = (z0 − c − a·x0)/(w + a·u) (direct algebra).
    fc.assert(
      fc.property(
        fc.double({ min: -0.35, max: 0.35, noNaN: true }),
        fc.double({ min: -15, max: 15, noNaN: true }),
        fc.double({ min: 2, max: 12, noNaN: true }),
        fc.double({ min: -500, max: 500, noNaN: true }),
        fc.double({ min: 0, max: 300, noNaN: true }),
        fc.double({ min: 100, max: 1500, noNaN: true }),
        (a, u, w, x0, c, height) => {
          const z0 = a * x0 + c + height; // start `height` above the plane
          fc.pre(w + a * u > 0.5); // the path closes on the plane
          const plane: Ground = { height: (x) => a * x + c };
          const c1 = groundCrossing(plane, linePath({ x: x0, y: 40, z: z0 }, u / w, 0, -1e4));
          const t = (z0 - c - a * x0) / (w + a * u);
          expect(c1.kind).toBe('ground');
          expectClose(c1.x, x0 + u * t, 2e-3, 'x'); // 1 mm in altitude, at most ~1.5 mm sideways here
          expectClose(c1.z, z0 - w * t, 1e-3, 'z');
          expect(c1.y).toBe(40);
        },
      ),
      { numRuns: 300, seed: 13 },
    );
  });

  it('the ceiling only skips air: with or without maxHeight_m the crossing is the same', () => {
    const hill = (x: number, y: number) =>
      200 + 150 * Math.exp(-((x - 300) ** 2 + y ** 2) / 20_000);
    const path = linePath({ x: 0, y: 10, z: 1200 }, 0.8, 0.05, -100);
    const a = landed(groundCrossing({ height: hill }, path));
    const b = landed(groundCrossing({ height: hill, maxHeight_m: 351 }, path));
    expectClose(a.x, b.x, 2e-3, 'x');
    expectClose(a.z, b.z, 1e-3, 'z');
  });

  it('no height under the path ends the search as no-data there, never on a made-up ground', () => {
    const patchy: Ground = { height: (x) => (x < 500 ? 100 : null) };
    const c = groundCrossing(patchy, linePath({ x: 0, y: 0, z: 400 }, 2, 0, -100)); // would land at x 600
    expect(c.kind).toBe('no-data');
    expect(c.x).toBeGreaterThanOrEqual(500);
    expect(c.x).toBeLessThan(505 + 1e-9); // within one 5 m step of the edge
  });

  it('a start at or below the ground is reported with the ground height', () => {
    const c = groundCrossing(flatGround(300), linePath({ x: 0, y: 0, z: 250 }, 1, 0, 0));
    expect(c).toMatchObject({ kind: 'start-below', ground_m: 300 });
  });

  it('a path that stays above the ground down to bottom_m is none', () => {
    expect(groundCrossing(flatGround(-50), linePath({ x: 0, y: 0, z: 250 }, 1, 0, 0)).kind).toBe(
      'none',
    );
  });
});

describe('reachPolygon', () => {
  // A cone hill: ground = max(0, H − s·|P − C|). A glide from the origin at z0 loses 1 m per k m
  // sideways: z = z0 − ρ/k. On the cone, s·D = ρ/k − (z0 − H) with D² = ρ² − 2ρ·(û·C) + |C|²,
  // a quadratic in ρ; on the flat ground ρ = k·z0. The first crossing is the smallest valid root
  // (direct algebra).
  const H = 300;
  const s = 0.4;
  const C = { x: 600, y: 150 };
  const z0 = 500;
  const k = 2;
  const cone: Ground = {
    height: (x, y) => Math.max(0, H - s * Math.hypot(x - C.x, y - C.y)),
    maxHeight_m: H,
  };
  function closedForm(heading: number): number {
    const u = { x: Math.sin(heading), y: Math.cos(heading) };
    const m = 1 / k;
    const a = z0 - H;
    const b = u.x * C.x + u.y * C.y;
    const c2 = C.x ** 2 + C.y ** 2;
    const D = (r: number) => Math.sqrt(Math.max(0, r * r - 2 * r * b + c2));
    const cands: number[] = [];
    const A = s * s - m * m;
    const B = 2 * a * m - 2 * s * s * b;
    const Cq = s * s * c2 - a * a;
    const disc = B * B - 4 * A * Cq;
    if (disc >= 0) {
      for (const r of [(-B - Math.sqrt(disc)) / (2 * A), (-B + Math.sqrt(disc)) / (2 * A)]) {
        if (r >= 0 && m * r - a >= 0 && D(r) <= H / s) cands.push(r);
      }
    }
    if (D(k * z0) >= H / s) cands.push(k * z0);
    return Math.min(...cands);
  }

  it('a cone hill: each of 72 rays ends at the closed-form radius', () => {
    const reach = reachPolygon(cone, glideRays({ x: 0, y: 0, z: z0 }, k, -100), { rays: 72 });
    expect(reach.bearings_rad).toHaveLength(72);
    expect(reach.polygon).toHaveLength(72);
    let onCone = 0;
    reach.crossings.forEach((c, i) => {
      const want = closedForm(reach.bearings_rad[i]);
      if (want < k * z0 - 1e-6) onCone++;
      expectClose(Math.hypot(c.x, c.y), want, 1e-2, `ray ${i}`); // 1 mm in altitude ≤ 1 cm along the ray here
    });
    // Both kinds of ray are exercised: blocked by the hill and out to the flat radius.
    expect(onCone).toBeGreaterThan(5);
    expect(onCone).toBeLessThan(72 - 5);
  });

  it('casts at least 72 rays however few are asked for, evenly from north', () => {
    const reach = reachPolygon(flatGround(0), glideRays({ x: 0, y: 0, z: 100 }, 3, -1), {
      rays: 8,
    });
    expect(reach.bearings_rad).toHaveLength(72);
    expectClose(reach.bearings_rad[18], Math.PI / 2, 1e-12, 'east');
    // Flat ground: a circle of radius cot γ · height (common practice).
    for (const p of reach.polygon ?? []) expectClose(Math.hypot(p.x, p.y), 300, 1e-3, 'radius');
  });

  it('a ray into missing data leaves no polygon but says which ray', () => {
    const half: Ground = { height: (x) => (x > -100 ? 0 : null) };
    const reach = reachPolygon(half, glideRays({ x: 0, y: 0, z: 100 }, 3, -1));
    expect(reach.polygon).toBeNull();
    expect(reach.crossings[54].kind).toBe('no-data'); // due west
    expect(reach.crossings[18].kind).toBe('ground'); // due east
  });
});

describe('hiddenGround', () => {
  // Level ground at 100 m with a triangular ridge across the path: crest at x = 800, half-width 50.
  const ridge = (crest: number): Ground => ({
    height: (x) => 100 + Math.max(0, crest - 100) * Math.max(0, 1 - Math.abs(x - 800) / 50),
  });
  // From (0, 0, 600) the path loses 1 m per 2 m east: it reaches 100 m exactly at the site x = 1000.
  const path = linePath({ x: 0, y: 0, z: 600 }, 2, 0, -100);
  const site = { x: 1000, y: 0 };

  it('a ridge between the release and the site hides it, where the closed form says', () => {
    const v = hiddenGround(ridge(250), path, site);
    expect(v.hidden).toBe(true);
    if (!v.hidden) return;
    // 600 − x/2 = 100 + 150·(1 − (800 − x)/50) ⇒ x = 2750/3.5 (direct algebra).
    const x = 2750 / 3.5;
    expectClose(v.obstacle.x, x, 2e-3, 'obstacle x');
    expectClose(v.obstacle.z, 600 - x / 2, 1e-3, 'obstacle z');
    expectClose(v.fromSite_m, 1000 - x, 2e-3, 'from site');
    expectClose(v.aboveSite_m, 500 - x / 2, 1e-3, 'above site');
  });

  it('a ridge the path clears does not hide the site: it lands on it', () => {
    const v = hiddenGround(ridge(150), path, site); // the path passes x = 800 at 200 m
    expect(v.hidden).toBe(false);
    expectClose(v.crossing.x, 1000, 2e-3, 'landing x');
  });
});

describe('fastCrossing (the Monte Carlo shortcut) against the walk', () => {
  const box = { xMin: -1600, yMin: -1600, xMax: 1600, yMax: 1600 };
  // A straight descent from (x0, y0, top) moving (vx, vy) metres per metre of altitude lost.
  const line = (x0: number, y0: number, top: number, vx: number, vy: number): PathAt => {
    return (z, out) => {
      out[0] = x0 + vx * (top - z);
      out[1] = y0 + vy * (top - z);
    };
  };

  it('finds the walk’s first crossing whenever it certifies one (random hills and descents)', () => {
    // Property: whatever fastCrossing returns as ground is the crossing firstCrossing finds
    // (the walk is the reference; direct definition of the first zero of z − h(p(z))).
    let certified = 0;
    let refused = 0;
    fc.assert(
      fc.property(
        fc.double({ min: 0, max: 60, noNaN: true }),
        fc.double({ min: 50, max: 600, noNaN: true }),
        fc.double({ min: -3, max: 3, noNaN: true }),
        fc.double({ min: -3, max: 3, noNaN: true }),
        fc.double({ min: 90, max: 300, noNaN: true }),
        (amp, wave, vx, vy, top) => {
          const g = sampledGround(
            (x, y) => 50 + amp * Math.sin(x / wave) * Math.cos(y / (1.3 * wave)),
            box,
            10,
          );
          const at = line(-100, 50, top, vx, vy);
          const walk = new Float64Array(4);
          firstCrossing(g, at, top, -100, walk, 5, 1e-4);
          // Start the shortcut where the level-ground answer would be: altitude 50.
          const p = new Float64Array(2);
          at(50, p);
          const fast = new Float64Array(4);
          const v = Math.hypot(vx, vy);
          const kind = fastCrossing(g, at, 50, p[0], p[1], top, -100, v, fast, 1e-4);
          if (kind === CROSS_GROUND) {
            certified++;
            expect(walk[3]).toBe(CROSS_GROUND);
            expect(Math.abs(fast[2] - walk[2])).toBeLessThan(0.01);
            expect(Math.hypot(fast[0] - walk[0], fast[1] - walk[1])).toBeLessThan(0.05);
          } else {
            refused++;
            expect(kind).toBe(-1);
          }
        },
      ),
      { numRuns: 100 },
    );
    // Both branches were tried: gentle hills certify, steep ones fall back to the walk.
    expect(certified).toBeGreaterThan(10);
    expect(refused).toBeGreaterThan(0);
  }, 120_000);

  it('refuses to certify behind a ridge, where the secant finds the far side', () => {
    // A 40 m ridge 100 m wide across the descent (150 < x < 250); level ground at 0 elsewhere.
    // A descent from x = 0 at 100 m moving 3 m per m, x = 3(100 − z), is at 40 m over x = 180,
    // on the ridge's top, before it reaches level ground at x = 300 (direct algebra).
    const g = sampledGround((x) => (Math.abs(x - 200) < 50 ? 40 : 0), box, 5);
    const at = line(0, 0, 100, 3, 0);
    const fast = new Float64Array(4);
    const kind = fastCrossing(g, at, 0, 300, 0, 100, -50, 3, fast, 1e-3);
    expect(kind).toBe(-1);
    const walk = new Float64Array(4);
    expect(firstCrossing(g, at, 100, -50, walk)).toBe(CROSS_GROUND);
    expectClose(walk[0], 180, 0.01, 'meets the ridge top at x = 180');
    expectClose(walk[2], 40, 0.001, 'at the ridge height');
  });
});
