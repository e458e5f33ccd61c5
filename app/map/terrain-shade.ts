/**
 * The terrain layer's computations on a DEM grid, pure (no Leaflet, no DOM) so unit tests run
 * them in Node: block-mean downsampling, hillshade and contour lines. Each is a generator that
 * yields between bands of rows, so the layer can spread a 4000 × 4000 window over many short
 * slices of the page's time; `run` drives one to its end in one go (tests, small grids).
 */
import type { DemGrid } from '../formats';

/** True when a CRS's x, y are longitude, latitude in degrees (the geographic codes Dem knows). */
const isGeographic = (epsg: number): boolean => epsg === 4326 || epsg === 4269;

/** A DEM grid with unknown heights as NaN (nodata folded in) and its geometry. */
export type ShadeGrid = Omit<DemGrid, 'nodata'> & { nodata: null };

/** A computation that yields between bands of rows and returns its result. */
export type Steps<T> = Generator<void, T, void>;

/** Rows handled between two yields of the generators below (a few ms of work at ~1000 cells a row). */
const ROWS_PER_STEP = 8;

/** Runs a generator to its end and returns its result. */
export function run<T>(steps: Steps<T>): T {
  for (;;) {
    const s = steps.next();
    if (s.done) return s.value;
  }
}

/** The whole-number factor that brings the longer side of a grid down to at most maxSide cells. */
export function downsampleFactor(cols: number, rows: number, maxSide = 1024): number {
  return Math.max(1, Math.ceil(Math.max(cols, rows) / maxSide));
}

/**
 * The grid averaged over blocks of k × k cells (k from downsampleFactor), nodata left out of each
 * mean, NaN where a block holds none. A part block at the east or south edge (fewer than k cells)
 * is dropped, so every output cell is a whole block and its centre the block's centre.
 */
export function* downsampleSteps(g: DemGrid, maxSide = 1024): Steps<ShadeGrid> {
  const k = downsampleFactor(g.cols, g.rows, maxSide);
  const cols = k === 1 ? g.cols : Math.max(1, Math.floor(g.cols / k));
  const rows = k === 1 ? g.rows : Math.max(1, Math.floor(g.rows / k));
  const kc = Math.min(k, g.cols);
  const kr = Math.min(k, g.rows);
  const out = new Float32Array(cols * rows);
  const nodata = g.nodata === null ? null : Math.fround(g.nodata);
  const sum = new Float64Array(cols);
  const count = new Uint32Array(cols);
  for (let r = 0; r < rows; r++) {
    sum.fill(0);
    count.fill(0);
    for (let rr = r * kr; rr < (r + 1) * kr; rr++) {
      const base = rr * g.cols;
      for (let c = 0; c < cols; c++) {
        for (let cc = c * kc; cc < (c + 1) * kc; cc++) {
          const v = g.values[base + cc];
          if (Number.isNaN(v) || v === nodata) continue;
          sum[c] += v;
          count[c]++;
        }
      }
    }
    for (let c = 0; c < cols; c++) out[r * cols + c] = count[c] > 0 ? sum[c] / count[c] : NaN;
    if (r % Math.max(1, Math.floor(ROWS_PER_STEP / kr)) === 0) yield;
  }
  return {
    file: g.file,
    epsg: g.epsg,
    cols,
    rows,
    x0: g.x0,
    y0: g.y0,
    dx: g.dx * kc,
    dy: g.dy * kr,
    values: out,
    nodata: null,
  };
}

/**
 * Metres per CRS unit east and north: 1 for a projected CRS, else degrees converted at the
 * grid's middle latitude (WGS 84 ellipsoid; one degree of latitude ≈ 110.6–111.7 km).
 */
export function metresPerUnit(g: Pick<DemGrid, 'epsg' | 'y0' | 'rows' | 'dy'>): {
  x: number;
  y: number;
} {
  if (!isGeographic(g.epsg)) return { x: 1, y: 1 };
  // Meridian and parallel arc lengths of one degree on the WGS 84 ellipsoid. // common practice
  const phi = ((g.y0 - (g.rows * g.dy) / 2) * Math.PI) / 180;
  const a = 6378137;
  const e2 = 0.00669437999014;
  const s = Math.sin(phi);
  const w = Math.sqrt(1 - e2 * s * s);
  const perRad = Math.PI / 180;
  return { x: ((a * Math.cos(phi)) / w) * perRad, y: ((a * (1 - e2)) / (w * w * w)) * perRad };
}

