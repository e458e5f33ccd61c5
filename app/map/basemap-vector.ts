/**
 * A vector tile archive drawn as a plain base map: land, land use, water, buildings, roads and
 * boundaries as muted fills and lines of our own, recognised by common layer names; labels,
 * points and other layers are left out. Each tile is drawn on its own canvas.
 */
import L from 'leaflet';
import { decodeMvt, type MvtLayer } from './mvt';

/** Reads the bytes of vector tile z/x/y (already decompressed), or null when there is none. */
export type VectorTileReader = (
  z: number,
  x: number,
  y: number,
  signal: AbortSignal,
) => Promise<Uint8Array | null>;

interface Style {
  match: RegExp;
  fill?: string;
  stroke?: string;
  casing?: string;
  width?: number;
  dash?: number[];
}

/** Drawing order and look, by layer name (the first match wins; unmatched layers are skipped). */
export const VECTOR_STYLES: readonly Style[] = [
  { match: /^(earth|land)$/i, fill: '#f1efe6' },
  { match: /landuse|landcover|park|natural|green|wood|forest/i, fill: '#dfe6d6' },
  { match: /water|ocean|sea|lake|river/i, fill: '#b8d0dc', stroke: '#9dbccc', width: 1.2 },
  { match: /building/i, fill: '#ddd7cd' },
  { match: /road|transport|street|highway/i, stroke: '#ffffff', casing: '#c3bdb2', width: 1.6 },
  { match: /boundar|admin/i, stroke: '#9a8fa6', width: 1, dash: [4, 3] },
];

function styleOf(name: string): number {
  return VECTOR_STYLES.findIndex((s) => s.match.test(name));
}

function path(g: CanvasRenderingContext2D, parts: number[][], k: number): void {
  g.beginPath();
  for (const p of parts) {
    g.moveTo(p[0] * k, p[1] * k);
    for (let i = 2; i + 1 < p.length; i += 2) g.lineTo(p[i] * k, p[i + 1] * k);
  }
}

/**
 * Draws decoded layers on a canvas of `size` px: the whole tile, or (`scale` = 2^d, `dx`, `dy`)
 * the part of it that is tile (dx, dy) of its 2^d × 2^d children, drawn sharp at the closer zoom.
 */
export function drawVectorTile(
  g: CanvasRenderingContext2D,
  layers: MvtLayer[],
  size: number,
  scale = 1,
  dx = 0,
  dy = 0,
): void {
  g.save();
  g.translate(-dx * size, -dy * size);
  const ranked = layers
    .map((l) => ({ l, rank: styleOf(l.name) }))
    .filter((r) => r.rank >= 0)
    .sort((a, b) => a.rank - b.rank);
  g.lineJoin = 'round';
  g.lineCap = 'round';
  for (const { l, rank } of ranked) {
    const st = VECTOR_STYLES[rank];
    const k = (size * scale) / l.extent;
    for (const f of l.features) {
      if (f.type === 3 && st.fill) {
        path(g, f.parts, k);
        g.fillStyle = st.fill;
        g.fill('evenodd');
      } else if (f.type === 2 && st.stroke) {
        g.setLineDash(st.dash ?? []);
        if (st.casing) {
          path(g, f.parts, k);
          g.strokeStyle = st.casing;
          g.lineWidth = (st.width ?? 1) + 1.5;
          g.stroke();
        }
        path(g, f.parts, k);
        g.strokeStyle = st.stroke;
        g.lineWidth = st.width ?? 1;
        g.stroke();
      }
    }
  }
  g.restore();
}

interface TileCanvas extends HTMLCanvasElement {
  sfAbort?: AbortController;
}

/** A grid layer drawing vector tiles on canvases. */
export class VectorBasemapLayer extends L.GridLayer {
  /**
   * `maxDataZoom`: the deepest zoom the data has; closer views draw a part of its tiles, sharp
   * (the layer's own `maxNativeZoom` is left unset).
   */
  constructor(
    private readonly read: VectorTileReader,
    private readonly maxDataZoom: number,
    options: L.GridLayerOptions,
  ) {
    super({ className: 'sf-basemap', ...options });
    this.on('tileunload', (e: L.TileEvent) => (e.tile as unknown as TileCanvas).sfAbort?.abort());
  }

  protected createTile(coords: L.Coords, done: L.DoneCallback): HTMLElement {
    const size = this.getTileSize();
    const canvas = document.createElement('canvas') as TileCanvas;
    canvas.width = size.x;
    canvas.height = size.y;
    canvas.setAttribute('role', 'presentation');
    const abort = new AbortController();
    canvas.sfAbort = abort;
    const d = Math.max(0, coords.z - this.maxDataZoom);
    const px = Math.floor(coords.x / 2 ** d);
    const py = Math.floor(coords.y / 2 ** d);
    this.read(coords.z - d, px, py, abort.signal).then(
      (bytes) => {
        if (abort.signal.aborted) return;
        try {
          if (bytes) {
            const layers = decodeMvt(bytes);
            const g = canvas.getContext('2d')!;
            drawVectorTile(
              g,
              layers,
              size.x,
              2 ** d,
              coords.x - px * 2 ** d,
              coords.y - py * 2 ** d,
            );
          }
          done(undefined, canvas);
        } catch (e) {
          done(e instanceof Error ? e : new Error(String(e)), canvas);
        }
      },
      (e: unknown) => {
        if (!abort.signal.aborted) done(e instanceof Error ? e : new Error(String(e)), canvas);
      },
    );
    return canvas;
  }
}
