// What the planner adds over an elevation model (docs/model.md §18): the ground under the
// nominal descent, the reach polygon, hidden ground, the fall profile and the carrier's ground.
import {
  CROSS_GROUND,
  type ElevationModel,
  FallTable,
  firstCrossing,
  type FlightSetup,
  type FlightTerrain,
  type LocalBox,
  LocalFrame,
  MIN_REACH_RAYS,
  nominalPath,
  type PathAt,
  type Programme,
  type TerrainGround,
  type Vec,
} from '../model';
import type { Plan } from '../plan';
import type {
  CarrierGroundPoint,
  FallProfilePoint,
  GeoPolygon,
  HiddenBy,
  PlanTerrain,
  SiteResult,
} from './results';
import { terrainLocalBox } from './terrain-area';

const DEG = Math.PI / 180;

/** Lowest ground a descent is followed to (the plan schema's lowest ground), m MSL. */
const LOWEST_GROUND_M = -500;
/** A typed site elevation this far from the model's gets a notice, m. */
export const ELEVATION_NOTICE_M = 5;
/** Points of a fall profile (≤ 121). */
const PROFILE_POINTS = 121;
/** The carrier's track is checked this long before the first window and after the last, s. */
export const TRACK_MARGIN_S = 30;
/** Most points along the carrier's track. */
const MAX_TRACK_POINTS = 2001;

/** The plan's terrain: the model and its ground in the plan's local frame. */
export interface PlanGround {
  model: ElevationModel;
  ground: TerrainGround;
  /** the local box the ground was built for (terrainLocalBox) */
  box: LocalBox;
  /** the ground's slope bound over that box (m per m) */
  maxSlope: number;
}

// The last ground built per model: re-plans of the same area reuse it (building one scans the grid).
const grounds = new WeakMap<
  ElevationModel,
  { key: string; ground: TerrainGround; maxSlope: number }
>();

/** The model's ground over the plan's terrain box; throws the model's own message when it falls short. */
export function planGround(plan: Plan, frame: LocalFrame, model: ElevationModel): PlanGround {
  const box = terrainLocalBox(plan, frame);
  const key = [frame.center.lat, frame.center.lon, box.xMin, box.yMin, box.xMax, box.yMax].join();
  const hit = grounds.get(model);
  if (hit && hit.key === key) return { model, ground: hit.ground, box, maxSlope: hit.maxSlope };
  const ground = model.localGround(frame, box);
  const maxSlope = ground.maxSlopeIn ? ground.maxSlopeIn(box) : Infinity;
  grounds.set(model, { key, ground, maxSlope });
  return { model, ground, box, maxSlope };
}

/**
 * The terrain part of a flight setup: the ground and the fall continued from the site's level
 * down to the lowest ground of the area (not below −500 m).
 */
export function flightTerrain(
  pg: PlanGround,
  table: FallTable,
  input: Omit<ConstructorParameters<typeof FallTable>[0], 'top_m' | 'bottom_m' | 'entryLoss_m'>,
): FlightTerrain {
  const low = Math.max(LOWEST_GROUND_M, pg.ground.minHeight_m - 1);
  const below =
    low < table.bottom_m - 0.01
      ? new FallTable({ ...input, top_m: table.bottom_m, bottom_m: low, entryLoss_m: 0 })
      : null;
  return {
    ground: pg.ground,
    below,
    bottom_m: below ? low : table.bottom_m,
    maxSlope: pg.maxSlope,
  };
}

/** Where a path meets the ground: point, altitude, or null when it meets no known ground. */
export function crossing(
  su: FlightSetup,
  path: PathAt,
): { x: number; y: number; z: number } | null {
  const t = su.terrain;
  if (!t) return null;
  const out = new Float64Array(4);
  const kind = firstCrossing(t.ground, path, su.table.top_m, t.bottom_m, out);
  return kind === CROSS_GROUND ? { x: out[0], y: out[1], z: out[2] } : null;
}