/** Light and surface settings of a hillshade. */
export interface ShadeOptions {
  /** direction the light comes from, degrees clockwise from north (default 315) */
  azimuth_deg?: number;
  /** height of the light above the horizon, degrees (default 45) */
  altitude_deg?: number;
  /** vertical exaggeration (default 1) */
  zFactor?: number;
  /** metres per CRS unit east and north (default: metresPerUnit of the grid) */
  scale?: { x: number; y: number };
}

/** The shade of flat ground: 1 + 254·sin(altitude), 181 at 45°. */
export function flatShade(altitude_deg = 45): number {
  return 1 + 254 * Math.sin((altitude_deg * Math.PI) / 180);
}

/**
 * Hillshade of a grid, one byte per cell: 0 where the height is unknown, else 1 … 255.
 *
 * The common hillshade (the definition `gdaldem hillshade` implements; the tests check against
 * it): slope and aspect from Horn's 3 × 3 kernel — dz/dx = ((c + 2f + i) − (a + 2d + g)) / 8Δx,
 * dz/dy = ((g + 2h + i) − (a + 2b + c)) / 8Δy over the window a b c / d e f / g h i (north row
 * first) — then
 * cos(zenith)·cos(slope) + sin(zenith)·sin(slope)·cos(azimuth_math − aspect), mapped as GDAL
 * maps it: 1 + 254·value, 1 where the value is ≤ 0. A neighbour off the grid is extrapolated
 * linearly from the cell and the one opposite it (2e − opposite); an unknown neighbour takes the
 * cell's own height (as `gdaldem -compute_edges` does inside the grid).
 */
export function* hillshadeSteps(g: ShadeGrid, opts: ShadeOptions = {}): Steps<Uint8ClampedArray> {
  const az = ((opts.azimuth_deg ?? 315) * Math.PI) / 180;
  const alt = ((opts.altitude_deg ?? 45) * Math.PI) / 180;
  const z = opts.zFactor ?? 1;
  const scale = opts.scale ?? metresPerUnit(g);
  const zenith = Math.PI / 2 - alt;
  const cosZ = Math.cos(zenith);
  const sinZ = Math.sin(zenith);
  // Mathematical angle (counter-clockwise from east) of the direction the light comes from.
  const azMath = Math.PI / 2 - az;
  const ex = 8 * g.dx * scale.x;
  const ey = 8 * g.dy * scale.y;
  const { cols, rows, values: v } = g;
  const out = new Uint8ClampedArray(cols * rows);
  const at = (c: number, r: number, e: number, oc: number, or: number): number => {
    if (c < 0 || c >= cols || r < 0 || r >= rows) {
      // Off the grid: extrapolate from the cell through the neighbour opposite.
      const o = oc >= 0 && oc < cols && or >= 0 && or < rows ? v[or * cols + oc] : NaN;
      return Number.isNaN(o) ? e : 2 * e - o;
    }
    const x = v[r * cols + c];
    return Number.isNaN(x) ? e : x;
  };
  for (let r = 0; r < rows; r++) {
    for (let c = 0; c < cols; c++) {
      const e = v[r * cols + c];
      if (Number.isNaN(e)) continue;
      const a = at(c - 1, r - 1, e, c + 1, r + 1);
      const b = at(c, r - 1, e, c, r + 1);
      const cc = at(c + 1, r - 1, e, c - 1, r + 1);
      const d = at(c - 1, r, e, c + 1, r);
      const f = at(c + 1, r, e, c - 1, r);
      const gg = at(c - 1, r + 1, e, c + 1, r - 1);
      const h = at(c, r + 1, e, c, r - 1);
      const i = at(c + 1, r + 1, e, c - 1, r - 1);
      // East positive, and north positive (rows run south, so north minus south).
      const dzdx = (cc + 2 * f + i - (a + 2 * d + gg)) / ex;
      const dzdy = (a + 2 * b + cc - (gg + 2 * h + i)) / ey;
      const slope = Math.atan(z * Math.hypot(dzdx, dzdy));
      // Direction of steepest descent, counter-clockwise from east.
      const aspect = Math.atan2(-dzdy, -dzdx);
      const lit = cosZ * Math.cos(slope) + sinZ * Math.sin(slope) * Math.cos(azMath - aspect);
      out[r * cols + c] = lit <= 0 ? 1 : 1 + 254 * lit;
    }
    if (r % ROWS_PER_STEP === 0) yield;
  }
  return out;
}

