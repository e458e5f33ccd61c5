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
import { area as turfArea } from '@turf/turf';
import {
  Clipper,
  ClipType,
  FillRule,
  type PathD,
  type PathsD,
  type PolyPathD,
  PolyTreeD,
} from 'clipper2-ts';
import type { Feature, MultiPolygon, Polygon, Position } from 'geojson';
import { LocalFrame } from '../model';
import type { GeoEllipse, PlanResult } from '../planner';

const DEG = Math.PI / 180;

/** Local east/north metres. */
export interface XY {
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

// Union resolution in the local frame, decimal places of a metre (1 mm).
const UNION_DECIMALS = 3;

/** Position of (x, y) along a Hilbert curve over a 2^order grid (x, y in 0…2^order − 1). */
function hilbertIndex(x: number, y: number, order: number): number {
  let d = 0;
  for (let s = 2 ** (order - 1); s >= 1; s /= 2) {
    const rx = x >= s ? 1 : 0;
    const ry = y >= s ? 1 : 0;
    d += s * s * ((3 * rx) ^ ry);
    x -= rx * s;
    y -= ry * s;
    if (ry === 0) {
      if (rx === 1) {
        x = s - 1 - x;
        y = s - 1 - y;
      }
      [x, y] = [y, x];
    }
  }
  return d;
}

/**
 * Union of polygons (local metres, 1 mm resolution) as a tree of outer rings and holes.
 * Cascaded: polygons are ordered along a Hilbert curve and merged pairwise, level by level, so
 * each merge meets only the outline of its neighbours and interiors drop out early. A single
 * union of every piece at once meets every crossing of every overlapping pair, which grows with
 * the square of the site count.
 */
export function unionLocal(polys: readonly (readonly XY[])[]): PolyTreeD {
  const items = polys
    .filter((p) => p.length >= 3)
    .map((p) => {
      let cx = 0;
      let cy = 0;
      for (const q of p) {
        cx += q.x;
        cy += q.y;
      }
      return { path: p.map((q) => ({ x: q.x, y: q.y })), cx: cx / p.length, cy: cy / p.length };
    });
  const tree = new PolyTreeD();
  if (items.length === 0) return tree;
  let [x0, x1, y0, y1] = [Infinity, -Infinity, Infinity, -Infinity];
  for (const it of items) {
    x0 = Math.min(x0, it.cx);
    x1 = Math.max(x1, it.cx);
    y0 = Math.min(y0, it.cy);
    y1 = Math.max(y1, it.cy);
  }
  const order = 16;
  const cells = 2 ** order - 1;
  const span = Math.max(x1 - x0, y1 - y0, 1e-9);
  const keyed = items.map((it) => ({
    path: it.path,
    key: hilbertIndex(
      Math.round(((it.cx - x0) / span) * cells),
      Math.round(((it.cy - y0) / span) * cells),
      order,
    ),
  }));
  keyed.sort((a, b) => a.key - b.key); // stable: equal keys keep the pieces' order
  let level: PathsD[] = keyed.map((k) => [k.path]);
  while (level.length > 2) {
    const next: PathsD[] = [];
    for (let i = 0; i < level.length; i += 2) {
      next.push(
        i + 1 < level.length
          ? Clipper.unionD(level[i], level[i + 1], FillRule.NonZero, UNION_DECIMALS)
          : level[i],
      );
    }
    level = next;
  }
  Clipper.booleanOpDWithPolyTree(
    ClipType.Union,
    level[0],
    level[1] ?? [],
    tree,
    FillRule.NonZero,
    UNION_DECIMALS,
  );
  return tree;
}

/** [lon, lat] order: west to east, then south to north. */
const westFirst = (a: Position, b: Position): number => a[0] - b[0] || a[1] - b[1];

/**
 * GeoJSON polygons ([lon, lat], closed, outer counter-clockwise, holes clockwise) of a union tree,
 * in a fixed order whatever the union's internals: each ring starts at its westernmost vertex,
 * holes and parts are sorted west to east.
 */
function treePolygons(frame: LocalFrame, tree: PolyTreeD): Position[][][] {
  const out: Position[][][] = [];
  const ring = (path: readonly XY[], outer: boolean): Position[] => {
    const pts = Clipper.isPositiveD(path as PathD) === outer ? path : [...path].reverse();
    const open = toRing(frame, pts).slice(0, -1);
    let k = 0;
    for (let i = 1; i < open.length; i++) if (westFirst(open[i], open[k]) < 0) k = i;
    const rotated = [...open.slice(k), ...open.slice(0, k)];
    return [...rotated, [...rotated[0]]];
  };
  const visitOuter = (node: PolyPathD): void => {
    if (!node.poly) return;
    const holes: Position[][] = [];
    for (let i = 0; i < node.count; i++) {
      const hole = node.child(i);
      if (hole.poly) holes.push(ring(hole.poly, false));
      for (let j = 0; j < hole.count; j++) visitOuter(hole.child(j)); // islands inside holes
    }
    holes.sort((a, b) => westFirst(a[0], b[0]));
    out.push([ring(node.poly, true), ...holes]);
  };
  for (let i = 0; i < tree.count; i++) visitOuter(tree.child(i));
  return out.sort((a, b) => westFirst(a[0][0], b[0][0]));
}

/**
 * Hazard area: union of every piece grown by buffer_m (m), taken in the local frame (cascaded,
 * 1 mm resolution), and its area (m², turf.area).
 */
export function hazardArea(
  result: PlanResult,
  buffer_m: number,
  n = 72,
): { feature: Feature<Polygon | MultiPolygon>; area_m2: number } {
  const frame = new LocalFrame(result.releasePoint);
  const polys = hazardPieces(result, frame).map(({ piece }) =>
    circumscribed({ ...piece, radius_m: (piece.radius_m ?? 0) + buffer_m }, n),
  );
  const parts = treePolygons(frame, unionLocal(polys));
  const props = { name: 'Hazard area', buffer_m };
  const feature: Feature<Polygon | MultiPolygon> = {
    type: 'Feature',
    properties: props,
    geometry:
      parts.length === 1
        ? { type: 'Polygon', coordinates: parts[0] }
        : { type: 'MultiPolygon', coordinates: parts },
  };
  return { feature, area_m2: parts.length > 0 ? turfArea(feature) : 0 };
}
