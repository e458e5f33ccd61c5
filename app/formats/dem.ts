/**
 * A digital elevation model read from a file: a north-up grid of heights (metres MSL) in its
 * own CRS, its geotransform and nodata, sampled bilinearly at WGS 84 points (docs/model.md §18).
 * The readers (geotiff-dem.ts, ascii-grid.ts) share the CRS table, the window arithmetic and the
 * messages kept here, so a hostile file gets the same words whichever format it came in.
 */
import proj4 from 'proj4';
import {
  distance_m,
  type ElevationModel,
  type Ground,
  GridGround,
  type LatLon,
  type LocalBox,
  LocalFrame,
  sampledGround,
  type TerrainGround,
} from '../model';

/** A WGS 84 box, degrees (west < east; no antimeridian crossing). */
export interface LatLonBox {
  south: number;
  west: number;
  north: number;
  east: number;
}

/**
 * A north-up grid in its CRS. Cell (col, row) covers x0 + col·dx … x0 + (col+1)·dx east and
 * y0 − (row+1)·dy … y0 − row·dy north; its value stands for its centre. Row 0 is the northmost.
 */
export interface DemGrid {
  /** the file's name, for messages */
  file: string;
  /** EPSG code of the grid's CRS (see crsConverter) */
  epsg: number;
  cols: number;
  rows: number;
  /** CRS x (east) and y (north) of the grid's north-west corner */
  x0: number;
  y0: number;
  /** cell width (east) and height (south), CRS units, both > 0 */
  dx: number;
  dy: number;
  /** heights, row-major from the north-west cell; NaN or `nodata` where unknown */
  values: Float32Array;
  nodata: number | null;
}

/** A file the terrain cannot be read from: the message names the file and what is wrong. */
export class DemError extends Error {
  constructor(
    readonly file: string,
    what: string,
  ) {
    super(`${file}: ${what}`);
    this.name = 'DemError';
  }
}

/**
 * A file that does not hold the area asked for (does not cover it, or would need more cells than
 * the limit): a smaller area may still be read from it, unlike any other DemError.
 */
export class DemAreaError extends DemError {
  constructor(file: string, what: string) {
    super(file, what);
    this.name = 'DemAreaError';
  }
}

/** Largest window (cells) a reader keeps in memory: 4000 × 4000 Float32 = 64 MB. */
export const MAX_DEM_CELLS = 16_000_000;
/** Cells kept beyond the requested box on every side, so bilinear sampling at its edge has neighbours. */
export const DEM_MARGIN_CELLS = 2;

const UTM_NORTH = [32601, 32660] as const;
const UTM_SOUTH = [32701, 32760] as const;
export const SUPPORTED_CRS_TEXT =
  'EPSG:4326 (WGS 84 degrees), EPSG:32601–32660 and EPSG:32701–32760 (WGS 84 / UTM zones), ' +
  'EPSG:3857 and EPSG:4269';

const converters = new Map<number, proj4.Converter>();

/** proj4 converter WGS 84 degrees → the grid's CRS; a DemError for a code it does not know. */
export function crsConverter(epsg: number, file: string): proj4.Converter {
  const known = converters.get(epsg);
  if (known) return known;
  let def: string | undefined;
  if (Number.isInteger(epsg) && epsg >= UTM_NORTH[0] && epsg <= UTM_NORTH[1]) {
    def = `+proj=utm +zone=${epsg - 32600} +datum=WGS84 +units=m +no_defs`;
  } else if (Number.isInteger(epsg) && epsg >= UTM_SOUTH[0] && epsg <= UTM_SOUTH[1]) {
    def = `+proj=utm +zone=${epsg - 32700} +south +datum=WGS84 +units=m +no_defs`;
  } else if (epsg === 4326 || epsg === 3857 || epsg === 4269) {
    def = `EPSG:${epsg}`;
  }
  if (!def) {
    throw new DemError(
      file,
      `its CRS EPSG:${epsg} is not supported; supported: ${SUPPORTED_CRS_TEXT}`,
    );
  }
  const c = proj4('WGS84', def);
  converters.set(epsg, c);
  return c;
}

/** True when the CRS's x, y are longitude, latitude in degrees. */
export function isGeographic(epsg: number): boolean {
  return epsg === 4326 || epsg === 4269;
}

const f = (v: number, d: number) => v.toFixed(d);
/** "lat 46.1000…46.2000, lon 7.0000…7.1000" */
export function boxText(b: LatLonBox): string {
  return `lat ${f(b.south, 4)}…${f(b.north, 4)}, lon ${f(b.west, 4)}…${f(b.east, 4)}`;
}

