/**
 * The base map as a Leaflet grid layer whose tiles come from a function: a PMTiles archive's
 * bytes, a kept tile, or the tile server's URL. Beneath the coordinate grid and the plan.
 */
import L from 'leaflet';

/** A tile's image: bytes (drawn through a blob: URL), a URL, or null for none (left blank). */
export type TileImage = Blob | string | null;

/** Reads the image of tile z/x/y. */
export type TileReader = (
  z: number,
  x: number,
  y: number,
  signal: AbortSignal,
) => Promise<TileImage>;

/** Options of the base map layer: Leaflet's grid layer options and the reader of its tiles. */
export interface BasemapLayerOptions extends L.GridLayerOptions {
  read: TileReader;
  /** When a tile given as a URL does not load: another image of it (e.g. one kept offline). */
  fallback?: (z: number, x: number, y: number) => Promise<Blob | null>;
}

interface TileEl extends HTMLImageElement {
  sfAbort?: AbortController;
}

/** A grid layer drawing the images `read` gives (object URLs are released with their tiles). */
export class BasemapLayer extends L.GridLayer {
  private readonly read: TileReader;
  private readonly fallback?: BasemapLayerOptions['fallback'];

  constructor(options: BasemapLayerOptions) {
    const { read, fallback, ...rest } = options;
    super({ className: 'sf-basemap', ...rest });
    this.read = read;
    this.fallback = fallback;
    this.on('tileunload', (e: L.TileEvent) => {
      const el = e.tile as TileEl;
      el.sfAbort?.abort();
      if (el.src.startsWith('blob:')) URL.revokeObjectURL(el.src);
    });
  }

  protected createTile(coords: L.Coords, done: L.DoneCallback): HTMLElement {
    const img = document.createElement('img') as TileEl;
    img.alt = '';
    img.setAttribute('role', 'presentation');
    img.decoding = 'async';
    const abort = new AbortController();
    img.sfAbort = abort;
    this.read(coords.z, coords.x, coords.y, abort.signal).then(
      (image) => {
        if (abort.signal.aborted) return;
        if (image === null) {
          img.style.visibility = 'hidden';
          done(undefined, img);
          return;
        }
        const failed = (): void => {
          img.style.visibility = 'hidden';
          done(new Error(`tile ${coords.z}/${coords.x}/${coords.y} could not be drawn`), img);
        };
        img.onload = () => done(undefined, img);
        img.onerror = () => {
          if (typeof image !== 'string' || !this.fallback) return failed();
          img.onerror = failed;
          this.fallback(coords.z, coords.x, coords.y).then(
            (blob) => {
              if (abort.signal.aborted) return;
              if (blob) img.src = URL.createObjectURL(blob);
              else failed();
            },
            () => failed(),
          );
        };
        img.src = typeof image === 'string' ? image : URL.createObjectURL(image);
      },
      (e: unknown) => {
        if (abort.signal.aborted) return;
        img.style.visibility = 'hidden';
        done(e instanceof Error ? e : new Error(String(e)), img);
      },
    );
    return img;
  }
}
