/**
 * Where a descent meets the ground (docs/model.md §18): the crossing of a path that only goes
 * down with a height field, a reach polygon cast along rays, and ground that hides a site.
 * Pure: the ground is any function of the local frame (a DEM, a plane, a cone).
 *
 * NaN behaviour: a path or ground that returns NaN ends the search as `no-data` at that point.
 */
import type { LatLon, LocalFrame, LocalXY } from './geodesy';

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

/** A box in a local frame, metres (x east, y north). */
export interface LocalBox {
  xMin: number;
  yMin: number;
  xMax: number;
  yMax: number;
}

/**
 * Ground of a gridded elevation model in a plan's local frame, fast enough for every Monte Carlo
 * sample: heights, the lowest and highest height, and an upper bound over any local box.
 */
export interface TerrainGround extends Ground {
  readonly maxHeight_m: number;
  readonly minHeight_m: number;
  /** Spacing of its heights, m: the finest step a crossing search needs. */
  readonly cell_m: number;
  /** An upper bound of every height inside the box; +Infinity when the box touches unknown ground. */
  maxIn(box: LocalBox): number;
}

/** An elevation model the planner can fly over (app/formats Dem implements it). */
export interface ElevationModel {
  /** its file name, for messages */
  readonly name: string;
  /** Height MSL (m) at a WGS 84 point, bilinear; null outside the model or over nodata. */
  sample(p: LatLon): number | null;
  /**
   * The ground over a box of a plan's local frame. Throws an Error whose message starts with the
   * model's name when the model does not cover the box.
   */
  localGround(frame: LocalFrame, box: LocalBox): TerrainGround;
}

/** Quadratic map of local metres to fractional grid indices: c = Σ a_k m_k, r = Σ b_k m_k. */
export interface GridMap {
  /** coefficients of 1, x, y, x², xy, y² for the column (of cell centres) */
  col: readonly number[];
  /** the same for the row (row 0 the northmost) */
  row: readonly number[];
}

/** Cells per side of the blocks whose maxima bound a box's heights. */
const BLOCK = 8;

/**
 * A grid of heights read in a local frame through a quadratic index map (GridGround.fit builds
 * it from any CRS transform): bilinear heights between cell centres, as Dem.sampleCrs, and block
 * maxima for maxIn. NaN or `nodata` cells are unknown ground.
 */
export class GridGround implements TerrainGround {
  readonly maxHeight_m: number;
  readonly minHeight_m: number;
  private readonly blockMax: Float32Array;
  private readonly bCols: number;
  private readonly bRows: number;

  constructor(
    private readonly values: Float32Array,
    private readonly cols: number,
    private readonly rows: number,
    private readonly nodata: number | null,
    private readonly map: GridMap,
    readonly cell_m: number,
  ) {
    if (values.length !== cols * rows || cols < 2 || rows < 2) {
      throw new RangeError(`a ground grid needs ≥ 2 × 2 cells and cols × rows heights`);
    }
    const nd = nodata === null ? null : Math.fround(nodata);
    this.nodata = nd;
    this.bCols = Math.ceil(cols / BLOCK);
    this.bRows = Math.ceil(rows / BLOCK);
    this.blockMax = new Float32Array(this.bCols * this.bRows).fill(-Infinity);
    let lo = Infinity;
    let hi = -Infinity;
    for (let r = 0; r < rows; r++) {
      for (let c = 0; c < cols; c++) {
        const v = values[r * cols + c];
        const known = !Number.isNaN(v) && v !== nd;
        const bi = Math.floor(r / BLOCK) * this.bCols + Math.floor(c / BLOCK);
        if (!known) {
          this.blockMax[bi] = Infinity;
          continue;
        }
        if (v < lo) lo = v;
        if (v > hi) hi = v;
        if (v > this.blockMax[bi]) this.blockMax[bi] = v;
      }
    }
    this.minHeight_m = lo;
    this.maxHeight_m = hi;
  }

  private colOf(x: number, y: number): number {
    const a = this.map.col;
    return a[0] + a[1] * x + a[2] * y + a[3] * x * x + a[4] * x * y + a[5] * y * y;
  }

  private rowOf(x: number, y: number): number {
    const b = this.map.row;
    return b[0] + b[1] * x + b[2] * y + b[3] * x * x + b[4] * x * y + b[5] * y * y;
  }