/** Metres, or km past 10 km, for messages. */
export function distanceText(m: number): string {
  return m >= 10_000 ? `${f(m / 1000, 1)} km` : `${f(m, 0)} m`;
}

/** Checks a box is a finite WGS 84 box; throws a plain Error (a caller's fault, not the file's). */
export function checkBox(b: LatLonBox): void {
  const ok =
    [b.south, b.west, b.north, b.east].every(Number.isFinite) &&
    b.south <= b.north &&
    b.west <= b.east &&
    b.south >= -90 &&
    b.north <= 90 &&
    b.west >= -180 &&
    b.east <= 180;
  if (!ok) throw new Error(`not a WGS 84 box: ${JSON.stringify(b)}`);
}

/** Outline of a WGS 84 box, 9 points per side, so a projected box bounds its curved edges. */
function boxOutline(b: LatLonBox): LatLon[] {
  const pts: LatLon[] = [];
  for (let i = 0; i <= 8; i++) {
    const t = i / 8;
    const lat = b.south + t * (b.north - b.south);
    const lon = b.west + t * (b.east - b.west);
    pts.push(
      { lat: b.south, lon },
      { lat: b.north, lon },
      { lat, lon: b.west },
      { lat, lon: b.east },
    );
  }
  return pts;
}

/** The file's full grid geometry before any cell is read. */
export interface GridGeometry {
  file: string;
  epsg: number;
  cols: number;
  rows: number;
  x0: number;
  y0: number;
  dx: number;
  dy: number;
}

/** The cells to read: columns col0 … col0+cols−1, rows row0 … row0+rows−1 of the file. */
export interface GridWindow {
  col0: number;
  row0: number;
  cols: number;
  rows: number;
}

/**
 * The window of a file's grid that covers a WGS 84 box plus DEM_MARGIN_CELLS, clipped to the
 * grid. Throws a DemError when the grid does not cover the box (saying how far away it lies or
 * on which sides it falls short) or when the window would pass maxCells.
 */
export function windowFor(g: GridGeometry, box: LatLonBox, maxCells = MAX_DEM_CELLS): GridWindow {
  checkBox(box);
  const conv = crsConverter(g.epsg, g.file);
  let xMin = Infinity;
  let xMax = -Infinity;
  let yMin = Infinity;
  let yMax = -Infinity;
  for (const p of boxOutline(box)) {
    const q = conv.forward({ x: p.lon, y: p.lat });
    if (!Number.isFinite(q.x) || !Number.isFinite(q.y)) {
      throw new DemError(
        g.file,
        `the plan area (${boxText(box)}) cannot be expressed in its CRS EPSG:${g.epsg}`,
      );
    }
    xMin = Math.min(xMin, q.x);
    xMax = Math.max(xMax, q.x);
    yMin = Math.min(yMin, q.y);
    yMax = Math.max(yMax, q.y);
  }
  const gx1 = g.x0 + g.cols * g.dx;
  const gy1 = g.y0 - g.rows * g.dy;
  // Cell centres span half a cell less on every side; sampling needs the box inside them.
  const cx0 = g.x0 + g.dx / 2;
  const cx1 = gx1 - g.dx / 2;
  const cy0 = gy1 + g.dy / 2;
  const cy1 = g.y0 - g.dy / 2;
  if (xMin < cx0 || xMax > cx1 || yMin < cy0 || yMax > cy1) {
    throw new DemAreaError(
      g.file,
      notCoveredText(conv, box, { xMin, xMax, yMin, yMax }, { cx0, cx1, cy0, cy1 }),
    );
  }
  const col0 = Math.max(0, Math.floor((xMin - g.x0) / g.dx - 0.5) - DEM_MARGIN_CELLS);
  const col1 = Math.min(g.cols - 1, Math.floor((xMax - g.x0) / g.dx - 0.5) + 1 + DEM_MARGIN_CELLS);
  const row0 = Math.max(0, Math.floor((g.y0 - yMax) / g.dy - 0.5) - DEM_MARGIN_CELLS);
  const row1 = Math.min(g.rows - 1, Math.floor((g.y0 - yMin) / g.dy - 0.5) + 1 + DEM_MARGIN_CELLS);
  const w: GridWindow = { col0, row0, cols: col1 - col0 + 1, rows: row1 - row0 + 1 };
  if (w.cols * w.rows > maxCells) {
    throw new DemAreaError(
      g.file,
      `the plan area needs ${w.cols} × ${w.rows} = ${w.cols * w.rows} cells, more than the ` +
        `limit of ${maxCells}; use a coarser model or a smaller plan area`,
    );
  }
  return w;
}

