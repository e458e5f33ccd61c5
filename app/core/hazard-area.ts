/**
 * Geometry of the safety checks: the hazard area (landing ellipses swept over the release
 * window, and the ground under the release, grown by a buffer) and the clearance between a
 * landing ellipse and a no-drop polygon. Worked in the plan's local frame (azimuthal
 * equidistant about the release point, as the planner's), where every piece is convex.
 *
 * Each convex piece is the Minkowski sum of an ellipse, a segment, and a disc (the buffer), so
 * its support function is the sum of theirs; the polygon drawn for it is the *circumscribed*
 * one (the tangent lines at n evenly spread directions), which always contains the true shape.
 */
import { area as turfArea, featureCollection, polygon as turfPolygon, union } from '@turf/turf';
import type { Feature, MultiPolygon, Polygon, Position } from 'geojson';
import { LocalFrame, type LatLon } from './geodesy';
import type { GeoEllipse, PlanResult } from './planner';

const DEG = Math.PI / 180;

/** Local east/north metres. */
interface XY {
  x: number;
  y: number;
}

/** A convex shape: ellipse ⊕ segment ⊕ disc, all optional but one. Lengths in m, local frame. */
export interface ConvexPiece {
  /** Centre of the shape (the ellipse centre, or the segment's reference point). */
  center: XY;
  ellipse?: { semiMajor_m: number; semiMinor_m: number; azimuth_deg: number };
  /** Ends of a segment, relative to center, swept along with the rest. */
  sweep?: [XY, XY];
  /** Radius of a disc added to the shape (buffer), m. */
  radius_m?: number;
}

/** Support function h(u) = max over the piece of p·u, for a unit direction (ux, uy). */
function support(p: ConvexPiece, ux: number, uy: number): number {
  let h = p.center.x * ux + p.center.y * uy;
  if (p.ellipse) {
    const s = Math.sin(p.ellipse.azimuth_deg * DEG);
    const c = Math.cos(p.ellipse.azimuth_deg * DEG);
    const along = ux * s + uy * c; // component on the major axis (azimuth clockwise from north)
    const across = ux * c - uy * s;
    h += Math.hypot(p.ellipse.semiMajor_m * along, p.ellipse.semiMinor_m * across);
  }
  if (p.sweep) {
    const [a, b] = p.sweep;
    h += Math.max(a.x * ux + a.y * uy, b.x * ux + b.y * uy);
  }
  return h + Math.max(0, p.radius_m ?? 0);
}

/**
 * Counter-clockwise vertices (local metres, not closed) of the polygon circumscribing a piece:
 * the intersections of its tangent lines at directions 2πk/n.
 */
export function circumscribed(p: ConvexPiece, n = 72): XY[] {
  const count = Math.max(8, Math.round(n));
  const th = (k: number): number => (2 * Math.PI * k) / count;
  const h = Array.from({ length: count }, (_, k) => support(p, Math.cos(th(k)), Math.sin(th(k))));
  const sinStep = Math.sin((2 * Math.PI) / count);
  const out: XY[] = [];
  for (let k = 0; k < count; k++) {
    const j = (k + 1) % count;
    // Solve x·u_k = h_k, x·u_j = h_j for the corner between two tangent lines.
    const a = th(k);
    const b = th(j);
    out.push({
      x: (h[k] * Math.sin(b) - h[j] * Math.sin(a)) / sinStep,
      y: (h[j] * Math.cos(a) - h[k] * Math.cos(b)) / sinStep,
    });
  }
  return out;
}

/** A landing ellipse as a convex piece in the frame. */
export function ellipsePiece(frame: LocalFrame, e: GeoEllipse): ConvexPiece {
  return {
    center: frame.toLocal(e.center),
    ellipse: { semiMajor_m: e.semiMajor_m, semiMinor_m: e.semiMinor_m, azimuth_deg: e.azimuth_deg },
  };
}

/** GeoJSON ring ([lon, lat], closed, counter-clockwise) of local vertices. */
export function toRing(frame: LocalFrame, pts: readonly XY[]): Position[] {
  const ring = pts.map((q) => {
    const g = frame.toLatLon(q.x, q.y);
    return [g.lon, g.lat];
  });
  ring.push([...ring[0]]);
  return ring;
}

/** One piece of the hazard area: where a site's vehicles may land, or where they are released. */
export interface HazardPiece {
  label: string;
  site: string;
  kind: 'landing' | 'release';
  piece: ConvexPiece;
}

