/**
 * GeoTIFF elevation models through the `geotiff` package (docs/decisions/0007): one band,
 * north-up, a CRS given by an EPSG code that crsConverter knows, GDAL's nodata tag honoured.
 * Only the strips or tiles under the requested box (plus a margin) are fetched from the file.
 */
import { GeoTIFF, type GeoTIFFImage } from 'geotiff';
import {
  Dem,
  DemError,
  type GridGeometry,
  type GridWindow,
  type LatLonBox,
  MAX_DEM_CELLS,
  windowFor,
} from './dem';

/** Random access to a file's bytes (a Blob in the browser, a file handle in Node). */
export interface ByteSource {
  /** file size in bytes */
  readonly size: number;
  /** the bytes [offset, offset + length), all inside the file */
  read(offset: number, length: number): Promise<ArrayBuffer>;
}

/** A ByteSource over a Blob or File (browser and worker). */
export function blobSource(blob: Blob): ByteSource {
  return { size: blob.size, read: (o, n) => blob.slice(o, o + n).arrayBuffer() };
}

/** A ByteSource over bytes already in memory. */
export function bufferSource(buf: ArrayBuffer): ByteSource {
  return { size: buf.byteLength, read: (o, n) => Promise.resolve(buf.slice(o, o + n)) };
}

/** What a reader returns: the DEM of the window, and how much of the file it took. */
export interface DemRead {
  dem: Dem;
  window: GridWindow;
  /** cells of the window held in memory (= window.cols × window.rows) */
  cellsRead: number;
  /** bytes fetched from the file (GeoTIFF) or characters scanned (ASCII grid) */
  bytesRead: number;
  /** the whole file's grid size */
  fileCols: number;
  fileRows: number;
}

export interface DemReadOptions {
  /** the WGS 84 area the plan needs (degrees) */
  box: LatLonBox;
  /** largest window kept (cells); default MAX_DEM_CELLS */
  maxCells?: number;
}

/**
 * The source geotiff reads through: counts bytes, and once the header is parsed (`strict`)
 * refuses reads past the end, so a cut file is named as such instead of read as zeros.
 */
class CountingSource {
  strict = false;
  bytesRead = 0;
  constructor(
    private readonly src: ByteSource,
    private readonly file: string,
  ) {}
  get fileSize(): number {
    return this.src.size;
  }
  async fetch(slices: { offset: number; length: number }[]): Promise<ArrayBuffer[]> {
    return Promise.all(
      slices.map(async ({ offset, length }) => {
        const end = offset + length;
        if (end > this.src.size && this.strict) {
          throw new DemError(
            this.file,
            `the file is truncated or corrupt: it points to bytes up to ${end}, but has only ${this.src.size}`,
          );
        }
        const n = Math.max(0, Math.min(end, this.src.size) - offset);
        this.bytesRead += n;
        return n > 0 ? this.src.read(offset, n) : new ArrayBuffer(0);
      }),
    );
  }
  async close(): Promise<void> {}
}

const GEOGRAPHIC = 2;
const PROJECTED = 1;
const USER_DEFINED = 32767;

function epsgOf(image: GeoTIFFImage, file: string): number {
  const keys = image.getGeoKeys();
  if (!keys) throw new DemError(file, 'it has no GeoTIFF georeferencing (no GeoKeyDirectory tag)');
  const model = keys.GTModelTypeGeoKey as number | undefined;
  const code =
    model === GEOGRAPHIC
      ? (keys.GeographicTypeGeoKey as number | undefined)
      : model === PROJECTED
        ? (keys.ProjectedCSTypeGeoKey as number | undefined)
        : undefined;
  if (code === undefined || code === USER_DEFINED) {
    throw new DemError(
      file,
      'its CRS is not given by an EPSG code; export it as WGS 84 (EPSG:4326) or a WGS 84 / UTM zone',
    );
  }
  return code;
}