/** Steering by altitude: cot γ per metre lost from the entry end, for at most `drop_m`, along a heading. */
export function steering(su: FlightSetup, heading_rad: number, drop_m: number) {
  const ux = Math.sin(heading_rad);
  const uy = Math.cos(heading_rad);
  const e = su.table.entryEnd_m;
  const cot = su.cotGamma;
  return (z: number): Vec => {
    const d = cot * Math.min(drop_m, Math.max(0, e - z));
    return { x: d * ux, y: d * uy };
  };
}

/**
 * Reach polygon (local m, clockwise from north): full-authority steering for the control time
 * along MIN_REACH_RAYS headings from the uncontrolled descent, each followed to the ground;
 * null when a ray meets no known ground or the variant cannot steer.
 */
export function reachRing(su: FlightSetup, release: Vec): Vec[] | null {
  if (su.guidance === 'passive' || su.cotGamma <= 0) return null;
  const drop = su.table.steeredDrop(su.controlTime_s);
  const ring: Vec[] = [];
  for (let k = 0; k < MIN_REACH_RAYS; k++) {
    const h = (2 * Math.PI * k) / MIN_REACH_RAYS;
    const c = crossing(su, nominalPath(su, release, steering(su, h, drop)));
    if (!c) return null;
    ring.push({ x: c.x, y: c.y });
  }
  return ring;
}

/** A local ring as a GeoJSON Polygon: counter-clockwise (RFC 7946 §3.1.6), closed. */
export function geoPolygon(frame: LocalFrame, clockwise: Vec[]): GeoPolygon {
  const ring = [...clockwise].reverse().map((p): [number, number] => {
    const q = frame.toLatLon(p.x, p.y);
    return [q.lon, q.lat];
  });
  ring.push([ring[0][0], ring[0][1]]);
  return { type: 'Polygon', coordinates: [ring] };
}

/** Whether p lies inside a ring (even-odd rule) or within tol_m of its edges. */
export function inRing(ring: Vec[], p: Vec, tol_m: number): boolean {
  let inside = false;
  let near = Infinity;
  for (let i = 0, j = ring.length - 1; i < ring.length; j = i++) {
    const a = ring[i];
    const b = ring[j];
    if (a.y > p.y !== b.y > p.y && p.x < ((b.x - a.x) * (p.y - a.y)) / (b.y - a.y) + a.x) {
      inside = !inside;
    }
    const dx = b.x - a.x;
    const dy = b.y - a.y;
    const l2 = dx * dx + dy * dy;
    const t = l2 > 0 ? Math.max(0, Math.min(1, ((p.x - a.x) * dx + (p.y - a.y) * dy) / l2)) : 0;
    near = Math.min(near, Math.hypot(p.x - a.x - t * dx, p.y - a.y - t * dy));
  }
  return inside || near <= tol_m;
}

/**
 * The descent aimed at the site: passive — the uncontrolled one; fixed-heading — its programme;
 * homing — the steering it needs, capped at its reach, spread evenly over the altitude from the
 * entry end to the site's level.
 */
export function aimedPath(
  su: FlightSetup,
  release: Vec,
  site: Vec,
  flatLanding: Vec,
  prog: Programme | undefined,
): PathAt {
  if (su.guidance === 'fixed-heading' && prog && prog.thrust_s > 0) {
    const drop = su.table.steeredDrop(prog.thrust_s);
    return nominalPath(su, release, steering(su, prog.headingTrue_deg * DEG, drop));
  }
  if (su.guidance !== 'homing' || su.cotGamma <= 0) return nominalPath(su, release);
  const need = { x: site.x - flatLanding.x, y: site.y - flatLanding.y };
  const dist = Math.hypot(need.x, need.y);
  const reach = su.cotGamma * su.table.steeredDrop(su.controlTime_s);
  const k = dist > reach && dist > 0 ? reach / dist : 1;
  const top = su.table.entryEnd_m;
  const span = Math.max(1e-9, top - su.table.bottom_m);
  return nominalPath(su, release, (z) => {
    const s = Math.min(1, Math.max(0, (top - z) / span)) * k;
    return { x: need.x * s, y: need.y * s };
  });
}