function notCoveredText(
  conv: proj4.Converter,
  box: LatLonBox,
  b: { xMin: number; xMax: number; yMin: number; yMax: number },
  c: { cx0: number; cx1: number; cy0: number; cy1: number },
): string {
  const toLL = (x: number, y: number): LatLon => {
    const p = conv.inverse({ x, y });
    return { lat: p.y, lon: p.x };
  };
  const sw = toLL(c.cx0, c.cy0);
  const ne = toLL(c.cx1, c.cy1);
  const covers = `it covers ${boxText({ south: sw.lat, west: sw.lon, north: ne.lat, east: ne.lon })}`;
  const area = `the plan area is ${boxText(box)}`;
  const disjoint = b.xMax < c.cx0 || b.xMin > c.cx1 || b.yMax < c.cy0 || b.yMin > c.cy1;
  if (disjoint) {
    // Nearest points of the two rectangles, measured on the ellipsoid.
    const clamp = (v: number, lo: number, hi: number) => Math.min(hi, Math.max(lo, v));
    const px = clamp((c.cx0 + c.cx1) / 2, b.xMin, b.xMax);
    const py = clamp((c.cy0 + c.cy1) / 2, b.yMin, b.yMax);
    const gap = distance_m(toLL(px, py), toLL(clamp(px, c.cx0, c.cx1), clamp(py, c.cy0, c.cy1)));
    return `the elevation model does not cover the plan area: it lies ${distanceText(gap)} away (${covers}; ${area})`;
  }
  // How far each side of the box passes the model's edge, measured across the box's middle.
  const xm = (Math.max(b.xMin, c.cx0) + Math.min(b.xMax, c.cx1)) / 2;
  const ym = (Math.max(b.yMin, c.cy0) + Math.min(b.yMax, c.cy1)) / 2;
  const short: string[] = [];
  const side = (name: string, edge: [number, number], out: [number, number]) =>
    short.push(`${distanceText(distance_m(toLL(...edge), toLL(...out)))} to the ${name}`);
  if (b.yMax > c.cy1) side('north', [xm, c.cy1], [xm, b.yMax]);
  if (b.yMin < c.cy0) side('south', [xm, c.cy0], [xm, b.yMin]);
  if (b.xMax > c.cx1) side('east', [c.cx1, ym], [b.xMax, ym]);
  if (b.xMin < c.cx0) side('west', [c.cx0, ym], [b.xMin, ym]);
  return `the elevation model covers only part of the plan area: it falls short by ${short.join(', ')} (${covers}; ${area})`;
}

/** Most cells of a local grid when a plan area is too curved for one quadratic index map. */
const MAX_LOCAL_CELLS = 4_000_000;

/** A DEM in memory: a grid (often a window of a file) and its sampler. */
export class Dem implements ElevationModel {
  readonly grid: DemGrid;
  private readonly conv: proj4.Converter;

  /** @param grid a north-up grid; its CRS must be one crsConverter knows */
  constructor(grid: DemGrid) {
    if (grid.values.length !== grid.cols * grid.rows) {
      throw new DemError(
        grid.file,
        `${grid.values.length} heights for ${grid.cols} × ${grid.rows} cells`,
      );
    }
    // Heights are held as Float32, so a nodata value is compared at that precision.
    this.grid = { ...grid, nodata: grid.nodata === null ? null : Math.fround(grid.nodata) };
    this.conv = crsConverter(grid.epsg, grid.file);
  }

  private value(col: number, row: number): number | null {
    const g = this.grid;
    const v = g.values[row * g.cols + col];
    return Number.isNaN(v) || v === g.nodata ? null : v;
  }

  /** Height (m) at CRS coordinates, bilinear between the four nearest cell centres; null outside the centres or over nodata. */
  sampleCrs(x: number, y: number): number | null {
    const g = this.grid;
    const c = (x - g.x0) / g.dx - 0.5;
    const r = (g.y0 - y) / g.dy - 0.5;
    if (!(c >= 0 && r >= 0 && c <= g.cols - 1 && r <= g.rows - 1)) return null;
    const i = Math.min(Math.floor(c), g.cols - 2 < 0 ? 0 : g.cols - 2);
    const j = Math.min(Math.floor(r), g.rows - 2 < 0 ? 0 : g.rows - 2);
    const fx = c - i;
    const fy = r - j;
    // A corner with zero weight may be nodata: the sample on a valid cell's edge stands.
    let sum = 0;
    for (const [di, dj, w] of [
      [0, 0, (1 - fx) * (1 - fy)],
      [1, 0, fx * (1 - fy)],
      [0, 1, (1 - fx) * fy],
      [1, 1, fx * fy],
    ] as const) {
      if (w === 0) continue;
      const v = this.value(i + di, j + dj);
      if (v === null) return null;
      sum += w * v;
    }
    return sum;
  }