function geometryOf(image: GeoTIFFImage, file: string): GridGeometry {
  const dir = image.getFileDirectory();
  const t = dir.getValue('ModelTransformation') as number[] | undefined;
  if (t && (t[1] !== 0 || t[4] !== 0)) {
    throw new DemError(
      file,
      'its grid is rotated; only north-up grids are read (warp it north-up first)',
    );
  }
  let origin: number[];
  let res: number[];
  try {
    origin = image.getOrigin();
    res = image.getResolution();
  } catch {
    throw new DemError(file, 'it has no geotransform (no tie point and pixel scale)');
  }
  let [x0, y0] = origin;
  const dx = res[0];
  const dy = -res[1];
  if (!(dx > 0) || !Number.isFinite(dx) || !(dy > 0) || !Number.isFinite(dy)) {
    throw new DemError(
      file,
      `its cell size ${res[0]} × ${res[1]} is not north-up (width > 0, height < 0)`,
    );
  }
  // A point-registered raster's tie point is the centre of its first cell (GeoTIFF 1.0 §2.5.2.2).
  if (!image.pixelIsArea()) {
    x0 -= dx / 2;
    y0 += dy / 2;
  }
  return {
    file,
    epsg: epsgOf(image, file),
    cols: image.getWidth(),
    rows: image.getHeight(),
    x0,
    y0,
    dx,
    dy,
  };
}

/** Reads the window of a single-band GeoTIFF DEM that covers opts.box; DemError names what is wrong. */
export async function readGeoTiffDem(
  file: string,
  src: ByteSource,
  opts: DemReadOptions,
): Promise<DemRead> {
  const source = new CountingSource(src, file);
  let tiff: GeoTIFF;
  let image: GeoTIFFImage;
  try {
    // fromSource only calls fetch, fileSize and close, all of which CountingSource has.
    tiff = await GeoTIFF.fromSource(source as unknown as Parameters<typeof GeoTIFF.fromSource>[0]);
    image = await tiff.getImage(0);
  } catch (e) {
    throw new DemError(
      file,
      `not a readable GeoTIFF (${src.size} bytes; truncated or corrupt): ${(e as Error).message}`,
    );
  }
  source.strict = true;
  const bands = image.getSamplesPerPixel();
  if (bands !== 1) {
    throw new DemError(
      file,
      `it has ${bands} bands; an elevation model has exactly 1 (heights in metres)`,
    );
  }
  const format = image.getSampleFormat(0);
  if (format !== 1 && format !== 2 && format !== 3) {
    throw new DemError(file, `its sample format ${format} is not integer or floating point`);
  }
  const g = geometryOf(image, file);
  const w = windowFor(g, opts.box, opts.maxCells ?? MAX_DEM_CELLS);
  let raster: ArrayLike<number>;
  try {
    raster = (await image.readRasters({
      window: [w.col0, w.row0, w.col0 + w.cols, w.row0 + w.rows],
      samples: [0],
      interleave: true,
    })) as unknown as ArrayLike<number>;
  } catch (e) {
    if (e instanceof DemError) throw e;
    throw new DemError(
      file,
      `its cells cannot be read (truncated or corrupt): ${(e as Error).message}`,
    );
  }
  if (raster.length !== w.cols * w.rows) {
    throw new DemError(
      file,
      `read ${raster.length} cells where ${w.cols * w.rows} were expected (corrupt)`,
    );
  }
  const nodata = image.getGDALNoData();
  const dem = new Dem({
    file,
    epsg: g.epsg,
    cols: w.cols,
    rows: w.rows,
    x0: g.x0 + w.col0 * g.dx,
    y0: g.y0 - w.row0 * g.dy,
    dx: g.dx,
    dy: g.dy,
    values: Float32Array.from(raster),
    nodata: nodata === null ? null : Math.fround(nodata),
  });
  return {
    dem,
    window: w,
    cellsRead: w.cols * w.rows,
    bytesRead: source.bytesRead,
    fileCols: g.cols,
    fileRows: g.rows,
  };
}
