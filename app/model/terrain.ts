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
  /**
   * An upper bound of the ground's slope (|∇h|, metres per metre) inside the box; +Infinity when
   * the box touches unknown ground. Optional: without it every descent is walked.
   */
  maxSlopeIn?(box: LocalBox): number;
  /** Height and its gradient (m per m, into grad[0..1]); optional, speeds the shortcut up. */
  heightGrad?(x_m: number, y_m: number, grad: Float64Array): number | null;
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

/** The maxima and slope pyramids of a grid (see GridGround), with its lowest and highest height. */
interface Pyramids {
  cols: number;
  rows: number;
  nodata: number | null;
  min: number;
  max: number;
  levels: Float32Array[];
  slopes: Float32Array[];
  lvCols: number[];
  lvRows: number[];
}

// Built once per heights array (a DEM window is read once and never changed).
const PYRAMIDS = new WeakMap<Float32Array, Pyramids>();

function buildPyramids(
  values: Float32Array,
  cols: number,
  rows: number,
  nd: number | null,
): Pyramids {
  const out: Pyramids = {
    cols,
    rows,
    nodata: nd,
    min: Infinity,
    max: -Infinity,
    levels: [],
    slopes: [],
    lvCols: [],
    lvRows: [],
  };
  let lo = Infinity;
  let hi = -Infinity;
  for (let k = 0; k < values.length; k++) {
    const v = values[k];
    if (v !== v || v === nd) continue;
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  out.min = lo;
  out.max = hi;
  // Level 1: patches p (between centres p and p+1) grouped in pairs: values 2i … 2i+2.
  const pc = cols - 1;
  const pr = rows - 1;
  let w = Math.ceil(pc / 2);
  let h = Math.ceil(pr / 2);
  let lv = new Float32Array(w * h);
  let sl = new Float32Array(w * h);
  const at = (r: number, c: number): number => {
    const v = values[r * cols + c];
    return v !== v || v === nd ? NaN : v;
  };
  for (let j = 0; j < h; j++) {
    for (let i = 0; i < w; i++) {
      let m = -Infinity;
      let d = 0;
      const r1 = Math.min(2 * j + 2, rows - 1);
      const c1 = Math.min(2 * i + 2, cols - 1);
      for (let r = 2 * j; r <= r1; r++) {
        for (let c = 2 * i; c <= c1; c++) {
          const u = at(r, c);
          if (u !== u) {
            m = Infinity;
            d = Infinity;
            continue;
          }
          if (u > m) m = u;
          if (c < c1) d = Math.max(d, Math.abs(at(r, c + 1) - u));
          if (r < r1) d = Math.max(d, Math.abs(at(r + 1, c) - u));
        }
      }
      lv[j * w + i] = m;
      sl[j * w + i] = d !== d ? Infinity : d;
    }
  }
  out.levels.push(lv);
  out.slopes.push(sl);
  out.lvCols.push(w);
  out.lvRows.push(h);
  while (w > 1 || h > 1) {
    const w2 = Math.ceil(w / 2);
    const h2 = Math.ceil(h / 2);
    const up = new Float32Array(w2 * h2);
    const upS = new Float32Array(w2 * h2);
    for (let j = 0; j < h2; j++) {
      for (let i = 0; i < w2; i++) {
        let m = lv[2 * j * w + 2 * i];
        let d = sl[2 * j * w + 2 * i];
        if (2 * i + 1 < w) {
          m = Math.max(m, lv[2 * j * w + 2 * i + 1]);
          d = Math.max(d, sl[2 * j * w + 2 * i + 1]);
        }
        if (2 * j + 1 < h) {
          m = Math.max(m, lv[(2 * j + 1) * w + 2 * i]);
          d = Math.max(d, sl[(2 * j + 1) * w + 2 * i]);
          if (2 * i + 1 < w) {
            m = Math.max(m, lv[(2 * j + 1) * w + 2 * i + 1]);
            d = Math.max(d, sl[(2 * j + 1) * w + 2 * i + 1]);
          }
        }
        up[j * w2 + i] = m;
        upS[j * w2 + i] = d;
      }
    }
    out.levels.push(up);
    out.slopes.push(upS);
    out.lvCols.push(w2);
    out.lvRows.push(h2);
    lv = up;
    sl = upS;
    w = w2;
    h = h2;
  }
  return out;
}

/**
 * A grid of heights read in a local frame through a quadratic index map (GridGround.fit builds
 * it from any CRS transform): bilinear heights between cell centres, as Dem.sampleCrs, and a
 * pyramid of maxima for maxIn. Level 1 holds, per 2 × 2 patches of the bilinear surface (the
 * squares between four cell centres), the largest of their corner heights — a bilinear patch
 * never exceeds its corners — and each further level the largest of 2 × 2 entries below it.
 * NaN or `nodata` cells are unknown ground (+Infinity in the pyramid).
 */
export class GridGround implements TerrainGround {
  readonly maxHeight_m: number;
  readonly minHeight_m: number;
  /** pyramid levels 1, 2, …: maxima over 2^ℓ × 2^ℓ patches; sizes in lvCols/lvRows */
  private readonly levels: Float32Array[];
  /** the same pyramid of the largest height step between neighbouring cell centres */
  private readonly slopes: Float32Array[];
  private readonly lvCols: number[];
  // The last box's index range (set by spanOf): level, patch columns i0…i1, rows j0…j1.
  private qL = 0;
  private qI0 = 0;
  private qI1 = 0;
  private qJ0 = 0;
  private qJ1 = 0;
  /** |∇col| + |∇row| at the last box's centre, cells per metre */
  private qJac = 0;

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
    // The pyramids depend on the heights only: grounds over the same grid share them.
    let pyr = PYRAMIDS.get(values);
    if (!pyr || pyr.cols !== cols || pyr.rows !== rows || !Object.is(pyr.nodata, nd)) {
      pyr = buildPyramids(values, cols, rows, nd);
      PYRAMIDS.set(values, pyr);
    }
    this.minHeight_m = pyr.min;
    this.maxHeight_m = pyr.max;
    this.levels = pyr.levels;
    this.slopes = pyr.slopes;
    this.lvCols = pyr.lvCols;
  }

  private colOf(x: number, y: number): number {
    const a = this.map.col;
    return a[0] + a[1] * x + a[2] * y + a[3] * x * x + a[4] * x * y + a[5] * y * y;
  }

  private rowOf(x: number, y: number): number {
    const b = this.map.row;
    return b[0] + b[1] * x + b[2] * y + b[3] * x * x + b[4] * x * y + b[5] * y * y;
  }

  // The cell of the last `locate`: index of its north-west centre and the fractions east/south.
  private lk = 0;
  private lfx = 0;
  private lfy = 0;

  /** Finds the patch under a point (sets lk, lfx, lfy); false outside the cell centres. */
  private locate(x_m: number, y_m: number): boolean {
    const c = this.colOf(x_m, y_m);
    const r = this.rowOf(x_m, y_m);
    const cols = this.cols;
    if (!(c >= 0 && r >= 0 && c <= cols - 1 && r <= this.rows - 1)) return false;
    const i = Math.min(Math.floor(c), cols - 2);
    const j = Math.min(Math.floor(r), this.rows - 2);
    this.lk = j * cols + i;
    this.lfx = c - i;
    this.lfy = r - j;
    return true;
  }

  height(x_m: number, y_m: number): number | null {
    if (!this.locate(x_m, y_m)) return null;
    const fx = this.lfx;
    const fy = this.lfy;
    const v = this.values;
    const k = this.lk;
    const cols = this.cols;
    const v00 = v[k];
    const v10 = v[k + 1];
    const v01 = v[k + cols];
    const v11 = v[k + cols + 1];
    const nd = this.nodata;
    // A corner with zero weight may be unknown: a sample on a known cell's edge stands.
    let s = 0;
    if (fx < 1 && fy < 1) {
      if (v00 !== v00 || v00 === nd) return null;
      s += (1 - fx) * (1 - fy) * v00;
    }
    if (fx > 0 && fy < 1) {
      if (v10 !== v10 || v10 === nd) return null;
      s += fx * (1 - fy) * v10;
    }
    if (fx < 1 && fy > 0) {
      if (v01 !== v01 || v01 === nd) return null;
      s += (1 - fx) * fy * v01;
    }
    if (fx > 0 && fy > 0) {
      if (v11 !== v11 || v11 === nd) return null;
      s += fx * fy * v11;
    }
    return s;
  }

  /**
   * Height (as `height`) and its gradient ∂h/∂x, ∂h/∂y (m per m, written to grad[0..1]) of the
   * bilinear patch at a point; null where `height` is null.
   */
  heightGrad(x_m: number, y_m: number, grad: Float64Array): number | null {
    grad[0] = 0;
    grad[1] = 0;
    const h = this.height(x_m, y_m);
    if (h === null) return null;
    const fx = this.lfx;
    const fy = this.lfy;
    const v = this.values;
    const k = this.lk;
    const cols = this.cols;
    const v00 = v[k];
    const v10 = v[k + 1];
    const v01 = v[k + cols];
    const v11 = v[k + cols + 1];
    const nd = this.nodata;
    // An unknown corner (zero weight, or `height` would be null): a level gradient.
    if (v00 !== v00 || v10 !== v10 || v01 !== v01 || v11 !== v11) return h;
    if (v00 === nd || v10 === nd || v01 === nd || v11 === nd) return h;
    const a = this.map.col;
    const b = this.map.row;
    const hc = (1 - fy) * (v10 - v00) + fy * (v11 - v01);
    const hr = (1 - fx) * (v01 - v00) + fx * (v11 - v10);
    grad[0] = hc * (a[1] + 2 * a[3] * x_m + a[4] * y_m) + hr * (b[1] + 2 * b[3] * x_m + b[4] * y_m);
    grad[1] = hc * (a[2] + a[4] * x_m + 2 * a[5] * y_m) + hr * (b[2] + b[4] * x_m + 2 * b[5] * y_m);
    return h;
  }

  /**
   * Sets the pyramid level and patch range that cover a box (and the Jacobian norm at its
   * centre); false when the box is not inside the grid's cell centres.
   */
  private spanOf(box: LocalBox): boolean {
    // Index range of the box: the map at the box's centre ± its Jacobian times the half-sizes,
    // plus the quadratic terms' largest contribution over the box.
    const a = this.map.col;
    const b = this.map.row;
    const x = (box.xMin + box.xMax) / 2;
    const y = (box.yMin + box.yMax) / 2;
    const hx = (box.xMax - box.xMin) / 2;
    const hy = (box.yMax - box.yMin) / 2;
    const c0 = a[0] + a[1] * x + a[2] * y + a[3] * x * x + a[4] * x * y + a[5] * y * y;
    const r0 = b[0] + b[1] * x + b[2] * y + b[3] * x * x + b[4] * x * y + b[5] * y * y;
    const q = hx * hx + hx * hy + hy * hy;
    const cx = a[1] + 2 * a[3] * x + a[4] * y;
    const cy = a[2] + a[4] * x + 2 * a[5] * y;
    const rx = b[1] + 2 * b[3] * x + b[4] * y;
    const ry = b[2] + b[4] * x + 2 * b[5] * y;
    const qc = Math.max(Math.abs(a[3]), Math.abs(a[4]), Math.abs(a[5]));
    const qr = Math.max(Math.abs(b[3]), Math.abs(b[4]), Math.abs(b[5]));
    const dc = Math.abs(cx) * hx + Math.abs(cy) * hy + qc * q;
    const dr = Math.abs(rx) * hx + Math.abs(ry) * hy + qr * q;
    const cMin = c0 - dc;
    const cMax = c0 + dc;
    const rMin = r0 - dr;
    const rMax = r0 + dr;
    if (!(cMin >= 0 && rMin >= 0 && cMax <= this.cols - 1 && rMax <= this.rows - 1)) {
      return false;
    }
    // Patches touched (patch p spans centres p … p+1).
    const i0 = Math.min(Math.floor(cMin), this.cols - 2);
    const i1 = Math.min(Math.floor(cMax), this.cols - 2);
    const j0 = Math.min(Math.floor(rMin), this.rows - 2);
    const j1 = Math.min(Math.floor(rMax), this.rows - 2);
    // The finest level at which the box spans at most 3 × 3 entries.
    let l = 0;
    while (
      l < this.levels.length - 1 &&
      ((i1 >> (l + 1)) - (i0 >> (l + 1)) > 2 || (j1 >> (l + 1)) - (j0 >> (l + 1)) > 2)
    )
      l++;
    this.qL = l;
    this.qI0 = i0;
    this.qI1 = i1;
    this.qJ0 = j0;
    this.qJ1 = j1;
    // Curvature over the box adds at most 2·q_max·(hx + hy) to each gradient.
    this.qJac =
      Math.sqrt(cx * cx + cy * cy) + Math.sqrt(rx * rx + ry * ry) + 2 * (qc + qr) * (hx + hy);
    return true;
  }

  /** Largest entry of a pyramid over the last spanOf range. */
  private spanMax(pyr: Float32Array[]): number {
    const l = this.qL;
    const lv = pyr[l];
    const w = this.lvCols[l];
    const sh = l + 1;
    let m = -Infinity;
    for (let j = this.qJ0 >> sh; j <= this.qJ1 >> sh; j++) {
      for (let i = this.qI0 >> sh; i <= this.qI1 >> sh; i++) {
        const v = lv[j * w + i];
        if (v > m) m = v;
      }
    }
    return m;
  }

  maxIn(box: LocalBox): number {
    return this.spanOf(box) ? this.spanMax(this.levels) : Infinity;
  }

  /**
   * Slope bound: the largest step between neighbouring centres (m per cell) times
   * |∇col| + |∇row| (cells per metre). A bilinear patch's gradient is a mix of its edge
   * differences, so |∇h| ≤ max|Δ| · (|∇col| + |∇row|).
   */
  maxSlopeIn(box: LocalBox): number {
    return this.spanOf(box) ? this.spanMax(this.slopes) * this.qJac : Infinity;
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

function crossDone(out: Float64Array, x: number, y: number, z: number, kind: number): number {
  out[0] = x;
  out[1] = y;
  out[2] = z;
  out[3] = kind;
  return kind;
}

/** Where firstCrossing ended (written to out[3]). */
export const CROSS_GROUND = 0;
export const CROSS_NO_DATA = 1;
export const CROSS_NONE = 2;
export const CROSS_START_BELOW = 3;

/** A descent by altitude for firstCrossing: writes x (out[0]) and y (out[1]), local m, at altitude z (m MSL). */
export type PathAt = (z_m: number, out: Float64Array) => void;

const WALK_LIMIT = 100_000;
/** Sideways length of a checked step is at most this or two cells, whichever is longer, m. */
const FINE_SIDEWAYS_M = 15;
// The first step that held in the last walk (a speed hint only: any step is checked).
const walkHint = new Float64Array(1);
// One scratch box for every walk (the walk is synchronous and does not nest).
const WALK_BOX: LocalBox = { xMin: 0, yMin: 0, xMax: 0, yMax: 0 };

/**
 * The first point where a descent meets a TerrainGround, for the Monte Carlo loop: no
 * allocation per call. Writes x, y, z and the kind (CROSS_*) into out[0..3]. From `top_m` (or
 * the ground's highest height, if lower) it walks down in altitude steps that double while the
 * swept box of the step lies above every height inside it (`maxIn`), and halve near the ground
 * to at most `maxStepZ_m` of altitude and one cell sideways; then it closes the bracket by
 * Illinois regula falsi to `tol_m` (docs/model.md §18).
 */
export function firstCrossing(
  ground: TerrainGround,
  at: PathAt,
  top_m: number,
  bottom_m: number,
  out: Float64Array,
  maxStepZ_m = 5,
  tol_m = 0.001,
): number {
  const cell = ground.cell_m;
  // Above the highest ground nothing is met: start there (or at the top, checked for ground).
  let zHi = top_m;
  let gHi = NaN;
  if (ground.maxHeight_m < top_m) zHi = Math.max(bottom_m, ground.maxHeight_m);
  at(zHi, out);
  let xHi = out[0];
  let yHi = out[1];
  if (!Number.isFinite(xHi + yHi)) return crossDone(out, xHi, yHi, zHi, CROSS_NO_DATA);
  if (zHi === top_m) {
    const h = ground.height(xHi, yHi);
    if (h === null) return crossDone(out, xHi, yHi, zHi, CROSS_NO_DATA);
    gHi = zHi - h;
    if (gHi <= 0) return crossDone(out, xHi, yHi, zHi, CROSS_START_BELOW);
  }
  // Neighbouring calls fly similar descents: start with the step that first held last time.
  let dz = walkHint[0] > 0 ? walkHint[0] : Math.max(maxStepZ_m, 8 * cell);
  let first = true;
  const box = WALK_BOX;
  for (let k = 0; k < WALK_LIMIT; k++) {
    if (zHi <= bottom_m) return crossDone(out, xHi, yHi, zHi, CROSS_NONE);
    const step = Math.min(dz, zHi - bottom_m);
    const zLo = zHi - step;
    at(zLo, out);
    const xLo = out[0];
    const yLo = out[1];
    if (!Number.isFinite(xLo + yLo)) return crossDone(out, xLo, yLo, zLo, CROSS_NO_DATA);
    const mx = xLo - xHi;
    const my = yLo - yHi;
    const moved = Math.sqrt(mx * mx + my * my);
    // The path between the ends may bow out of their box: a quarter of the move plus a cell.
    const pad = moved / 4 + cell;
    box.xMin = Math.min(xHi, xLo) - pad;
    box.xMax = Math.max(xHi, xLo) + pad;
    box.yMin = Math.min(yHi, yLo) - pad;
    box.yMax = Math.max(yHi, yLo) + pad;
    if (zLo > ground.maxIn(box)) {
      // The whole step is above the ground there: take it, and try a longer one next.
      zHi = zLo;
      xHi = xLo;
      yHi = yLo;
      gHi = NaN;
      if (first) {
        walkHint[0] = step;
        first = false;
      }
      dz = step * 2;
      continue;
    }
    if (step > maxStepZ_m || moved > Math.max(2 * cell, FINE_SIDEWAYS_M)) {
      if (step > 1e-6) {
        dz = step / 2;
        continue;
      }
    }
    const hLo = ground.height(xLo, yLo);
    if (hLo === null) return crossDone(out, xLo, yLo, zLo, CROSS_NO_DATA);
    const gLo = zLo - hLo;
    if (Number.isNaN(gHi)) {
      const hh = ground.height(xHi, yHi);
      if (hh === null) return crossDone(out, xHi, yHi, zHi, CROSS_NO_DATA);
      gHi = zHi - hh;
      // Touching at the upper end (level ground at the highest height): that is the crossing.
      if (gHi <= 0) return crossDone(out, xHi, yHi, zHi, CROSS_GROUND);
    }
    if (first) {
      walkHint[0] = step;
      first = false;
    }
    if (gLo <= 0) return refineCrossing(ground, at, zHi, gHi, zLo, gLo, xLo, yLo, out, tol_m);
    zHi = zLo;
    xHi = xLo;
    yHi = yLo;
    gHi = gLo;
  }
  return crossDone(out, xHi, yHi, zHi, CROSS_NONE);
}

function refineCrossing(
  ground: TerrainGround,
  at: PathAt,
  zHi: number,
  gHi: number,
  zLo: number,
  gLo: number,
  xLo: number,
  yLo: number,
  out: Float64Array,
  tol: number,
): number {
  let side = 0;
  for (let k = 0; k < 200; k++) {
    if (gLo === 0 || zHi - zLo <= tol) break;
    const z0 = zLo + ((zHi - zLo) * -gLo) / (gHi - gLo);
    const z = z0 > zLo && z0 < zHi ? z0 : (zHi + zLo) / 2;
    at(z, out);
    const h = ground.height(out[0], out[1]);
    if (h === null) {
      out[2] = z;
      out[3] = CROSS_NO_DATA;
      return CROSS_NO_DATA;
    }
    const g = z - h;
    if (Math.abs(g) <= tol / 10) {
      out[2] = z;
      out[3] = CROSS_GROUND;
      return CROSS_GROUND;
    }
    if (g > 0) {
      zHi = z;
      gHi = g;
      if (side === 1) gLo /= 2;
      side = 1;
    } else {
      zLo = z;
      gLo = g;
      xLo = out[0];
      yLo = out[1];
      if (side === -1) gHi /= 2;
      side = -1;
    }
  }
  // The end below the ground is the conservative landing.
  out[0] = xLo;
  out[1] = yLo;
  out[2] = zLo;
  out[3] = CROSS_GROUND;
  return CROSS_GROUND;
}

const FAST_BOX: LocalBox = { xMin: 0, yMin: 0, xMax: 0, yMax: 0 };
const FAST_GRAD = new Float64Array(2);

/**
 * The first crossing of a descent found from a known point of it, for the Monte Carlo loop:
 * secant iterations on G(z) = z − h(p(z)) from (z0, p(z0)) to |G| ≤ tol, then a certificate
 * that no crossing lies above: the path stays within V·(z − z*) of p(z*) (V bounds its sideways
 * metres per metre of altitude), so over the box that reach spans up to the highest ground,
 * G′(z) = 1 − ∇h · p′(z) ≥ 1 − S·V with S the ground's slope bound there; S·V < 1 makes G grow
 * strictly above z*, so z* is the first crossing (docs/model.md §18). Writes x, y, z, kind into
 * out like firstCrossing and returns CROSS_GROUND, or −1 when it cannot certify (the caller then
 * walks with firstCrossing). `rise`, when given, is how far the path moves sideways (x, y) per
 * metre of altitude above z0 (else it is measured 1 m up); it only speeds the first step up.
 * `areaSlope`, when given, bounds the ground's slope over the whole area the descent can reach.
 */
export function fastCrossing(
  ground: TerrainGround,
  at: PathAt,
  z0: number,
  x0: number,
  y0: number,
  top_m: number,
  bottom_m: number,
  pathSlope: number,
  out: Float64Array,
  tol_m: number,
  rise: Float64Array | null = null,
  areaSlope = Infinity,
): number {
  if (!ground.maxSlopeIn) return -1;
  const grad = FAST_GRAD;
  grad[0] = 0;
  grad[1] = 0;
  const h0 = ground.heightGrad ? ground.heightGrad(x0, y0, grad) : ground.height(x0, y0);
  if (h0 === null) return -1;
  let za = z0;
  let ga = z0 - h0;
  let z = z0;
  let x = x0;
  let y = y0;
  if (Math.abs(ga) > tol_m) {
    // Newton's first step: G′(z0) = 1 − ∇h · p′(z0), p′ from the path 1 m above.
    let slope = 1;
    if (grad[0] !== 0 || grad[1] !== 0) {
      let dx: number;
      let dy: number;
      if (rise) {
        dx = rise[0];
        dy = rise[1];
      } else {
        at(z0 + 1, out);
        dx = out[0] - x0;
        dy = out[1] - y0;
      }
      const s = 1 - grad[0] * dx - grad[1] * dy;
      if (s > 0.2 && s < 5) slope = s;
    }
    let zb = Math.min(top_m, Math.max(bottom_m, z0 - ga / slope));
    at(zb, out);
    let hb = ground.height(out[0], out[1]);
    if (hb === null) return -1;
    let gb = zb - hb;
    for (let k = 0; k < 8 && Math.abs(gb) > tol_m; k++) {
      if (gb === ga) return -1;
      const zn = Math.min(top_m, Math.max(bottom_m, zb - (gb * (zb - za)) / (gb - ga)));
      za = zb;
      ga = gb;
      zb = zn;
      at(zb, out);
      hb = ground.height(out[0], out[1]);
      if (hb === null) return -1;
      gb = zb - hb;
    }
    if (!(Math.abs(gb) <= tol_m)) return -1;
    z = zb;
    x = out[0];
    y = out[1];
  }
  const zTop = Math.min(top_m, ground.maxHeight_m);
  // A slope bound over the whole area (areaSlope) that already certifies needs no square.
  if (z < zTop && !(areaSlope * pathSlope < 0.999)) {
    const r = pathSlope * (zTop - z) + ground.cell_m;
    // Neighbouring samples reach over nearly the same square: a bound over a square four times as
    // wide, kept from an earlier sample of the same ground, serves every square inside it.
    const c = FAST_CACHE;
    let slope: number;
    if (
      c.ground === ground &&
      x - r >= c.xMin &&
      x + r <= c.xMax &&
      y - r >= c.yMin &&
      y + r <= c.yMax &&
      c.slope * pathSlope < 0.999
    ) {
      slope = c.slope;
    } else {
      FAST_BOX.xMin = x - 4 * r;
      FAST_BOX.xMax = x + 4 * r;
      FAST_BOX.yMin = y - 4 * r;
      FAST_BOX.yMax = y + 4 * r;
      const wide = ground.maxSlopeIn(FAST_BOX);
      if (wide * pathSlope < 0.999) {
        [c.ground, c.slope] = [ground, wide];
        [c.xMin, c.xMax, c.yMin, c.yMax] = [
          FAST_BOX.xMin,
          FAST_BOX.xMax,
          FAST_BOX.yMin,
          FAST_BOX.yMax,
        ];
        slope = wide;
      } else {
        FAST_BOX.xMin = x - r;
        FAST_BOX.xMax = x + r;
        FAST_BOX.yMin = y - r;
        FAST_BOX.yMax = y + r;
        slope = ground.maxSlopeIn(FAST_BOX);
      }
    }
    if (!(slope * pathSlope < 0.999)) return -1;
  }
  return crossDone(out, x, y, z, CROSS_GROUND);
}

// The last wide square whose slope bound certified a crossing (see fastCrossing).
const FAST_CACHE: {
  ground: TerrainGround | null;
  slope: number;
  xMin: number;
  xMax: number;
  yMin: number;
  yMax: number;
} = { ground: null, slope: Infinity, xMin: 0, xMax: 0, yMin: 0, yMax: 0 };