  height(x_m: number, y_m: number): number | null {
    const c = this.colOf(x_m, y_m);
    const r = this.rowOf(x_m, y_m);
    const cols = this.cols;
    if (!(c >= 0 && r >= 0 && c <= cols - 1 && r <= this.rows - 1)) return null;
    const i = Math.min(Math.floor(c), cols - 2);
    const j = Math.min(Math.floor(r), this.rows - 2);
    const fx = c - i;
    const fy = r - j;
    const v = this.values;
    const k = j * cols + i;
    const v00 = v[k];
    const v10 = v[k + 1];
    const v01 = v[k + cols];
    const v11 = v[k + cols + 1];
    const nd = this.nodata;
    // A corner with zero weight may be unknown: a sample on a known cell's edge stands.
    const bad = (val: number, w: number) => w !== 0 && (Number.isNaN(val) || val === nd);
    if (
      bad(v00, (1 - fx) * (1 - fy)) ||
      bad(v10, fx * (1 - fy)) ||
      bad(v01, (1 - fx) * fy) ||
      bad(v11, fx * fy)
    ) {
      return null;
    }
    let s = 0;
    if (fx < 1 && fy < 1) s += (1 - fx) * (1 - fy) * v00;
    if (fx > 0 && fy < 1) s += fx * (1 - fy) * v10;
    if (fx < 1 && fy > 0) s += (1 - fx) * fy * v01;
    if (fx > 0 && fy > 0) s += fx * fy * v11;
    return s;
  }

  maxIn(box: LocalBox): number {
    let cMin = Infinity;
    let cMax = -Infinity;
    let rMin = Infinity;
    let rMax = -Infinity;
    for (const x of [box.xMin, (box.xMin + box.xMax) / 2, box.xMax]) {
      for (const y of [box.yMin, (box.yMin + box.yMax) / 2, box.yMax]) {
        const c = this.colOf(x, y);
        const r = this.rowOf(x, y);
        if (c < cMin) cMin = c;
        if (c > cMax) cMax = c;
        if (r < rMin) rMin = r;
        if (r > rMax) rMax = r;
      }
    }
    // One cell of slack covers the map's curvature over the box and the bilinear neighbours.
    if (!(
      cMin - 1 >= 0 &&
      rMin - 1 >= 0 &&
      cMax + 1 <= this.cols - 1 &&
      rMax + 1 <= this.rows - 1
    )) {
      return Infinity;
    }
    const bc0 = Math.floor((cMin - 1) / BLOCK);
    const bc1 = Math.floor((cMax + 2) / BLOCK);
    const br0 = Math.floor((rMin - 1) / BLOCK);
    const br1 = Math.floor((rMax + 2) / BLOCK);
    if ((bc1 - bc0 + 1) * (br1 - br0 + 1) > 4096) return this.maxHeight_m;
    let m = -Infinity;
    for (let br = br0; br <= Math.min(br1, this.bRows - 1); br++) {
      for (let bc = bc0; bc <= Math.min(bc1, this.bCols - 1); bc++) {
        const v = this.blockMax[br * this.bCols + bc];
        if (v > m) m = v;
      }
    }
    return m;
  }

