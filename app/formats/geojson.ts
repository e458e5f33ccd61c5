// GeoJSON (RFC 7946): the plan's results written as a FeatureCollection, and sites read from
// features (also KML placemarks, through togeojson).
import type { Plan } from '../plan';
import type { GeoPolygon, PlanResult } from '../planner';
import { makeSite } from './csv';
import {
  ellipsePositions,
  ellipseRingOf,
  moving,
  orientPolygon,
  planSite,
  pos,
  round,
  trackPoint,
  trackSpan,
  trackTimes,
} from './export-shared';
import {
  checkLatLon,
  clip,
  IdPool,
  optionalNumber,
  type Problems,
  type ReadTarget,
  Sink,
} from './site-reading';

/** A GeoJSON position [lon, lat] in degrees (RFC 7946 §3.1.1). */
export type Position = [number, number];

export type PolygonGeometry =
  | { type: 'Polygon'; coordinates: Position[][] }
  | { type: 'MultiPolygon'; coordinates: Position[][][] };

export type Geometry =
  | { type: 'Point'; coordinates: Position }
  | { type: 'LineString'; coordinates: Position[] }
  | PolygonGeometry;

export interface Feature {
  type: 'Feature';
  geometry: Geometry;
  properties: Record<string, unknown>;
}

export interface FeatureCollection {
  type: 'FeatureCollection';
  features: Feature[];
}

/** A polygonal area as input: positions may be plain number arrays (e.g. turf or @types/geojson). */
export type PolygonInput =
  | { type: 'Polygon'; coordinates: number[][][] }
  | { type: 'MultiPolygon'; coordinates: number[][][][] };

export interface GeoJSONOptions {
  /** A hazard area to include as a 'hazard' feature: a Polygon/MultiPolygon or a Feature of one (e.g. hazardArea().feature). */
  hazardArea?:
    | PolygonInput
    | { type: 'Feature'; geometry: PolygonInput; properties?: Record<string, unknown> | null };
}

/** RFC 7946 FeatureCollection of sites, releases, landings, areas, windows and the track. */
export function toGeoJSON(
  plan: Plan,
  result: PlanResult,
  opts: GeoJSONOptions = {},
): FeatureCollection {
  const features: Feature[] = [];
  const add = (geometry: Geometry, properties: Record<string, unknown>): void => {
    features.push({ type: 'Feature', geometry, properties });
  };
  result.sites.forEach((r, i) => {
    const s = planSite(plan, result, i);
    const tag = { site: r.id, variant: r.variant };
    add(
      { type: 'Point', coordinates: pos(s) },
      {
        kind: 'site',
        id: r.id,
        name: r.name,
        variant: r.variant,
        pinned: r.pinned,
        recommended: r.recommended,
        recommendation: r.recommendation.kind,
        recommendationWhy: r.recommendation.why,
        pHit: round(r.pHit, 4),
        pHitSE: round(r.pHitSE, 4),
        cep_m: round(r.cep_m, 2),
        reachable: r.reachable,
        meetsRequired: r.meetsRequired,
        tolerance_m: s.tolerance_m,
        elevation_m: s.elevation_m,
      },
    );
    add(
      { type: 'Point', coordinates: pos(r.release) },
      { kind: 'release', name: `R-${r.id}`, ...tag, time_s: round(r.release.time_s, 2) },
    );
    add(
      { type: 'Point', coordinates: pos(r.nominalLanding) },
      {
        kind: 'landing',
        ...tag,
        fallTime_s: round(r.fallTime_s, 2),
        nominalMiss_m: round(r.nominalMiss_m, 2),
      },
    );
    // Over an elevation model each variant's reach is the polygon cast on the ground
    // (docs/model.md §18); on flat ground the chosen variant's reach is a circle.
    if (result.terrain) {
      for (const v of r.byVariant) {
        const ring = reachRing(v.reachPolygon);
        if (!ring) continue;
        add(
          { type: 'Polygon', coordinates: orientPolygon([ring]) },
          {
            kind: 'reach',
            site: r.id,
            variant: v.variant,
            chosen: v.variant === r.variant,
            ground: 'terrain',
          },
        );
      }
    } else if (r.reachRadius_m > 0) {
      add(
        {
          type: 'Polygon',
          coordinates: [
            ellipsePositions(r.nominalLanding, r.reachRadius_m, r.reachRadius_m, 0, 96),
          ],
        },
        { kind: 'reach', ...tag, radius_m: round(r.reachRadius_m, 2) },
      );
    }
    for (const [kind, e] of [
      ['ellipse50', r.ellipse50],
      ['ellipse95', r.ellipse95],
    ] as const) {
      add(
        { type: 'Polygon', coordinates: [ellipseRingOf(e)] },
        {
          kind,
          ...tag,
          semiMajor_m: round(e.semiMajor_m, 2),
          semiMinor_m: round(e.semiMinor_m, 2),
          azimuth_deg: round(e.azimuth_deg, 1),
        },
      );
    }
    const w = r.releaseWindow;
    if (w && moving(result)) {
      add(
        {
          type: 'LineString',
          coordinates: [pos(trackPoint(result, w.open_s)), pos(trackPoint(result, w.close_s))],
        },
        {
          kind: 'window',
          ...tag,
          open_s: round(w.open_s, 2),
          close_s: round(w.close_s, 2),
          best_s: round(w.best_s, 2),
        },
      );
    }
    const z = r.releaseZone;
    if (z && Number.isFinite(z.radius_m)) {
      add(
        { type: 'Polygon', coordinates: [ellipsePositions(z.center, z.radius_m, z.radius_m, 0)] },
        { kind: 'zone', ...tag, radius_m: round(z.radius_m, 2) },
      );
    }
  });
  if (moving(result)) {
    const [from, to] = trackSpan(result);
    add(
      {
        type: 'LineString',
        coordinates: trackTimes(from, to).map((t) => pos(trackPoint(result, t))),
      },
      {
        kind: 'track',
        trackDeg: result.track.trackDeg,
        groundSpeed_mps: result.track.groundSpeed_mps,
        from_s: from,
        to_s: to,
      },
    );
  }
  const h = opts.hazardArea;
  if (h) {
    const g = h.type === 'Feature' ? h.geometry : h;
    const extra = h.type === 'Feature' ? (h.properties ?? {}) : {};
    const geometry: PolygonGeometry =
      g.type === 'Polygon'
        ? { type: 'Polygon', coordinates: orientPolygon(g.coordinates) }
        : { type: 'MultiPolygon', coordinates: g.coordinates.map(orientPolygon) };
    add(geometry, { ...extra, kind: 'hazard' });
  }
  return { type: 'FeatureCollection', features };
}

