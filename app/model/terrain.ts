/**
 * Where a descent meets the ground (docs/model.md §18): the crossing of a path that only goes
 * down with a height field, a reach polygon cast along rays, and ground that hides a site.
 * Pure: the ground is any function of the local frame (a DEM, a plane, a cone).
 *
 * NaN behaviour: a path or ground that returns NaN ends the search as `no-data` at that point.
 */
import type { LocalXY } from './geodesy';

/** The ground in a local frame (x east, y north, metres): height MSL in metres, null where unknown. */
export interface Ground {
  height(x_m: number, y_m: number): number | null;
  /** An upper bound of every height it can return (m); lets a search skip the air above it. */
  readonly maxHeight_m?: number;
}

/** Level ground at h_m metres. */
export function flatGround(h_m: number): Ground {
  return { height: () => h_m, maxHeight_m: h_m };
}

/** A descent parametrised by altitude: the path never climbs, so altitude orders its points. */
export interface DescentPath {
  /** horizontal position (local metres) where the path passes altitude z_m (MSL) */
  at(z_m: number): LocalXY;
  /** altitude where the path starts (m MSL) */
  top_m: number;
  /** lowest altitude searched (m MSL); below every ground the path can meet */
  bottom_m: number;
}

/** A point of the path, metres: x east, y north, z altitude MSL. */
export interface PathPoint {
  x: number;
  y: number;
  z: number;
}

/**
 * Where the search ended. `ground`: the path meets the ground at (x, y), altitude z (= the
 * ground's height there, within the tolerance). `no-data`: the path reached a point with no
 * height before meeting the ground. `start-below`: the path starts at or below the ground.
 * `none`: still above the ground at bottom_m.
 */
export type Crossing =
  | ({ kind: 'ground' } & PathPoint)
  | ({ kind: 'no-data' } & PathPoint)
  | ({ kind: 'start-below'; ground_m: number } & PathPoint)
  | ({ kind: 'none' } & PathPoint);

export interface CrossingOptions {
  /** largest altitude step of the bracketing walk (m); default 5 */
  maxStepZ_m?: number;
  /** largest horizontal move of one step (m); default 5, about a fine DEM's cell */
  maxStepXY_m?: number;
  /** the crossing's altitude is found to this (m); default 0.001 */
  tol_m?: number;
}

const MAX_WALK_STEPS = 1_000_000;
const MAX_REFINE = 200;

/**
 * First point where a descent meets the ground, m. Walks down from top_m (or from the ground's
 * maxHeight_m if lower) in steps no longer than maxStepZ_m and maxStepXY_m until the path is at
 * or below the ground, then closes that bracket by the Illinois variant of regula falsi.
 * Ground narrower than a step between two samples can be stepped over.
 */
export function groundCrossing(
  ground: Ground,
  path: DescentPath,
  opts: CrossingOptions = {},
): Crossing {
  const maxDz = opts.maxStepZ_m ?? 5;
  const maxDxy = opts.maxStepXY_m ?? 5;
  const tol = opts.tol_m ?? 0.001;
  const point = (z: number): PathPoint => ({ ...path.at(z), z });
  // gap = altitude − ground; null where the ground is unknown.
  const gap = (p: PathPoint): number | null => {
    const h = ground.height(p.x, p.y);
    return h === null || !Number.isFinite(h) || !Number.isFinite(p.x + p.y) ? null : p.z - h;
  };

  const top = point(path.top_m);
  const g0 = gap(top);
  if (g0 === null) return { kind: 'no-data', ...top };
  if (g0 <= 0) return { kind: 'start-below', ground_m: top.z - g0, ...top };

  // Above the highest ground nothing can be met: start the walk there (the path is checked at
  // the top first, so a start below the ceiling is caught above).
  let hi = top;
  let gHi = g0;
  const ceiling = ground.maxHeight_m;
  if (ceiling !== undefined && ceiling < top.z && ceiling > path.bottom_m) {
    const c = point(ceiling);
    const gc = gap(c);
    if (gc === null) return { kind: 'no-data', ...c };
    if (gc > 0) {
      hi = c;
      gHi = gc;
    }
  }
  for (let steps = 0; steps < MAX_WALK_STEPS; steps++) {
    if (hi.z <= path.bottom_m) return { kind: 'none', ...hi };
    let dz = Math.min(maxDz, hi.z - path.bottom_m);
    let lo = point(hi.z - dz);
    // Shorten the step while it moves too far sideways (down to 1/1024 of the step).
    for (let k = 0; k < 10 && Math.hypot(lo.x - hi.x, lo.y - hi.y) > maxDxy; k++) {
      dz /= 2;
      lo = point(hi.z - dz);
    }
    const gLo = gap(lo);
    if (gLo === null) return { kind: 'no-data', ...lo };
    if (gLo <= 0) return refine(hi, gHi, lo, gLo, point, gap, tol);
    hi = lo;
    gHi = gLo;
  }
  return { kind: 'none', ...hi };
}