  /** Height (m) at a WGS 84 point (degrees), bilinear; null outside the grid or over nodata. */
  sample(p: LatLon): number | null {
    const q = this.conv.forward({ x: p.lon, y: p.lat });
    return this.sampleCrs(q.x, q.y);
  }

  /** The value of the cell containing a WGS 84 point (no interpolation); null outside or nodata. */
  cellAt(p: LatLon): number | null {
    const g = this.grid;
    const q = this.conv.forward({ x: p.lon, y: p.lat });
    const col = Math.floor((q.x - g.x0) / g.dx);
    const row = Math.floor((g.y0 - q.y) / g.dy);
    if (!(col >= 0 && row >= 0 && col < g.cols && row < g.rows)) return null;
    return this.value(col, row);
  }

  /** The WGS 84 box the cell centres span (where sample can answer). */
  bounds(): LatLonBox {
    const g = this.grid;
    const xs = [g.x0 + g.dx / 2, g.x0 + (g.cols - 0.5) * g.dx];
    const ys = [g.y0 - (g.rows - 0.5) * g.dy, g.y0 - g.dy / 2];
    const pts = xs.flatMap((x) => ys.map((y) => this.conv.inverse({ x, y })));
    return {
      south: Math.min(...pts.map((p) => p.y)),
      north: Math.max(...pts.map((p) => p.y)),
      west: Math.min(...pts.map((p) => p.x)),
      east: Math.max(...pts.map((p) => p.x)),
    };
  }

  /** The file's name (for messages). */
  get name(): string {
    return this.grid.file;
  }

  /** Cell spacing in metres (the smaller side; degrees converted at the grid's middle). */
  cellSize_m(): number {
    const g = this.grid;
    if (!isGeographic(g.epsg)) return Math.min(g.dx, g.dy);
    const lat = ((g.y0 - (g.rows * g.dy) / 2) * Math.PI) / 180;
    return Math.min(g.dx * 111_320 * Math.cos(lat), g.dy * 110_574);
  }

  /**
   * The ground over a box of a plan's local frame, for the planner (ElevationModel): the grid
   * itself read through a quadratic map of local metres to cells when that map is good to 1/100
   * of a cell over the box, else the heights resampled onto a local grid at the model's spacing.
   * A DemError when the model does not cover the box.
   */
  localGround(frame: LocalFrame, box: LocalBox): TerrainGround {
    const g = this.grid;
    const outline: LatLon[] = [];
    for (let i = 0; i <= 8; i++) {
      const u = box.xMin + ((box.xMax - box.xMin) * i) / 8;
      const v = box.yMin + ((box.yMax - box.yMin) * i) / 8;
      outline.push(
        frame.toLatLon(u, box.yMin),
        frame.toLatLon(u, box.yMax),
        frame.toLatLon(box.xMin, v),
        frame.toLatLon(box.xMax, v),
      );
    }
    const llBox: LatLonBox = {
      south: Math.min(...outline.map((p) => p.lat)),
      north: Math.max(...outline.map((p) => p.lat)),
      west: Math.min(...outline.map((p) => p.lon)),
      east: Math.max(...outline.map((p) => p.lon)),
    };
    // Throws the reader's own "does not cover" message (with distances) when it falls short.
    windowFor(g, llBox, Number.MAX_SAFE_INTEGER);
    const toIndex = (x: number, y: number) => {
      const p = frame.toLatLon(x, y);
      const q = this.conv.forward({ x: p.lon, y: p.lat });
      return { c: (q.x - g.x0) / g.dx - 0.5, r: (g.y0 - q.y) / g.dy - 0.5 };
    };
    const cell = this.cellSize_m();
    const map = GridGround.fit(toIndex, box);
    if (map) return new GridGround(g.values, g.cols, g.rows, g.nodata, map, cell);
    const n = ((box.xMax - box.xMin) / cell + 1) * ((box.yMax - box.yMin) / cell + 1);
    if (!(n <= MAX_LOCAL_CELLS)) {
      throw new DemError(
        g.file,
        `the plan area needs about ${Math.round(n)} cells at ${cell.toFixed(1)} m, more than ` +
          `the limit of ${MAX_LOCAL_CELLS}; use a coarser model or a smaller plan area`,
      );
    }
    return sampledGround((x, y) => this.sample(frame.toLatLon(x, y)), box, cell);
  }

  /** The ground in a plan's local frame (x east, y north, metres): heights MSL, null where unknown. */
  ground(frame: LocalFrame): Ground {
    let max = -Infinity;
    for (const v of this.grid.values) if (v > max && v !== this.grid.nodata) max = v;
    return {
      height: (x_m: number, y_m: number) => this.sample(frame.toLatLon(x_m, y_m)),
      maxHeight_m: max,
    };
  }
}
