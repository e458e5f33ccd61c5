/**
 * ESRI ASCII grid elevation models (`.asc`): a header `ncols`, `nrows`, `xllcorner` or
 * `xllcenter`, `yllcorner` or `yllcenter`, `cellsize`, optional `NODATA_value`, then nrows × ncols
 * heights, rows north to south. The file carries no CRS: WGS 84 degrees unless the caller
 * states a UTM zone (EPSG:326zz / 327zz). Every value is counted; only those inside the window
 * are parsed, checked and kept.
 */
import { formatUTM, type LatLon } from '../model';
import { Dem, DemError, type GridGeometry, isGeographic, MAX_DEM_CELLS, windowFor } from './dem';
import type { DemRead, DemReadOptions } from './geotiff-dem';

/** Longest text read (characters): a 4000 × 4000 grid of 8-character heights is ~140 M. */
export const MAX_ASCII_GRID_CHARS = 400_000_000;

/**
 * True when an ASCII grid's lower-left corner cannot be degrees (|x| > 360 or |y| > 90): it is
 * in metres, and read in the plan's UTM zone. `head` is the start of the file (its header).
 */
export function asciiCornerInMetres(head: string): boolean {
  const x = Number(/^\s*xll(?:corner|center)\s+(\S+)/im.exec(head)?.[1]);
  const y = Number(/^\s*yll(?:corner|center)\s+(\S+)/im.exec(head)?.[1]);
  return Math.abs(x) > 360 || Math.abs(y) > 90;
}

/** EPSG code of the WGS 84 / UTM zone holding a point (an ASCII grid in metres is read in it). */
export function utmZoneEpsg(p: LatLon): number | undefined {
  try {
    // The model gives the zone only inside its UTM text ("32T 512345 5228765").
    const zone = Number(/^\d+/.exec(formatUTM(p))?.[0]);
    return Number.isInteger(zone) && zone >= 1 && zone <= 60
      ? (p.lat >= 0 ? 32600 : 32700) + zone
      : undefined;
  } catch {
    return undefined; // outside the UTM's latitudes
  }
}

const KEYS = [
  'ncols',
  'nrows',
  'xllcorner',
  'xllcenter',
  'yllcorner',
  'yllcenter',
  'cellsize',
  'nodata_value',
];

interface Header {
  ncols: number;
  nrows: number;
  x0: number;
  y0: number;
  cellsize: number;
  nodata: number | null;
  /** index of the first data character */
  dataStart: number;
  /** 1-based line of the first data value */
  dataLine: number;
}

function parseHeader(file: string, text: string): Header {
  const seen = new Map<string, { value: number; line: number }>();
  const families = new Set<string>();
  let pos = 0;
  let line = 1;
  for (;;) {
    const nl = text.indexOf('\n', pos);
    const end = nl < 0 ? text.length : nl;
    const raw = text.slice(pos, end).trim();
    const m = /^([A-Za-z_]+)\s+(\S+)$/.exec(raw);
    if (!m) {
      if (raw === '' && nl >= 0 && seen.size === 0) {
        pos = nl + 1;
        line++;
        continue;
      }
      break; // first data line (or garbage, reported below)
    }
    const key = m[1].toLowerCase();
    if (!KEYS.includes(key)) {
      throw new DemError(
        file,
        `line ${line}: unknown header key '${m[1]}'; expected one of ncols, nrows, xllcorner|xllcenter, yllcorner|yllcenter, cellsize, NODATA_value`,
      );
    }
    const value = Number(m[2]);
    if (!Number.isFinite(value))
      throw new DemError(file, `line ${line}: ${m[1]} '${m[2]}' is not a number`);
    const family = key.startsWith('xll') ? 'xll' : key.startsWith('yll') ? 'yll' : key;
    if (families.has(family))
      throw new DemError(file, `line ${line}: ${m[1]} repeats an earlier header line`);
    families.add(family);
    seen.set(key, { value, line });
    if (nl < 0) {
      pos = text.length;
      break;
    }
    pos = nl + 1;
    line++;
  }
  const need = (k: string, what: string) => {
    const v = seen.get(k);
    if (!v)
      throw new DemError(
        file,
        `line ${line}: header has no ${what} (found ${[...seen.keys()].join(', ') || 'no header'})`,
      );
    return v;
  };
  const count = (k: string) => {
    const v = need(k, k);
    if (!Number.isInteger(v.value) || v.value < 2) {
      throw new DemError(file, `line ${v.line}: ${k} ${v.value} must be a whole number ≥ 2`);
    }
    return v.value;
  };
  const ncols = count('ncols');
  const nrows = count('nrows');
  const cs = need('cellsize', 'cellsize');
  if (!(cs.value > 0))
    throw new DemError(file, `line ${cs.line}: cellsize ${cs.value} must be > 0`);
  const cellsize = cs.value;
  const xc = seen.get('xllcenter');
  const yc = seen.get('yllcenter');
  const x = xc ?? need('xllcorner', 'xllcorner or xllcenter');
  const y = yc ?? need('yllcorner', 'yllcorner or yllcenter');
  // A centre reference names the centre of the south-west cell: its corner is half a cell out.
  const xll = x.value - (xc ? cellsize / 2 : 0);
  const yll = y.value - (yc ? cellsize / 2 : 0);
  const nd = seen.get('nodata_value');
  return {
    ncols,
    nrows,
    x0: xll,
    y0: yll + nrows * cellsize,
    cellsize,
    nodata: nd ? nd.value : null,
    dataStart: pos,
    dataLine: line,
  };
}