/** The pieces the hazard area is the union of, before the buffer, with a label each. */
export function hazardPieces(result: PlanResult, frame: LocalFrame): HazardPiece[] {
  const { unit, groundSpeed_mps: v } = result.track;
  const moving = v > 0;
  const at = (t_s: number): XY => ({ x: unit.x * v * t_s, y: unit.y * v * t_s });
  const out: HazardPiece[] = [];
  for (const s of result.sites) {
    const rel = frame.toLocal(s.release);
    const ell = ellipsePiece(frame, s.ellipse99);
    const w = s.releaseWindow;
    const z = s.releaseZone;
    if (moving && w) {
      // Release anywhere in the window moves the landing with it (exact for passive and
      // fixed-heading; conservative for homing, which steers back towards the site).
      const a = at(w.open_s - s.release.time_s);
      const b = at(w.close_s - s.release.time_s);
      out.push({
        label: `${s.id}: 99 % landing ellipse over the window`,
        site: s.id,
        kind: 'landing',
        piece: { ...ell, sweep: [a, b] },
      });
      out.push({
        label: `${s.id}: track under the release window`,
        site: s.id,
        kind: 'release',
        piece: { center: { x: 0, y: 0 }, sweep: [at(w.open_s), at(w.close_s)] },
      });
    } else if (!moving && z) {
      const zc = frame.toLocal(z.center);
      out.push({
        label: `${s.id}: 99 % landing ellipse over the zone`,
        site: s.id,
        kind: 'landing',
        piece: { ...ell, radius_m: z.radius_m },
      });
      out.push({
        label: `${s.id}: hover release zone`,
        site: s.id,
        kind: 'release',
        piece: { center: zc, radius_m: z.radius_m },
      });
    } else {
      out.push({ label: `${s.id}: 99 % landing ellipse`, site: s.id, kind: 'landing', piece: ell });
      out.push({
        label: `${s.id}: release point`,
        site: s.id,
        kind: 'release',
        piece: { center: rel },
      });
    }
  }
  return out;
}

/** Hazard area: union (turf.union) of every piece grown by buffer_m (m), and its area (m², turf.area). */
export function hazardArea(
  result: PlanResult,
  buffer_m: number,
  n = 72,
): { feature: Feature<Polygon | MultiPolygon>; area_m2: number } {
  const frame = new LocalFrame(result.releasePoint);
  const polys = hazardPieces(result, frame).map(({ piece }) =>
    turfPolygon([
      toRing(frame, circumscribed({ ...piece, radius_m: (piece.radius_m ?? 0) + buffer_m }, n)),
    ]),
  );
  const props = { name: 'Hazard area', buffer_m };
  let feature: Feature<Polygon | MultiPolygon> | null =
    polys.length > 0 ? union(featureCollection(polys), { properties: props }) : null;
  feature ??= {
    type: 'Feature',
    properties: props,
    geometry: { type: 'MultiPolygon', coordinates: [] },
  };
  return { feature, area_m2: polys.length > 0 ? turfArea(feature) : 0 };
}

// ---- Clearance between a convex polygon and a no-drop polygon (local metres) ----

function segDist(p: XY, a: XY, b: XY): number {
  const dx = b.x - a.x;
  const dy = b.y - a.y;
  const L = dx * dx + dy * dy;
  const t = L > 0 ? Math.max(0, Math.min(1, ((p.x - a.x) * dx + (p.y - a.y) * dy) / L)) : 0;
  return Math.hypot(p.x - a.x - t * dx, p.y - a.y - t * dy);
}

function cross(o: XY, a: XY, b: XY): number {
  return (a.x - o.x) * (b.y - o.y) - (a.y - o.y) * (b.x - o.x);
}

function segmentsCross(a: XY, b: XY, c: XY, d: XY): boolean {
  const d1 = cross(c, d, a);
  const d2 = cross(c, d, b);
  const d3 = cross(a, b, c);
  const d4 = cross(a, b, d);
  return d1 * d2 <= 0 && d3 * d4 <= 0 && !(d1 === 0 && d2 === 0 && d3 === 0 && d4 === 0);
}

function insideRing(p: XY, ring: readonly XY[]): boolean {
  let inside = false;
  for (let i = 0, j = ring.length - 1; i < ring.length; j = i++) {
    const a = ring[i];
    const b = ring[j];
    if (a.y > p.y !== b.y > p.y && p.x < ((b.x - a.x) * (p.y - a.y)) / (b.y - a.y) + a.x) {
      inside = !inside;
    }
  }
  return inside;
}

/** Rings (local, open) of a polygon: outer first, then holes. */
type LocalPolygon = XY[][];

function insidePolygon(p: XY, poly: LocalPolygon): boolean {
  return insideRing(p, poly[0]) && !poly.slice(1).some((h) => insideRing(p, h));
}

function edges(ring: readonly XY[]): [XY, XY][] {
  return ring.map((a, i) => [a, ring[(i + 1) % ring.length]]);
}

/**
 * Clearance (m) between a convex polygon `shape` (local, open ring) and a no-drop polygon or
 * multipolygon (GeoJSON, [lon, lat]); 0 when they touch or overlap.
 */
export function clearance_m(
  frame: LocalFrame,
  shape: readonly XY[],
  zone: Polygon | MultiPolygon,
): number {
  const polys: Position[][][] = zone.type === 'Polygon' ? [zone.coordinates] : zone.coordinates;
  let best = Infinity;
  for (const rings of polys) {
    const local: LocalPolygon = rings.map((r) => {
      const pts = r.map(([lon, lat]) => frame.toLocal({ lat, lon } as LatLon));
      const last = pts[pts.length - 1];
      if (pts.length > 1 && last.x === pts[0].x && last.y === pts[0].y) pts.pop();
      return pts;
    });
    if (local.length === 0 || local[0].length < 3) continue;
    if (shape.some((p) => insidePolygon(p, local))) return 0;
    if (local[0].some((p) => insideRing(p, shape))) return 0;
    const se = edges(shape);
    for (const ring of local) {
      for (const [c, d] of edges(ring)) {
        for (const [a, b] of se) {
          if (segmentsCross(a, b, c, d)) return 0;
          best = Math.min(best, segDist(a, c, d), segDist(c, a, b));
        }
      }
    }
  }
  return best;
}