/** Hillshade of a grid in one go (see hillshadeSteps). */
export function hillshade(g: ShadeGrid, opts: ShadeOptions = {}): Uint8ClampedArray {
  return run(hillshadeSteps(g, opts));
}

/** Lowest and highest known height of a grid; NaN for both when it holds none. */
export function heightRange(g: ShadeGrid): { min: number; max: number } {
  let min = Infinity;
  let max = -Infinity;
  for (const x of g.values) {
    if (x < min) min = x;
    if (x > max) max = x;
  }
  return min <= max ? { min, max } : { min: NaN, max: NaN };
}

/**
 * The contour interval (in the display unit) from 1, 2 or 5 × 10^k that gives the most lines up
 * to maxLines over a height range (same unit); at least minLines when the 1-2-5 steps allow
 * (consecutive steps differ at most 2.5×, so a range that fits 25 lines of one fits ≥ 10 of the
 * next). NaN for an empty or flat range.
 */
export function contourInterval(min: number, max: number, minLines = 10, maxLines = 25): number {
  if (!(max > min) || !Number.isFinite(max - min)) return NaN;
  const count = (i: number) => Math.floor(max / i) - Math.ceil(min / i) + 1;
  let k = Math.floor(Math.log10((max - min) / maxLines)) - 1;
  for (let n = 0; n < 60; n++, k++) {
    for (const m of [1, 2, 5]) {
      const i = Number((m * 10 ** k).toPrecision(12));
      const lines = count(i);
      if (lines <= maxLines && (lines >= minLines || m === 1 || lines > 0)) return i;
    }
  }
  return NaN;
}

/** A contour level: its height and whether it is an index contour (every fifth). */
export interface ContourLevel {
  /** height, metres */
  height_m: number;
  /** the height in the display unit (for its label) */
  shown: number;
  index: boolean;
}

/**
 * The contour levels of a height range (metres) at a nice interval in the display unit
 * (`metresPerUnit` = 1 for metres, 0.3048 for feet): every multiple of the interval inside the
 * range; an index contour at every fifth multiple (a multiple of 5 × interval).
 */
export function contourLevels(
  min_m: number,
  max_m: number,
  metresPerUnit = 1,
): { interval: number; levels: ContourLevel[] } {
  const interval = contourInterval(min_m / metresPerUnit, max_m / metresPerUnit);
  if (!(interval > 0)) return { interval: NaN, levels: [] };
  const levels: ContourLevel[] = [];
  const k0 = Math.ceil(min_m / metresPerUnit / interval);
  const k1 = Math.floor(max_m / metresPerUnit / interval);
  for (let k = k0; k <= k1; k++) {
    const shown = Number((k * interval).toPrecision(12));
    levels.push({ height_m: shown * metresPerUnit, shown, index: k % 5 === 0 });
  }
  return { interval, levels };
}

/**
 * A contour line: vertices in grid coordinates (x = column, y = row of cell centres, fractional;
 * 0 is the first cell's centre), x0, y0, x1, y1, …; closed when the last vertex repeats the first.
 */
export interface ContourLine {
  level: ContourLevel;
  xy: Float64Array;
}

/**
 * Contour lines of a grid by marching squares over the cells' centres (linear interpolation
 * along each side; a saddle decided by the mean of its four corners), joined into polylines.
 * A square with an unknown corner is left out, so lines stop at nodata. Most `maxVertices`
 * vertices in all (the rest of the levels are left out: a bound on memory for hostile grids).
 */