/** The descent seen from the side, from the top down to altitude z_end, with the ground under it. */
export function fallProfile(su: FlightSetup, path: PathAt, z_end: number): FallProfilePoint[] {
  const out = new Float64Array(2);
  const top = su.table.top_m;
  const pts: FallProfilePoint[] = [];
  let dist = 0;
  let px = NaN;
  let py = NaN;
  for (let i = 0; i < PROFILE_POINTS; i++) {
    const z = top - ((top - z_end) * i) / (PROFILE_POINTS - 1);
    path(z, out);
    if (i > 0) dist += Math.hypot(out[0] - px, out[1] - py);
    px = out[0];
    py = out[1];
    const g = su.terrain?.ground.height(px, py) ?? null;
    pts.push({ dist_m: dist, alt_m: z, ground_m: g });
  }
  return pts;
}

/** Ground met by the aimed descent that hides the site: > 1 m above its ground and beyond its tolerance. */
export function hiddenBy(
  frame: LocalFrame,
  hit: { x: number; y: number; z: number } | null,
  site: Vec,
  siteGround_m: number,
  tol_m: number,
): HiddenBy | undefined {
  if (!hit) return undefined;
  const fromSite_m = Math.hypot(hit.x - site.x, hit.y - site.y);
  const aboveSite_m = hit.z - siteGround_m;
  if (!(aboveSite_m > 1 && fromSite_m > tol_m)) return undefined;
  const p = frame.toLatLon(hit.x, hit.y);
  return { lat: p.lat, lon: p.lon, ground_m: hit.z, aboveSite_m, fromSite_m };
}

/**
 * The ground under the carrier: along its track (a moving carrier) from 30 s before the first
 * release window opens to 30 s after the last closes, at about one model cell (≤ 2,001 points);
 * at each site's release or hover point (a hovering carrier).
 */
export function planTerrain(
  pg: PlanGround,
  frame: LocalFrame,
  unit: Vec,
  speed: number,
  sites: SiteResult[],
): PlanTerrain {
  const carrier: CarrierGroundPoint[] = [];
  const model = pg.model;
  if (speed > 0 && sites.length > 0) {
    let t0 = Infinity;
    let t1 = -Infinity;
    for (const s of sites) {
      const a = s.releaseWindow ? s.releaseWindow.open_s : s.release.time_s;
      const b = s.releaseWindow ? s.releaseWindow.close_s : s.release.time_s;
      t0 = Math.min(t0, a);
      t1 = Math.max(t1, b);
    }
    t0 -= TRACK_MARGIN_S;
    t1 += TRACK_MARGIN_S;
    // Only the part of the track inside the area the model was read for (terrainLocalBox).
    const b = pg.box;
    const inside = (d: number): boolean => {
      const x = unit.x * d;
      const y = unit.y * d;
      return x >= b.xMin && x <= b.xMax && y >= b.yMin && y <= b.yMax;
    };
    const len = (t1 - t0) * speed;
    const n = Math.max(2, Math.min(MAX_TRACK_POINTS, Math.ceil(len / pg.ground.cell_m) + 1));
    for (let i = 0; i < n; i++) {
      const d = (t0 + ((t1 - t0) * i) / (n - 1)) * speed;
      if (!inside(d)) continue;
      const p = frame.toLatLon(unit.x * d, unit.y * d);
      carrier.push({ ...p, ground_m: model.sample(p), kind: 'track' });
    }
  } else {
    for (const s of sites) {
      const p = s.releaseZone ? s.releaseZone.center : { lat: s.release.lat, lon: s.release.lon };
      carrier.push({
        lat: p.lat,
        lon: p.lon,
        ground_m: model.sample(p),
        kind: 'hover',
        site: s.id,
      });
    }
  }
  const known = carrier.map((c) => c.ground_m).filter((g): g is number => g !== null);
  return {
    name: model.name,
    carrier,
    carrierGroundMin_m: known.length ? Math.min(...known) : null,
    carrierGroundMax_m: known.length ? Math.max(...known) : null,
  };
}
