/**
 * The map's base layer: a PMTiles archive when one is open (raster tiles as images, MVT vector
 * tiles drawn in our own muted colours), else the tile URL setting (kept tiles first, then the
 * server), else none (the coordinate grid alone). Attribution goes to Leaflet's control escaped
 * (it takes HTML); an archive of a kind that cannot be drawn is named on the map, in text.
 */
import L from 'leaflet';
import { BasemapLayer, escapeHtml, tileUrlOf, VectorBasemapLayer, type TileImage } from '../map';
import { basemap } from './basemap-state';
import { loadTile } from './basemap-store';

/** True when a base map is set (an archive or a tile URL), shown or switched off. */
export function basemapSet(tileUrl: string): boolean {
  return basemap.archive !== null || tileUrl !== '';
}

/** The base layer of one map, kept in line with the base map state and the tile settings. */
export class BasemapView {
  private layer?: L.GridLayer;
  private key = '';
  private note?: L.Control;

  /**
   * Draws what `tileUrl`/`tileAttribution` and the opened archive call for, or nothing when
   * `visible` is false (no-op when unchanged).
   */
  sync(map: L.Map, tileUrl: string, tileAttribution: string, visible = true): void {
    const a = basemap.archive;
    const key = JSON.stringify([
      a?.info.name,
      a?.pm === undefined ? 0 : archiveId(a.pm),
      tileUrl,
      tileAttribution,
      visible,
      basemap.plan,
    ]);
    if (key === this.key) return;
    this.key = key;
    this.layer?.remove();
    this.layer = undefined;
    this.note?.remove();
    this.note = undefined;
    if (!visible) return;
    if (a && a.info.kind !== 'other') {
      const { pm, info } = a;
      const b = info.bounds;
      const options: L.GridLayerOptions = {
        minNativeZoom: info.minZoom,
        maxNativeZoom: info.maxZoom,
        maxZoom: 22,
        bounds: b ? L.latLngBounds([b[0], b[1]], [b[2], b[3]]) : undefined,
        attribution: escapeHtml(info.attribution || `${info.name} (no attribution in the archive)`),
      };
      this.layer =
        info.kind === 'raster'
          ? new BasemapLayer({
              read: async (z, x, y, signal): Promise<TileImage> => {
                const r = await pm.getZxy(z, x, y, signal);
                return r ? new Blob([r.data], { type: info.mime }) : null;
              },
              ...options,
            })
          : new VectorBasemapLayer(
              async (z, x, y, signal) => {
                const r = await pm.getZxy(z, x, y, signal);
                return r ? new Uint8Array(r.data) : null;
              },
              info.maxZoom,
              { ...options, maxNativeZoom: undefined },
            );
    } else if (tileUrl) {
      const plan = basemap.plan; // the tiles kept with the plan being edited
      this.layer = new BasemapLayer({
        read: async (z, x, y): Promise<TileImage> => {
          const kept = await loadTile(plan, tileUrl, z, x, y).catch(() => null);
          if (kept) return kept;
          // Offline, a kept tile of a lower zoom, enlarged; online the server's own.
          if (!navigator.onLine) return keptAncestor(plan, tileUrl, z, x, y);
          return tileUrlOf(tileUrl, z, x, y);
        },
        fallback: (z, x, y) => keptAncestor(plan, tileUrl, z, x, y),
        maxZoom: 22,
        maxNativeZoom: 19,
        attribution: escapeHtml(tileAttribution),
      });
    }
    this.layer?.addTo(map);
    if (a && a.info.kind === 'other') {
      this.note = noteControl(
        `Base map ${a.info.name}: ${a.info.tileKind} tiles cannot be drawn${tileUrl ? '' : '; coordinate grid only'}.`,
      ).addTo(map);
    }
  }
}

const ids = new WeakMap<object, number>();
let nextId = 1;
/** A number per archive object, so opening the same file name again redraws. */
function archiveId(pm: object): number {
  let id = ids.get(pm);
  if (id === undefined) ids.set(pm, (id = nextId++));
  return id;
}

/** A small text box on the map (text nodes only). */
function noteControl(text: string): L.Control {
  const C = L.Control.extend({
    onAdd(): HTMLElement {
      const el = L.DomUtil.create('div', 'sf-basemap-note');
      el.setAttribute('role', 'status');
      el.setAttribute('data-testid', 'basemap-note');
      el.textContent = text;
      Object.assign(el.style, {
        background: 'rgb(255 255 255 / 92%)',
        border: '1px solid #b45309',
        borderRadius: '4px',
        padding: '2px 6px',
        font: '12px/1.4 system-ui, sans-serif',
        maxWidth: '22rem',
      });
      return el;
    },
  });
  return new C({ position: 'bottomleft' });
}

/** How many zooms up a missing tile is looked for among the kept ones (an 8× enlargement at most). */
const MAX_ENLARGE_ZOOMS = 3;

/**
 * The part of the nearest tile kept with `plan` of a lower zoom that covers tile z/x/y, enlarged to a tile's
 * size, or null when none is kept.
 */
async function keptAncestor(
  plan: string,
  template: string,
  z: number,
  x: number,
  y: number,
): Promise<Blob | null> {
  for (let d = 1; d <= MAX_ENLARGE_ZOOMS && z - d >= 0; d++) {
    const px = x >> d;
    const py = y >> d;
    const blob = await loadTile(plan, template, z - d, px, py).catch(() => null);
    if (!blob) continue;
    const bmp = await createImageBitmap(blob);
    try {
      const part = bmp.width / 2 ** d;
      const canvas = document.createElement('canvas');
      canvas.width = canvas.height = bmp.width;
      const g = canvas.getContext('2d')!;
      g.imageSmoothingEnabled = false;
      g.drawImage(
        bmp,
        (x - (px << d)) * part,
        (y - (py << d)) * part,
        part,
        part,
        0,
        0,
        bmp.width,
        bmp.width,
      );
      return await new Promise<Blob | null>((resolve) => canvas.toBlob(resolve, 'image/png'));
    } finally {
      bmp.close();
    }
  }
  return null;
}
