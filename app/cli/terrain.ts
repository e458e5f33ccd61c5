// `--terrain FILE` and the plan's `terrain.file`: read the window of the elevation model the plan
// can reach (terrainArea) from a GeoTIFF by byte ranges, or from an ESRI ASCII grid.
import { closeSync, constants, fstatSync, openSync, read, readSync } from 'node:fs';
import { dirname, join } from 'node:path';
import {
  asciiCornerInMetres,
  type ByteSource,
  type Dem,
  DemError,
  type DemRead,
  MAX_ASCII_GRID_CHARS,
  readAsciiGrid,
  readGeoTiffDem,
  utmZoneEpsg,
} from '../formats';
import type { Plan } from '../plan';
import { type AreaBox, sweepHeightsAGL, terrainArea } from '../planner';
import { errCode, fail, oneLine, type Args } from './args';

/** What the CLI read: the model, the file it came from and how much of it. */
export interface TerrainRead {
  dem: Dem;
  /** the path opened, as shown in messages */
  file: string;
  /** one line on the read: window and file size in cells, bytes fetched */
  note: string;
  /** the window read and the whole file, cells; bytes fetched (GeoTIFF) or characters scanned */
  window: { cols: number; rows: number };
  fileCols: number;
  fileRows: number;
  bytesRead: number;
}

const TIFF = /\.tiff?$/i;
const ASC = /\.asc$/i;

/** The file to read: --terrain as given, else the plan's terrain.file against the plan's folder. */
export function terrainPath(args: Args, plan: Plan): string | undefined {
  if (args.terrain !== undefined) return args.terrain;
  if (plan.terrain) return join(dirname(args.file!), plan.terrain.file);
  return undefined;
}

/** bytes [offset, offset + length) of an open file, fewer only where the file ends */
function readAt(fd: number, offset: number, length: number): Promise<ArrayBuffer> {
  const buf = Buffer.alloc(length);
  return new Promise((done, reject) => {
    const step = (got: number): void => {
      if (got >= length) return done(buf.buffer.slice(buf.byteOffset, buf.byteOffset + got));
      read(fd, buf, got, length - got, offset + got, (e, n) => {
        if (e) reject(e);
        else if (n === 0) done(buf.buffer.slice(buf.byteOffset, buf.byteOffset + got));
        else step(got + n);
      });
    };
    step(0);
  });
}

/** A ByteSource over an open file: each read fetches only its own byte range. */
function fdSource(fd: number, size: number): ByteSource {
  return { size, read: (offset, length) => readAt(fd, offset, length) };
}

const stats = (r: DemRead): Omit<TerrainRead, 'file' | 'note'> => ({
  dem: r.dem,
  window: { cols: r.window.cols, rows: r.window.rows },
  fileCols: r.fileCols,
  fileRows: r.fileRows,
  bytesRead: r.bytesRead,
});

/**
 * An ASCII grid carries no CRS: a lower-left corner that cannot be degrees is read in the plan's
 * UTM zone, anything else as WGS 84 degrees.
 */
function ascEpsg(shown: string, head: string, plan: Plan): number | undefined {
  if (!asciiCornerInMetres(head)) return undefined;
  const epsg = utmZoneEpsg(plan.release);
  if (epsg === undefined) {
    fail(
      `${shown}: its corner is in metres, and the release point has no UTM zone to read it in`,
      1,
    );
  }
  return epsg;
}

/**
 * The box to read: terrainArea(plan); for a brief with --sweep also the area of the sweep's
 * highest release (sweepHeightsAGL), which reaches farther.
 */
function readArea(args: Args, plan: Plan): AreaBox {
  const box = terrainArea(plan);
  if (args.command !== 'brief' || !args.sweep) return box;
  const ground = plan.groundElevation_m;
  const top = plan.release.altitude_m + (plan.release.reference === 'AGL' ? ground : 0);
  const highest = Math.max(...sweepHeightsAGL(plan, top));
  if (!Number.isFinite(highest)) return box;
  const far = terrainArea({
    ...plan,
    release: { ...plan.release, altitude_m: highest, reference: 'AGL' },
  });
  return {
    south: Math.min(box.south, far.south),
    west: Math.min(box.west, far.west),
    north: Math.max(box.north, far.north),
    east: Math.max(box.east, far.east),
  };
}

/**
 * Reads the elevation model for this plan, or undefined when neither --terrain nor the plan names
 * one. A file that cannot be used ends the command (exit 1) with a message naming it.
 */
export async function loadTerrain(args: Args, plan: Plan): Promise<TerrainRead | undefined> {
  const path = terrainPath(args, plan);
  if (path === undefined) return undefined;
  const shown = oneLine(path);
  const from = args.terrain !== undefined ? '--terrain' : 'terrain.file';
  const isTiff = TIFF.test(path);
  if (!isTiff && !ASC.test(path)) {
    fail(`${from} ${shown}: an elevation model must be a .tif, .tiff or .asc file`, 1);
  }
  let fd: number;
  try {
    fd = openSync(path, constants.O_RDONLY | constants.O_NONBLOCK);
  } catch (e) {
    fail(`cannot read elevation model ${shown} (${from}): ${errCode(e)}`, 1);
  }
  try {
    const st = fstatSync(fd);
    if (!st.isFile()) fail(`${shown} (${from}) is not a regular file`, 1);
    const box = readArea(args, plan);
    if (isTiff) {
      const r = await readGeoTiffDem(shown, fdSource(fd, st.size), { box });
      const note =
        `${r.window.cols} × ${r.window.rows} cells read of ${r.fileCols} × ${r.fileRows}, ` +
        `${(r.bytesRead / 1e6).toFixed(1)} MB of ${(st.size / 1e6).toFixed(1)} MB`;
      return { ...stats(r), file: shown, note };
    }
    if (st.size > MAX_ASCII_GRID_CHARS) {
      fail(
        `${shown}: ${st.size} bytes is more than the ${MAX_ASCII_GRID_CHARS} an ASCII grid may have; convert it to a GeoTIFF`,
        1,
      );
    }
    const bytes = Buffer.alloc(st.size);
    let got = 0;
    while (got < st.size) {
      const n = readSync(fd, bytes, got, st.size - got, got);
      if (n === 0) break;
      got += n;
    }
    // latin1: one character per byte; the reader refuses anything that is not a number.
    const text = bytes.subarray(0, got).toString('latin1');
    const epsg = ascEpsg(shown, text.slice(0, 4096), plan);
    const r = readAsciiGrid(shown, text, { box, epsg });
    const note =
      `${r.window.cols} × ${r.window.rows} cells read of ${r.fileCols} × ${r.fileRows}` +
      (epsg ? `, in UTM (EPSG:${epsg}, the plan's zone)` : ', in WGS 84 degrees');
    return { ...stats(r), file: shown, note };
  } catch (e) {
    if (e instanceof DemError) fail(oneLine(e.message), 1);
    if ((e as NodeJS.ErrnoException)?.code) fail(`cannot read ${shown}: ${errCode(e)}`, 1);
    throw e;
  } finally {
    closeSync(fd);
  }
}