  /**
   * The quadratic index map of a transform local (x, y) → fractional (col, row), fitted by least
   * squares on a 5 × 5 lattice over `box` and checked on a 9 × 9 one. Returns null when the fit
   * misses by more than `tol` cells anywhere (the caller then resamples onto a local grid).
   */
  static fit(
    toIndex: (x: number, y: number) => { c: number; r: number },
    box: LocalBox,
    tol = 0.01,
  ): GridMap | null {
    const terms = (x: number, y: number) => [1, x, y, x * x, x * y, y * y];
    // Scale to the box so the normal equations stay well conditioned.
    const cx = (box.xMin + box.xMax) / 2;
    const cy = (box.yMin + box.yMax) / 2;
    const sx = Math.max(1, (box.xMax - box.xMin) / 2);
    const sy = Math.max(1, (box.yMax - box.yMin) / 2);
    const ata = Array.from({ length: 6 }, () => new Array<number>(6).fill(0));
    const atc = new Array<number>(6).fill(0);
    const atr = new Array<number>(6).fill(0);
    for (let i = 0; i <= 4; i++) {
      for (let j = 0; j <= 4; j++) {
        const u = -1 + i / 2;
        const v = -1 + j / 2;
        const q = toIndex(cx + u * sx, cy + v * sy);
        if (!Number.isFinite(q.c) || !Number.isFinite(q.r)) return null;
        const t = terms(u, v);
        for (let a = 0; a < 6; a++) {
          atc[a] += t[a] * q.c;
          atr[a] += t[a] * q.r;
          for (let b = 0; b < 6; b++) ata[a][b] += t[a] * t[b];
        }
      }
    }
    const pc = solve6(ata, atc);
    const pr = solve6(ata, atr);
    if (!pc || !pr) return null;
    // Back from the scaled (u, v) to (x, y): u = (x − cx)/sx, v = (y − cy)/sy.
    const unscale = (p: number[]): number[] => {
      const [k0, k1, k2, k3, k4, k5] = p;
      const a1 = k1 / sx;
      const a2 = k2 / sy;
      const a3 = k3 / (sx * sx);
      const a4 = k4 / (sx * sy);
      const a5 = k5 / (sy * sy);
      return [
        k0 - a1 * cx - a2 * cy + a3 * cx * cx + a4 * cx * cy + a5 * cy * cy,
        a1 - 2 * a3 * cx - a4 * cy,
        a2 - 2 * a5 * cy - a4 * cx,
        a3,
        a4,
        a5,
      ];
    };
    const map: GridMap = { col: unscale(pc), row: unscale(pr) };
    const ev = (p: readonly number[], x: number, y: number) =>
      p[0] + p[1] * x + p[2] * y + p[3] * x * x + p[4] * x * y + p[5] * y * y;
    for (let i = 0; i <= 8; i++) {
      for (let j = 0; j <= 8; j++) {
        const x = cx + (-1 + i / 4) * sx;
        const y = cy + (-1 + j / 4) * sy;
        const q = toIndex(x, y);
        if (Math.abs(ev(map.col, x, y) - q.c) > tol || Math.abs(ev(map.row, x, y) - q.r) > tol) {
          return null;
        }
      }
    }
    return map;
  }
}

/** Gaussian elimination with partial pivoting on a 6 × 6 system; null when singular. */
function solve6(m: number[][], rhs: number[]): number[] | null {
  const a = m.map((row, i) => [...row, rhs[i]]);
  const n = 6;
  for (let k = 0; k < n; k++) {
    let p = k;
    for (let i = k + 1; i < n; i++) if (Math.abs(a[i][k]) > Math.abs(a[p][k])) p = i;
    if (Math.abs(a[p][k]) < 1e-12) return null;
    [a[k], a[p]] = [a[p], a[k]];
    for (let i = k + 1; i < n; i++) {
      const f = a[i][k] / a[k][k];
      for (let j = k; j <= n; j++) a[i][j] -= f * a[k][j];
    }
  }
  const x = new Array<number>(n).fill(0);
  for (let i = n - 1; i >= 0; i--) {
    let s = a[i][n];
    for (let j = i + 1; j < n; j++) s -= a[i][j] * x[j];
    x[i] = s / a[i][i];
  }
  return x;
}

/**
 * A function ground as a GridGround on a regular local grid of `cell_m` spacing covering `box`
 * (tests and analytic terrain: planes, cones, ridges). Heights are sampled at the cell centres,
 * so the ground between them is bilinear, as a DEM's is.
 */
export function sampledGround(
  height: (x_m: number, y_m: number) => number | null,
  box: LocalBox,
  cell_m: number,
): GridGround {
  const cols = Math.max(2, Math.ceil((box.xMax - box.xMin) / cell_m) + 1);
  const rows = Math.max(2, Math.ceil((box.yMax - box.yMin) / cell_m) + 1);
  if (cols * rows > 16_000_000) throw new RangeError(`${cols} × ${rows} cells is too many`);
  const values = new Float32Array(cols * rows);
  for (let r = 0; r < rows; r++) {
    for (let c = 0; c < cols; c++) {
      const h = height(box.xMin + c * cell_m, box.yMax - r * cell_m);
      values[r * cols + c] = h === null ? NaN : h;
    }
  }
  // col = (x − xMin)/cell, row = (yMax − y)/cell.
  const map: GridMap = {
    col: [-box.xMin / cell_m, 1 / cell_m, 0, 0, 0, 0],
    row: [box.yMax / cell_m, 0, -1 / cell_m, 0, 0, 0],
  };
  return new GridGround(values, cols, rows, null, map, cell_m);
}
