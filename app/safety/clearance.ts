// Clearance between a convex polygon and a no-drop polygon in local metres: point-in-polygon,
// segment distances and crossings, bounding boxes.
import type { MultiPolygon, Polygon, Position } from 'geojson';
import { type LatLon, LocalFrame } from '../model';
import type { XY } from './hazard-area';

/** Distance (m) from p to the segment a–b. */
export function segDist(p: XY, a: XY, b: XY): number {
  const dx = b.x - a.x;
  const dy = b.y - a.y;
  const L = dx * dx + dy * dy;
  const t = L > 0 ? Math.max(0, Math.min(1, ((p.x - a.x) * dx + (p.y - a.y) * dy) / L)) : 0;
  return Math.hypot(p.x - a.x - t * dx, p.y - a.y - t * dy);
}

export function cross(o: XY, a: XY, b: XY): number {
  return (a.x - o.x) * (b.y - o.y) - (a.y - o.y) * (b.x - o.x);
}

export function segmentsCross(a: XY, b: XY, c: XY, d: XY): boolean {
  const d1 = cross(c, d, a);
  const d2 = cross(c, d, b);
  const d3 = cross(a, b, c);
  const d4 = cross(a, b, d);
  return d1 * d2 <= 0 && d3 * d4 <= 0 && !(d1 === 0 && d2 === 0 && d3 === 0 && d4 === 0);
}

export function insideRing(p: XY, ring: readonly XY[]): boolean {
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
export type LocalPolygon = XY[][];

export function insidePolygon(p: XY, poly: LocalPolygon): boolean {
  return insideRing(p, poly[0]) && !poly.slice(1).some((h) => insideRing(p, h));
}

/** Bounding box of local points, m. */
export interface Box {
  x0: number;
  y0: number;
  x1: number;
  y1: number;
}

/** Bounding box of local points. */
export function boxOf(pts: readonly XY[]): Box {
  const b = { x0: Infinity, y0: Infinity, x1: -Infinity, y1: -Infinity };
  for (const p of pts) {
    if (p.x < b.x0) b.x0 = p.x;
    if (p.x > b.x1) b.x1 = p.x;
    if (p.y < b.y0) b.y0 = p.y;
    if (p.y > b.y1) b.y1 = p.y;
  }
  return b;
}

/** Least distance between two boxes, m (0 when they touch or overlap): a lower bound on the clearance of what they hold. */
export function boxGap(a: Box, b: Box): number {
  const dx = Math.max(0, a.x0 - b.x1, b.x0 - a.x1);
  const dy = Math.max(0, a.y0 - b.y1, b.y0 - a.y1);
  return Math.hypot(dx, dy);
}

/** A no-drop zone in the local frame, converted once: its polygons (open rings) and their boxes. */
export interface LocalZone {
  polygons: { rings: LocalPolygon; box: Box }[];
  /** Box of every polygon; empty (infinite) when the zone has no usable polygon. */
  box: Box;
}

/** A no-drop polygon or multipolygon (GeoJSON, [lon, lat]) in the local frame. */
export function localZone(frame: LocalFrame, zone: Polygon | MultiPolygon): LocalZone {
  const polys: Position[][][] = zone.type === 'Polygon' ? [zone.coordinates] : zone.coordinates;
  const polygons: LocalZone['polygons'] = [];
  for (const rings of polys) {
    const local: LocalPolygon = rings.map((r) => {
      const pts = r.map(([lon, lat]) => frame.toLocal({ lat, lon } as LatLon));
      const last = pts[pts.length - 1];
      if (pts.length > 1 && last.x === pts[0].x && last.y === pts[0].y) pts.pop();
      return pts;
    });
    if (local.length === 0 || local[0].length < 3) continue;
    polygons.push({ rings: local, box: boxOf(local[0]) });
  }
  return { polygons, box: boxOf(polygons.flatMap((p) => [...p.rings[0]])) };
}

/**
 * Clearance (m) between a convex polygon `shape` (local, open ring) and a zone in the same frame;
 * 0 when they touch or overlap. Zone edges whose box is no nearer than the best distance so far
 * are skipped: they can neither cross the shape nor come closer.
 */
export function clearanceLocal(shape: readonly XY[], zone: LocalZone): number {
  const sb = boxOf(shape);
  let best = Infinity;
  for (const { rings, box } of zone.polygons) {
    if (boxGap(sb, box) === 0) {
      if (shape.some((p) => insidePolygon(p, rings))) return 0;
      if (rings[0].some((p) => insideRing(p, shape))) return 0;
    }
    if (boxGap(sb, box) >= best) continue;
    for (const ring of rings) {
      for (let i = 0; i < ring.length; i++) {
        const c = ring[i];
        const d = ring[(i + 1) % ring.length];
        const eb = {
          x0: Math.min(c.x, d.x),
          y0: Math.min(c.y, d.y),
          x1: Math.max(c.x, d.x),
          y1: Math.max(c.y, d.y),
        };
        if (boxGap(sb, eb) >= best) continue;
        for (let k = 0; k < shape.length; k++) {
          const a = shape[k];
          const b = shape[(k + 1) % shape.length];
          if (segmentsCross(a, b, c, d)) return 0;
          best = Math.min(best, segDist(a, c, d), segDist(c, a, b));
        }
      }
    }
  }
  return best;
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
  return clearanceLocal(shape, localZone(frame, zone));
}
