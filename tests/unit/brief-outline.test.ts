import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { simplifyRing, simplifyRings, type XY } from '../../app/brief/outline';
import { segDist as segmentDistance } from '../../app/safety';

/** Distance from p to the closed ring's outline (its nearest edge), m. */
function toOutline(p: XY, ring: readonly XY[]): number {
  let d = Infinity;
  for (let i = 0; i < ring.length; i++)
    d = Math.min(d, segmentDistance(p, ring[i], ring[(i + 1) % ring.length]));
  return d;
}

const circle = (r: number, n: number, cx = 0, cy = 0): XY[] =>
  Array.from({ length: n }, (_, k) => ({
    x: cx + r * Math.cos((2 * Math.PI * k) / n),
    y: cy + r * Math.sin((2 * Math.PI * k) / n),
  }));

describe('outline simplification (Douglas–Peucker)', () => {
  it('keeps every original vertex within the tolerance of the simplified outline', () => {
    // The Douglas–Peucker guarantee (Douglas & Peucker 1973): every dropped point lies within the
    // tolerance of the segment that replaced it. Checked on random rings.
    const pt = fc.record({
      x: fc.double({ min: -2000, max: 2000, noNaN: true }),
      y: fc.double({ min: -2000, max: 2000, noNaN: true }),
    });
    fc.assert(
      fc.property(
        fc.array(pt, { minLength: 3, maxLength: 120 }),
        fc.double({ min: 0.1, max: 200, noNaN: true }),
        (ring, tol) => {
          const s = simplifyRing(ring, tol);
          expect(s.length).toBeLessThanOrEqual(ring.length);
          for (const p of ring) expect(toOutline(p, s)).toBeLessThanOrEqual(tol + 1e-9);
          // Corners are original points, in their original order.
          let at = -1;
          for (const c of s) {
            const i = ring.findIndex((q, k) => k > at && q.x === c.x && q.y === c.y);
            expect(i).toBeGreaterThan(at);
            at = i;
          }
        },
      ),
    );
  });

  it('brings a finely drawn circle down to a few corners, each within the tolerance', () => {
    // A chord of a circle of radius r over angle θ stands r(1 − cos θ/2) off the arc (geometry):
    // with r = 100 m and 5 m that allows θ up to 2·acos(0.95) ≈ 36.4°, so at least 10 corners,
    // and far fewer than the 360 drawn.
    const ring = circle(100, 360);
    const s = simplifyRing(ring, 5);
    expect(s.length).toBeGreaterThanOrEqual(10);
    expect(s.length).toBeLessThan(30);
    for (const p of ring) expect(toOutline(p, s)).toBeLessThanOrEqual(5 + 1e-9);
  });

  it('reduces a square drawn with points along its sides to its four corners', () => {
    // common practice: collinear points carry no shape.
    const ring: XY[] = [];
    for (let i = 0; i < 10; i++) ring.push({ x: i * 10, y: 0 });
    for (let i = 0; i < 10; i++) ring.push({ x: 100, y: i * 10 });
    for (let i = 0; i < 10; i++) ring.push({ x: 100 - i * 10, y: 100 });
    for (let i = 0; i < 10; i++) ring.push({ x: 0, y: 100 - i * 10 });
    ring.push({ x: 0, y: 0 }); // a closing repeat is ignored
    const s = simplifyRing(ring, 0.5);
    expect(s.map((p) => `${p.x},${p.y}`).sort()).toEqual(['0,0', '0,100', '100,0', '100,100']);
  });

  it('keeps a sliver flatter than the tolerance an area of three corners', () => {
    const ring = [
      { x: 0, y: 0 },
      { x: 50, y: 0.5 },
      { x: 100, y: 0 },
      { x: 50, y: -0.4 },
    ];
    expect(simplifyRing(ring, 5)).toHaveLength(3);
  });

  it('doubles the tolerance until the whole list fits, and says which tolerance it used', () => {
    const rings = [circle(300, 720), circle(200, 500, 1000, 0)];
    const first = simplifyRings(rings, 0.01, 1e6);
    expect(first.tolerance_m).toBe(0.01);
    const short = simplifyRings(rings, 0.01, 30);
    expect(short.rings.reduce((a, r) => a + r.length, 0)).toBeLessThanOrEqual(30);
    // 0.01 · 2^k for some whole k.
    const k = Math.log2(short.tolerance_m / 0.01);
    expect(Math.abs(k - Math.round(k))).toBeLessThan(1e-9);
    rings.forEach((ring, i) => {
      for (const p of ring)
        expect(toOutline(p, short.rings[i])).toBeLessThanOrEqual(short.tolerance_m + 1e-9);
    });
    // One step less would not have fitted (else the search went a step too far).
    const less = simplifyRings(rings, short.tolerance_m / 2, 1e6);
    expect(less.rings.reduce((a, r) => a + r.length, 0)).toBeGreaterThan(30);
  });
});