/** Options of readAsciiGrid: the box, and the grid's CRS when it is not WGS 84 degrees. */
export interface AsciiGridOptions extends DemReadOptions {
  /** EPSG:4326 (default) or a WGS 84 / UTM code 326zz / 327zz */
  epsg?: number;
}

/** Reads the window of an ESRI ASCII grid that covers opts.box; DemError names the file, line and fault. */
export function readAsciiGrid(file: string, text: string, opts: AsciiGridOptions): DemRead {
  if (text.length > MAX_ASCII_GRID_CHARS) {
    throw new DemError(
      file,
      `${text.length} characters is more than the ${MAX_ASCII_GRID_CHARS} an ASCII grid may have; convert it to a GeoTIFF`,
    );
  }
  const epsg = opts.epsg ?? 4326;
  const h = parseHeader(file, text);
  const g: GridGeometry = {
    file,
    epsg,
    cols: h.ncols,
    rows: h.nrows,
    x0: h.x0,
    y0: h.y0,
    dx: h.cellsize,
    dy: h.cellsize,
  };
  if (isGeographic(epsg)) {
    const x1 = h.x0 + h.ncols * h.cellsize;
    const y1 = h.y0 - h.nrows * h.cellsize;
    if (h.x0 < -180 || x1 > 180 || y1 < -90 || h.y0 > 90) {
      throw new DemError(
        file,
        `its corners x ${h.x0}…${x1}, y ${y1}…${h.y0} are not WGS 84 degrees ` +
          `(longitude −180…180, latitude −90…90); a projected grid needs its UTM zone stated`,
      );
    }
  }
  const w = windowFor(g, opts.box, opts.maxCells ?? MAX_DEM_CELLS);
  const values = new Float32Array(w.cols * w.rows);
  const total = h.ncols * h.nrows;
  let n = 0;
  let line = h.dataLine;
  let i = h.dataStart;
  const len = text.length;
  while (i < len) {
    const c = text.charCodeAt(i);
    if (c === 10) {
      line++;
      i++;
      continue;
    }
    if (c === 32 || c === 9 || c === 13) {
      i++;
      continue;
    }
    let j = i;
    while (j < len) {
      const d = text.charCodeAt(j);
      if (d === 32 || d === 9 || d === 13 || d === 10) break;
      j++;
    }
    if (n >= total) {
      throw new DemError(
        file,
        `line ${line}: more values than ncols × nrows = ${h.ncols} × ${h.nrows} = ${total}`,
      );
    }
    const row = Math.floor(n / h.ncols);
    const col = n - row * h.ncols;
    if (row >= w.row0 && row < w.row0 + w.rows && col >= w.col0 && col < w.col0 + w.cols) {
      const v = Number(text.slice(i, j));
      if (!Number.isFinite(v)) {
        throw new DemError(
          file,
          `line ${line}: '${text.slice(i, Math.min(j, i + 20))}' is not a number (row ${row + 1}, column ${col + 1})`,
        );
      }
      values[(row - w.row0) * w.cols + (col - w.col0)] = v;
    }
    n++;
    i = j;
  }
  if (n < total) {
    throw new DemError(
      file,
      `line ${line}: the data end after ${n} values; ncols × nrows = ${h.ncols} × ${h.nrows} = ${total}`,
    );
  }
  const dem = new Dem({
    file,
    epsg,
    cols: w.cols,
    rows: w.rows,
    x0: h.x0 + w.col0 * h.cellsize,
    y0: h.y0 - w.row0 * h.cellsize,
    dx: h.cellsize,
    dy: h.cellsize,
    values,
    nodata: h.nodata,
  });
  return {
    dem,
    window: w,
    cellsRead: w.cols * w.rows,
    bytesRead: text.length,
    fileCols: h.ncols,
    fileRows: h.nrows,
  };
}