/** The outer ring of a planner's reach polygon, closed (RFC 7946 §3.1.6), or null when unusable. */
function reachRing(p: GeoPolygon | null | undefined): Position[] | null {
  const ring = p?.type === 'Polygon' ? p.coordinates?.[0] : undefined;
  if (!Array.isArray(ring)) return null;
  const pts = ring.filter(
    (q): q is Position =>
      Array.isArray(q) &&
      Number.isFinite(q[0]) &&
      Number.isFinite(q[1]) &&
      Math.abs(q[0]) <= 180 &&
      Math.abs(q[1]) <= 90,
  );
  if (pts.length !== ring.length) return null;
  const [a, z] = [pts[0], pts[pts.length - 1]];
  const closed = pts.length > 0 && a[0] === z[0] && a[1] === z[1] ? pts : [...pts, a];
  // A linear ring has at least four positions, the first and last equal (RFC 7946 §3.1.6).
  return closed.length >= 4 ? closed.map((q): Position => [q[0], q[1]]) : null;
}

export type Json = Record<string, unknown>;
export const isObj = (x: unknown): x is Json =>
  typeof x === 'object' && x !== null && !Array.isArray(x);

export function readGeoJSON(text: string, to: ReadTarget): void {
  const { ids, sink, problems } = to;
  let root: unknown;
  try {
    root = JSON.parse(text);
  } catch (e) {
    const msg = (e as Error).message;
    const at = /position (\d+)/.exec(msg);
    const line = at ? text.slice(0, Number(at[1])).split('\n').length : undefined;
    problems.push({
      ...(line ? { line } : {}),
      message: `${line ? `line ${line}: ` : ''}not valid JSON (${msg})`,
    });
    return;
  }
  let features: unknown[];
  if (isObj(root) && root.type === 'FeatureCollection') {
    if (!Array.isArray(root.features)) {
      problems.push({ message: 'FeatureCollection has no "features" array' });
      return;
    }
    features = root.features;
  } else if (isObj(root) && root.type === 'Feature') features = [root];
  else if (isObj(root) && typeof root.type === 'string')
    features = [{ type: 'Feature', geometry: root, properties: {} }];
  else {
    problems.push({
      message: 'not GeoJSON: expected a FeatureCollection, a Feature or a geometry object',
    });
    return;
  }
  readFeatures(features, ids, sink, problems);
}