export function* contourSteps(
  g: ShadeGrid,
  levels: readonly ContourLevel[],
  maxVertices = 2_000_000,
): Steps<ContourLine[]> {
  const { cols, rows, values: v } = g;
  const lines: ContourLine[] = [];
  if (cols < 2 || rows < 2) return lines;
  let vertices = 0;
  // Side ids: 2·(r·cols + c) for the side from (c, r) east to (c+1, r), +1 for (c, r) south to (c, r+1).
  const H = (c: number, r: number) => 2 * (r * cols + c);
  const V = (c: number, r: number) => 2 * (r * cols + c) + 1;
  for (const level of levels) {
    const L = level.height_m;
    const segA: number[] = [];
    const segB: number[] = [];
    const crossed: number[] = [];
    for (let r = 0; r < rows - 1; r++) {
      for (let c = 0; c < cols - 1; c++) {
        const tl = v[r * cols + c];
        const tr = v[r * cols + c + 1];
        const br = v[(r + 1) * cols + c + 1];
        const bl = v[(r + 1) * cols + c];
        if (Number.isNaN(tl + tr + br + bl)) continue;
        const a0 = tl >= L;
        const a1 = tr >= L;
        const a2 = br >= L;
        const a3 = bl >= L;
        if (a0 === a1 && a1 === a2 && a2 === a3) continue;
        // Sides in order top, right, bottom, left, where crossed.
        crossed.length = 0;
        if (a0 !== a1) crossed.push(H(c, r));
        if (a1 !== a2) crossed.push(V(c + 1, r));
        if (a2 !== a3) crossed.push(H(c, r + 1));
        if (a3 !== a0) crossed.push(V(c, r));
        if (crossed.length === 2) {
          segA.push(crossed[0]);
          segB.push(crossed[1]);
        } else {
          // A saddle: all four sides crossed; the centre's mean says which corners join.
          const centreAbove = (tl + tr + br + bl) / 4 >= L;
          const [top, right, bottom, left] = crossed;
          if (centreAbove === a0) {
            // The corners at tl's diagonal join through the centre: cut off tr and bl.
            segA.push(top, bottom);
            segB.push(right, left);
          } else {
            segA.push(top, right);
            segB.push(left, bottom);
          }
        }
      }
      if (r % ROWS_PER_STEP === 0) yield;
    }
    // Each side is crossed by at most two segments (one in each square beside it).
    const first = new Map<number, number>();
    const second = new Map<number, number>();
    const link = (side: number, s: number) => {
      if (first.has(side)) second.set(side, s);
      else first.set(side, s);
    };
    for (let s = 0; s < segA.length; s++) {
      link(segA[s], s);
      link(segB[s], s);
    }
    const used = new Uint8Array(segA.length);
    const other = (side: number, s: number): number => {
      const a = first.get(side);
      if (a !== undefined && a !== s && !used[a]) return a;
      const b = second.get(side);
      if (b !== undefined && b !== s && !used[b]) return b;
      return -1;
    };
    const point = (side: number, out: number[]) => {
      const cell = side >> 1;
      const c = cell % cols;
      const r = (cell - c) / cols;
      const z0 = v[cell];
      if ((side & 1) === 0) {
        const t = (L - z0) / (v[cell + 1] - z0);
        out.push(c + t, r);
      } else {
        const t = (L - z0) / (v[cell + cols] - z0);
        out.push(c, r + t);
      }
    };
    for (let s0 = 0; s0 < segA.length; s0++) {
      if (used[s0]) continue;
      used[s0] = 1;
      // Walk forward from segB, then backward from segA, collecting sides.
      const fwd: number[] = [segB[s0]];
      let end = segB[s0];
      for (let s = other(end, s0); s >= 0; s = other(end, s)) {
        used[s] = 1;
        end = segA[s] === end ? segB[s] : segA[s];
        fwd.push(end);
      }
      const back: number[] = [];
      let start = segA[s0];
      for (let s = other(start, s0); s >= 0; s = other(start, s)) {
        used[s] = 1;
        start = segA[s] === start ? segB[s] : segA[s];
        back.push(start);
      }
      // A ring walks back to its first side, so its last vertex repeats its first.
      const sides = [...back.reverse(), segA[s0], ...fwd];
      const xy: number[] = [];
      for (const side of sides) point(side, xy);
      vertices += xy.length / 2;
      if (vertices > maxVertices) return lines;
      lines.push({ level, xy: Float64Array.from(xy) });
    }
    yield;
  }
  return lines;
}

/** Contour lines of a grid in one go (see contourSteps). */
export function contours(g: ShadeGrid, levels: readonly ContourLevel[]): ContourLine[] {
  return run(contourSteps(g, levels));
}
