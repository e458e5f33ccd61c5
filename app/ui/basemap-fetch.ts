/**
 * Fetches the tiles of the plan area from the tile URL setting and keeps them in IndexedDB, so the
 * map has them in the field. Bounded: a tile count limit checked before it starts, and a byte
 * limit while it runs. Tiles load as images (the page's policy lets images, not scripts, reach
 * tile servers) and are kept as PNG read back off a canvas, which needs the server to allow
 * cross-origin use (CORS), as public tile servers do. Failed tiles are counted and named.
 */
import { tileCount, tilesOf, tileUrlOf, type TileArea } from '../map';
import { errorText } from './safe-storage';
import { forgetTiles, saveTile } from './basemap-store';

/** Most tiles fetched in one go. */
export const MAX_FETCH_TILES = 5000;
/** Most bytes kept from one fetch (decimal MB). */
export const MAX_FETCH_BYTES = 250e6;
/** A raster tile's size for the estimate shown before a fetch: 256 px PNG map tiles run 5–50 kB. // from memory */
export const TILE_BYTES_ESTIMATE = 25e3;
/** Deepest zoom offered (the usual limit of public raster tile servers). // common practice */
export const MAX_FETCH_ZOOM = 19;
/** Tiles in flight at once (a light load on the tile server). */
const PARALLEL = 4;
/** A tile not loaded in this long counts as failed (a hung server never stops the fetch). */
const TILE_TIMEOUT_MS = 30_000;

/** What a fetch of zooms zMin..zMax over `area` would be, and why it may not start. */
export interface FetchEstimate {
  count: number;
  bytes: number;
  /** the limit it is over, in words, or '' */
  refused: string;
}

/** The count and estimated size of a fetch, checked against the limits. */
export function estimateFetch(area: TileArea, zMin: number, zMax: number): FetchEstimate {
  const count = tileCount(area, zMin, zMax);
  const bytes = count * TILE_BYTES_ESTIMATE;
  let refused = '';
  if (count > MAX_FETCH_TILES) {
    refused = `${count.toLocaleString('en-US')} tiles is more than the limit of ${MAX_FETCH_TILES.toLocaleString('en-US')} tiles for one fetch: choose a smaller zoom range`;
  } else if (bytes > MAX_FETCH_BYTES) {
    refused = `about ${mb(bytes)} is more than the ${mb(MAX_FETCH_BYTES)} limit for one fetch: choose a smaller zoom range`;
  }
  return { count, bytes, refused };
}

/** "12.3 MB", "456 kB" (decimal units). */
export function mb(bytes: number): string {
  if (bytes < 1e6) return `${Math.round(bytes / 1e3)} kB`;
  return `${(bytes / 1e6).toFixed(bytes < 1e7 ? 1 : 0)} MB`;
}

/** Where a fetch stands. */
export interface FetchProgress {
  total: number;
  done: number;
  kept: number;
  failed: number;
  bytes: number;
  state: 'running' | 'finished' | 'cancelled' | 'stopped';
  /** the first failures, "z/x/y: why" (at most 5 kept) */
  failures: string[];
  /** why it stopped early, or '' */
  message: string;
}

/** Loads one tile as an image and returns it as PNG bytes. */
async function loadTile(url: string, signal: AbortSignal): Promise<Blob> {
  const img = new Image();
  img.crossOrigin = 'anonymous';
  img.decoding = 'async';
  let timer: ReturnType<typeof setTimeout> | undefined;
  try {
    await new Promise<void>((resolve, reject) => {
      timer = setTimeout(
        () => reject(new Error(`no answer in ${TILE_TIMEOUT_MS / 1000} s`)),
        TILE_TIMEOUT_MS,
      );
      const stop = (): void => reject(new DOMException('cancelled', 'AbortError'));
      signal.addEventListener('abort', stop, { once: true });
      img.onload = () => resolve();
      img.onerror = () =>
        reject(new Error('not loaded (server unreachable, no such tile, or no cross-origin use)'));
      img.src = url;
    });
  } finally {
    clearTimeout(timer);
    img.onload = img.onerror = null;
  }
  const canvas = document.createElement('canvas');
  canvas.width = img.naturalWidth;
  canvas.height = img.naturalHeight;
  if (!canvas.width || !canvas.height) throw new Error('an empty image');
  canvas.getContext('2d')!.drawImage(img, 0, 0);
  return new Promise<Blob>((resolve, reject) =>
    canvas.toBlob(
      (b) => (b ? resolve(b) : reject(new Error('could not be read back'))),
      'image/png',
    ),
  );
}

/**
 * Replaces the tiles kept with plan `plan` by those of `template` over `area` from zMin to zMax;
 * `onProgress` is called after each tile. The count limit is checked before anything is deleted.
 */
export async function fetchTiles(
  plan: string,
  template: string,
  area: TileArea,
  zMin: number,
  zMax: number,
  signal: AbortSignal,
  onProgress: (p: FetchProgress) => void,
): Promise<FetchProgress> {
  const est = estimateFetch(area, zMin, zMax);
  const p: FetchProgress = {
    total: est.count,
    done: 0,
    kept: 0,
    failed: 0,
    bytes: 0,
    state: 'running',
    failures: [],
    message: '',
  };
  if (est.refused) {
    p.state = 'stopped';
    p.message = est.refused;
    onProgress(p);
    return p;
  }
  await forgetTiles(plan);
  onProgress(p);
  const tiles = tilesOf(area, zMin, zMax);
  const stopped = (): boolean => signal.aborted || p.state !== 'running';
  const worker = async (): Promise<void> => {
    for (let t = tiles.next(); !t.done && !stopped(); t = tiles.next()) {
      const { z, x, y } = t.value;
      try {
        const blob = await loadTile(tileUrlOf(template, z, x, y), signal);
        if (stopped()) return;
        if (p.bytes + blob.size > MAX_FETCH_BYTES) {
          p.state = 'stopped';
          p.message = `stopped at the ${mb(MAX_FETCH_BYTES)} limit of kept tiles`;
          return;
        }
        await saveTile(plan, template, z, x, y, blob);
        p.bytes += blob.size;
        p.kept++;
      } catch (e) {
        if (signal.aborted) return;
        p.failed++;
        if (p.failures.length < 5) p.failures.push(`${z}/${x}/${y}: ${errorText(e)}`);
        if (e instanceof DOMException && e.name === 'QuotaExceededError') {
          p.state = 'stopped';
          p.message = 'browser storage is full';
          return;
        }
      }
      p.done++;
      onProgress(p);
    }
  };
  await Promise.all(Array.from({ length: PARALLEL }, worker));
  if (signal.aborted) p.state = 'cancelled';
  else if (p.state === 'running') p.state = 'finished';
  onProgress(p);
  return p;
}