/** Illinois regula falsi on a bracket: gap(hi) > 0 ≥ gap(lo). */
function refine(
  hi: PathPoint,
  gHi: number,
  lo: PathPoint,
  gLo: number,
  point: (z: number) => PathPoint,
  gap: (p: PathPoint) => number | null,
  tol: number,
): Crossing {
  let side = 0;
  for (let k = 0; k < MAX_REFINE; k++) {
    if (gLo === 0) return { kind: 'ground', ...lo };
    if (hi.z - lo.z <= tol) break;
    const z = lo.z + ((hi.z - lo.z) * -gLo) / (gHi - gLo);
    const zz = z > lo.z && z < hi.z ? z : (hi.z + lo.z) / 2;
    const p = point(zz);
    const g = gap(p);
    if (g === null) return { kind: 'no-data', ...p };
    if (Math.abs(g) <= tol / 10) return { kind: 'ground', ...p };
    if (g > 0) {
      hi = p;
      gHi = g;
      if (side === 1) gLo /= 2;
      side = 1;
    } else {
      lo = p;
      gLo = g;
      if (side === -1) gHi /= 2;
      side = -1;
    }
  }
  // Bracket narrower than tol: the end below ground is the conservative landing.
  return { kind: 'ground', ...lo };
}

/** A straight descent from (x0, y0, z0) moving vx, vy metres per metre of altitude lost. */
export function linePath(start: PathPoint, vx: number, vy: number, bottom_m: number): DescentPath {
  return {
    at: (z) => ({ x: start.x + vx * (start.z - z), y: start.y + vy * (start.z - z) }),
    top_m: start.z,
    bottom_m,
  };
}

/** A reach polygon: one crossing per ray, and the polygon when every ray met the ground. */
export interface ReachPolygon {
  /** ray headings, radians clockwise from north */
  bearings_rad: number[];
  crossings: Crossing[];
  /** vertices in heading order (clockwise), or null when a ray did not meet the ground */
  polygon: LocalXY[] | null;
}

/** Fewest rays a reach polygon is cast along. */
export const MIN_REACH_RAYS = 72;

/**
 * Reach polygon by ray casting: for each of `rays` headings (≥ 72, evenly spaced from north) the
 * descent `rayPath(heading)` is followed to the ground (groundCrossing).
 */
export function reachPolygon(
  ground: Ground,
  rayPath: (heading_rad: number) => DescentPath,
  opts: CrossingOptions & { rays?: number } = {},
): ReachPolygon {
  const n = Math.max(MIN_REACH_RAYS, Math.ceil(opts.rays ?? MIN_REACH_RAYS));
  const bearings_rad: number[] = [];
  const crossings: Crossing[] = [];
  for (let k = 0; k < n; k++) {
    const b = (2 * Math.PI * k) / n;
    bearings_rad.push(b);
    crossings.push(groundCrossing(ground, rayPath(b), opts));
  }
  const all = crossings.every((c) => c.kind === 'ground');
  return {
    bearings_rad,
    crossings,
    polygon: all ? crossings.map((c) => ({ x: c.x, y: c.y })) : null,
  };
}

/**
 * Glide rays for reachPolygon: from `start`, cot γ metres sideways per metre of altitude lost
 * along the heading, plus a drift (m) that depends on the altitude only (the wind's share).
 */
export function glideRays(
  start: PathPoint,
  cotGamma: number,
  bottom_m: number,
  drift: (z_m: number) => LocalXY = () => ({ x: 0, y: 0 }),
): (heading_rad: number) => DescentPath {
  return (h) => {
    const sx = Math.sin(h) * cotGamma;
    const sy = Math.cos(h) * cotGamma;
    return {
      at: (z) => {
        const d = drift(z);
        return { x: start.x + sx * (start.z - z) + d.x, y: start.y + sy * (start.z - z) + d.y };
      },
      top_m: start.z,
      bottom_m,
    };
  };
}

/** Whether a descent aimed at a site gets there, or ground higher than the site stops it first. */
export type SiteView =
  | { hidden: false; crossing: Crossing }
  | {
      hidden: true;
      obstacle: PathPoint;
      fromSite_m: number;
      aboveSite_m: number;
      crossing: Crossing;
    };

/**
 * Hidden ground: the path meets the ground more than `vertical_m` above the site's ground and
 * more than `horizontal_m` away from the site (default 1 m each). A crossing without ground
 * data, or below the site, is not called hidden: the caller reads `crossing`.
 */
export function hiddenGround(
  ground: Ground,
  path: DescentPath,
  site: LocalXY,
  opts: CrossingOptions & { vertical_m?: number; horizontal_m?: number } = {},
): SiteView {
  const crossing = groundCrossing(ground, path, opts);
  const siteGround = ground.height(site.x, site.y);
  if (crossing.kind !== 'ground' || siteGround === null) return { hidden: false, crossing };
  const fromSite_m = Math.hypot(crossing.x - site.x, crossing.y - site.y);
  const aboveSite_m = crossing.z - siteGround;
  if (aboveSite_m > (opts.vertical_m ?? 1) && fromSite_m > (opts.horizontal_m ?? 1)) {
    const obstacle = { x: crossing.x, y: crossing.y, z: crossing.z };
    return { hidden: true, obstacle, fromSite_m, aboveSite_m, crossing };
  }
  return { hidden: false, crossing };
}