export const str = (x: unknown): string | undefined =>
  typeof x === 'string' ? x : typeof x === 'number' && Number.isFinite(x) ? String(x) : undefined;

/** Sites from GeoJSON features (an array, or KML placemarks as togeojson yields them). */
export function readFeatures(
  features: Iterable<unknown>,
  ids: IdPool,
  sink: Sink,
  problems: Problems,
): void {
  // Planned results in our own exports (kind release, ellipse95, …): one problem per kind.
  const results = new Map<string, { first: number[]; last: number; count: number }>();
  let i = -1;
  for (const f of features) {
    i++;
    if (!readFeature(f, i, ids, sink, problems, results)) break;
  }
  for (const [kind, at] of results) {
    const list =
      at.count > 6 ? `${at.first.slice(0, 5).join(', ')} … ${at.last}` : at.first.join(', ');
    problems.push({
      feature: at.first[0],
      message: `features ${list} (${at.count}): kind "${clip(kind)}" is a planned result, not a site; not imported`,
    });
  }
}

/** One feature; false when the plan is full and reading must stop. */
export function readFeature(
  f: unknown,
  i: number,
  ids: IdPool,
  sink: Sink,
  problems: Problems,
  results: Map<string, { first: number[]; last: number; count: number }>,
): boolean {
  const where = { feature: i };
  const skip = (why: string): boolean => {
    problems.push({ feature: i, message: `features[${i}]: ${why}; not imported` });
    return true;
  };
  if (!isObj(f) || f.type !== 'Feature') return skip('not a Feature object');
  const props = isObj(f.properties) ? f.properties : {};
  const kind = str(props.kind);
  if (kind !== undefined && kind !== 'site') {
    const r = results.get(kind) ?? { first: [], last: i, count: 0 };
    if (r.first.length < 6) r.first.push(i);
    r.last = i;
    r.count++;
    results.set(kind, r);
    return true;
  }
  const points = pointsOf(f.geometry, `features[${i}]`);
  if (typeof points === 'string') return skip(points);
  const ele = optionalNumber(
    props.elevation_m ?? props.elevation ?? props.ele,
    'elevation_m',
    false,
  );
  if (!ele.ok) return skip(ele.message);
  const tol = optionalNumber(props.tolerance_m ?? props.tolerance, 'tolerance_m', false);
  if (!tol.ok) return skip(tol.message);
  const pinned = props.pinned !== false && props.pinned !== 'false';
  const variant = pinned ? str(props.variant) : undefined;
  const rawId =
    str(props.id) ??
    (typeof f.id === 'string' || typeof f.id === 'number' ? String(f.id) : undefined);
  const name = str(props.name);
  for (let k = 0; k < points.length; k++) {
    const far = sink.tooFar(points[k], 'GeoJSON and KML give longitude first');
    if (far) {
      skip(points.length > 1 ? `position ${k + 1}: ${far}` : far);
      continue;
    }
    if (!sink.accepts()) return false;
    const id = points.length > 1 && rawId !== undefined ? `${rawId}-${k + 1}` : rawId;
    sink.sites.push(makeSite(ids, where, id, name, true, points[k], ele.value, tol.value, variant));
  }
  return true;
}

export function pointsOf(g: unknown, path: string): { lat: number; lon: number }[] | string {
  if (g === null || g === undefined) return 'has no geometry';
  if (!isObj(g)) return 'geometry is not an object';
  const one = (c: unknown, at: string): { lat: number; lon: number } | string => {
    if (!Array.isArray(c) || c.length < 2 || typeof c[0] !== 'number' || typeof c[1] !== 'number') {
      return `${at} is not a [lon, lat] position`;
    }
    const err = checkLatLon(c[1], c[0]);
    return err ?? { lat: c[1], lon: c[0] };
  };
  if (g.type === 'Point') {
    const p = one(g.coordinates, `${path}.geometry.coordinates`);
    return typeof p === 'string' ? p : [p];
  }
  if (g.type === 'MultiPoint') {
    if (!Array.isArray(g.coordinates) || g.coordinates.length === 0)
      return 'MultiPoint has no positions';
    const out = [];
    for (let k = 0; k < g.coordinates.length; k++) {
      const p = one(g.coordinates[k], `${path}.geometry.coordinates[${k}]`);
      if (typeof p === 'string') return p;
      out.push(p);
    }
    return out;
  }
  return `a ${typeof g.type === 'string' ? clip(g.type) : 'geometry without a type'} is not a site; only Point and MultiPoint are`;
}
