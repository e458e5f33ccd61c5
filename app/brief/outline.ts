// Outlines short enough to read out: Douglas–Peucker simplification of closed rings in a local
// metric frame (docs/model.md §17), with the tolerance raised until the list stays short.
import { segDist } from '../safety';

/** A point in a local frame, m east (x) and north (y). */
export interface XY {
  x: number;
  y: number;
}

/** Indices kept of the open chain pts[i0..i1] (both ends kept), iterative Douglas–Peucker. */
function chain(pts: readonly XY[], i0: number, i1: number, tol_m: number, keep: boolean[]): void {
  const stack: [number, number][] = [[i0, i1]];
  while (stack.length > 0) {
    const [a, b] = stack.pop()!;
    let far = -1;
    let farD = tol_m;
    for (let i = a + 1; i < b; i++) {
      const d = segDist(pts[i], pts[a], pts[b]);
      if (d > farD) {
        farD = d;
        far = i;
      }
    }
    if (far >= 0) {
      keep[far] = true;
      stack.push([a, far], [far, b]);
    }
  }
}

/**
 * Corners of a closed ring (open form: the first point is not repeated) simplified so that every
 * original point lies within tol_m of the simplified ring (Douglas & Peucker 1973, with the
 * distance to the segment, not the infinite line). The ring is cut at its first point and the
 * point farthest from it, both of which are kept; at least three corners remain when the ring
 * has three.
 */
export function simplifyRing(ring: readonly XY[], tol_m: number): XY[] {
  const pts = dedupe(ring);
  const n = pts.length;
  if (n <= 3) return pts.map((p) => ({ ...p }));
  let far = 1;
  let farD = -1;
  for (let i = 1; i < n; i++) {
    const d = Math.hypot(pts[i].x - pts[0].x, pts[i].y - pts[0].y);
    if (d > farD) {
      farD = d;
      far = i;
    }
  }
  const closed = [...pts, pts[0]];
  const keep = closed.map(() => false);
  keep[0] = keep[far] = keep[n] = true;
  chain(closed, 0, far, tol_m, keep);
  chain(closed, far, n, tol_m, keep);
  let out = pts.filter((_, i) => keep[i]);
  if (out.length < 3) {
    // A sliver flatter than the tolerance: keep its widest third corner so it stays an area.
    let best = -1;
    let bestD = -1;
    for (let i = 0; i < n; i++) {
      if (keep[i]) continue;
      const d = segDist(pts[i], pts[0], pts[far]);
      if (d > bestD) {
        bestD = d;
        best = i;
      }
    }
    keep[best] = true;
    out = pts.filter((_, i) => keep[i]);
  }
  return out.map((p) => ({ ...p }));
}

/** Drops a closing repeat and consecutive duplicate points. */
function dedupe(ring: readonly XY[]): XY[] {
  const out: XY[] = [];
  for (const p of ring) {
    const q = out[out.length - 1];
    if (!q || q.x !== p.x || q.y !== p.y) out.push(p);
  }
  while (out.length > 1 && out[0].x === out[out.length - 1].x && out[0].y === out[out.length - 1].y)
    out.pop();
  return out;
}

/** Rings simplified within tolerance_m, which is doubled from start_m until at most maxCorners remain in all. */
export function simplifyRings(
  rings: readonly (readonly XY[])[],
  start_m: number,
  maxCorners: number,
): { rings: XY[][]; tolerance_m: number } {
  let tol = start_m;
  for (;;) {
    const out = rings.map((r) => simplifyRing(r, tol));
    const total = out.reduce((a, r) => a + r.length, 0);
    // Each ring keeps at least three corners, so past this no tolerance can shorten the list.
    if (total <= maxCorners || out.every((r) => r.length <= 3) || tol > 1e7)
      return { rings: out, tolerance_m: tol };
    tol *= 2;
  }
}
