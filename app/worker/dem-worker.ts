/// <reference lib="webworker" />
// Reads the window of an elevation model file (GeoTIFF or ESRI ASCII grid) about the plan area
// off the main thread, so a 4000 × 4000 model never holds up the page; the grid's heights are
// transferred, not copied, to the page.
import {
  asciiCornerInMetres,
  blobSource,
  DemAreaError,
  type DemGrid,
  type DemRead,
  type LatLonBox,
  MAX_ASCII_GRID_CHARS,
  readAsciiGrid,
  readGeoTiffDem,
} from '../formats';

/** Page → worker: read `file` about the first of `boxes` it can hold. */
export interface DemRequest {
  id: number;
  file: Blob;
  /** the file's name (messages name it; its ending picks the format) */
  name: string;
  /**
   * Areas to read, tried in order: the first the file covers within the cell limit is read
   * (the plan area grown so small edits need no new read, …, the plan area itself last); when
   * none is, the last one's message is the answer
   */
  boxes: LatLonBox[];
  /**
   * EPSG code of the plan's WGS 84 / UTM zone: an ASCII grid (which carries no CRS) whose
   * lower-left corner cannot be degrees is read in it, as the command line does
   */
  utmEpsg?: number;
}

/** Worker → page. */
export type DemReply =
  | {
      id: number;
      kind: 'dem';
      grid: DemGrid;
      /** the box the grid was read for (it covers it) */
      box: LatLonBox;
      cellsRead: number;
      bytesRead: number;
      fileCols: number;
      fileRows: number;
    }
  | { id: number; kind: 'error'; message: string };

/** The reader for a file name: by its ending, or a message naming what is read. */
function demFormat(name: string): 'geotiff' | 'ascii' | null {
  const n = name.toLowerCase();
  if (n.endsWith('.tif') || n.endsWith('.tiff')) return 'geotiff';
  if (n.endsWith('.asc')) return 'ascii';
  return null;
}

async function read(
  req: DemRequest,
  box: LatLonBox,
  text: () => Promise<string>,
): Promise<DemRead> {
  if (demFormat(req.name) !== 'ascii') {
    return readGeoTiffDem(req.name, blobSource(req.file), { box });
  }
  const t = await text();
  if (!asciiCornerInMetres(t.slice(0, 4096))) return readAsciiGrid(req.name, t, { box });
  if (req.utmEpsg === undefined) {
    throw new Error(
      `${req.name}: its corner is in metres, and the release point has no UTM zone to read it in`,
    );
  }
  return readAsciiGrid(req.name, t, { box, epsg: req.utmEpsg });
}

self.onmessage = async (ev: MessageEvent<DemRequest>) => {
  const req = ev.data;
  const scope = self as unknown as DedicatedWorkerGlobalScope;
  try {
    if (!demFormat(req.name)) {
      throw new Error(`${req.name}: not an elevation model file; open a .tif, .tiff or .asc file`);
    }
    if (demFormat(req.name) === 'ascii' && req.file.size > MAX_ASCII_GRID_CHARS) {
      throw new Error(
        `${req.name}: ${req.file.size} bytes is more than the ${MAX_ASCII_GRID_CHARS} an ASCII grid may have; convert it to a GeoTIFF`,
      );
    }
    let cached: Promise<string> | undefined;
    const text = () => (cached ??= req.file.text());
    if (req.boxes.length === 0) throw new Error('no area to read');
    let r: DemRead | undefined;
    let box = req.boxes[0];
    for (const [i, b] of req.boxes.entries()) {
      box = b;
      try {
        r = await read(req, b, text);
        break;
      } catch (e) {
        // A larger area may pass the cell limit or the file's edge: a smaller one may not. Any
        // other fault (a damaged file, an unknown CRS) is the same for every area.
        if (i === req.boxes.length - 1 || !(e instanceof DemAreaError)) throw e;
      }
    }
    if (!r) throw new Error('nothing was read');
    const grid = r.dem.grid;
    scope.postMessage(
      {
        id: req.id,
        kind: 'dem',
        grid,
        box,
        cellsRead: r.cellsRead,
        bytesRead: r.bytesRead,
        fileCols: r.fileCols,
        fileRows: r.fileRows,
      } satisfies DemReply,
      [grid.values.buffer],
    );
  } catch (e) {
    const why = e instanceof Error ? e.message : String(e);
    // Every message names the file (the readers' DemError does; an out-of-memory does not).
    const message = why.startsWith(`${req.name}: `) ? why : `${req.name}: ${why}`;
    scope.postMessage({ id: req.id, kind: 'error', message } satisfies DemReply);
  }
};
