/**
 * The ground on the map: a hillshade and contour lines of the elevation model, drawn on one
 * canvas in its own pane beneath the grid and the plan's shapes (terrain-shade.ts computes them).
 *
 * Per model, once: the window is averaged down to at most 1024 cells a side, shaded in the
 * model's own grid, contoured at a 1-2-5 interval of the display unit, and every contour vertex
 * is carried to Web Mercator through the model's CRS converter. That work runs in slices of
 * about 10 ms between which the page stays free. Per view: the shade is sampled for every screen
 * pixel, the pixel's grid position interpolated between the exact positions of the corners of
 * 16-pixel blocks (the grid's CRS is curved in Mercator, but not within one block), so there are
 * no seams; then the contours as one path.
 */
import L from 'leaflet';
import { crsConverter, type Dem } from '../formats';
import {
  type ContourLine,
  contourLevels,
  contourSteps,
  downsampleSteps,
  flatShade,
  heightRange,
  hillshadeSteps,
  type ShadeGrid,
  type Steps,
} from './terrain-shade';

/** Screen pixels per side of a block whose corners are carried exactly into the grid. */
const BLOCK = 16;
/** Longest slice of work between two returns to the page, ms. */
const SLICE_MS = 10;
/** Earth radius of the spherical Mercator Leaflet uses (EPSG:3857), m. */
const R = 6378137;
const MAX_LAT = 85.0511287798;

// Our colours: shadows a cool slate, lit slopes a warm cream (white would not show on the map's
// pale background), flat ground left clear so the background shows; contours a muted brown,
// index contours darker and wider.
const SHADOW = [44, 60, 72];
const SHADOW_ALPHA = 0.45;
const LIGHT = [255, 226, 160];
const LIGHT_ALPHA = 0.45;
const CONTOUR = 'rgba(140, 104, 72, 0.55)';
const INDEX_CONTOUR = 'rgba(112, 78, 50, 0.8)';
const LABEL = '#5c4330';
const HALO = 'rgba(243, 244, 239, 0.9)';

/** How contour heights are shown: metres per display unit and the unit's label ("m", "ft"). */
export interface TerrainUnits {
  metresPerUnit: number;
  unit: string;
}

/** What one model gives the map, ready to draw. */
interface Drawn {
  /** the downsampled grid the shade and the lines belong to */
  grid: ShadeGrid;
  /** hillshade bytes per cell: 0 unknown, 1…255 */
  shade: Uint8ClampedArray;
  /** RGBA (as 32-bit words in the platform's byte order) of each shade byte */
  colour: Uint32Array;
  lines: { line: ContourLine; merc: Float64Array; box: [number, number, number, number] }[];
  interval: number;
}

const mercX = (lon: number) => (R * lon * Math.PI) / 180;
const mercY = (lat: number) => {
  const p = (Math.max(-MAX_LAT, Math.min(MAX_LAT, lat)) * Math.PI) / 180;
  return R * Math.log(Math.tan(Math.PI / 4 + p / 2));
};

/** The colour of each hillshade byte (0 unknown, 1…255): flat ground clear, shadow and light as tints. */
function shadeColours(): Uint32Array {
  const rgba = new Uint8ClampedArray(256 * 4);
  const flat = flatShade(45);
  for (let s = 1; s < 256; s++) {
    const k = 4 * s;
    const dark = s < flat;
    const c = dark ? SHADOW : LIGHT;
    rgba[k] = c[0];
    rgba[k + 1] = c[1];
    rgba[k + 2] = c[2];
    // A square-root curve, so the gentle slopes of lowland sites still show.
    rgba[k + 3] = dark
      ? 255 * SHADOW_ALPHA * Math.sqrt((flat - s) / (flat - 1))
      : 255 * LIGHT_ALPHA * Math.sqrt((s - flat) / (255 - flat));
  }
  return new Uint32Array(rgba.buffer);
}

/** All of one model's work, in slices (see the file's comment). */
function* prepare(dem: Dem, units: TerrainUnits): Steps<Drawn> {
  const g = yield* downsampleSteps(dem.grid);
  const shade = yield* hillshadeSteps(g);
  const { min, max } = heightRange(g);
  const { interval, levels } = contourLevels(min, max, units.metresPerUnit);
  const lines = yield* contourSteps(g, levels);
  yield;
  const conv = crsConverter(g.epsg, g.file);
  const toMerc = (x: number, y: number, out: Float64Array, i: number) => {
    const p = conv.inverse({ x, y });
    out[i] = mercX(p.x);
    out[i + 1] = mercY(p.y);
  };
  const out: Drawn['lines'] = [];
  let done = 0;
  for (const line of lines) {
    const n = line.xy.length / 2;
    const merc = new Float64Array(2 * n);
    const box: [number, number, number, number] = [Infinity, Infinity, -Infinity, -Infinity];
    for (let i = 0; i < n; i++) {
      // Grid coordinates (cell-centre units, see ContourLine) to the grid's CRS, then Mercator.
      toMerc(
        g.x0 + (line.xy[2 * i] + 0.5) * g.dx,
        g.y0 - (line.xy[2 * i + 1] + 0.5) * g.dy,
        merc,
        2 * i,
      );
      box[0] = Math.min(box[0], merc[2 * i]);
      box[1] = Math.min(box[1], merc[2 * i + 1]);
      box[2] = Math.max(box[2], merc[2 * i]);
      box[3] = Math.max(box[3], merc[2 * i + 1]);
    }
    out.push({ line, merc, box });
    done += n;
    if (done > 20_000) {
      done = 0;
      yield;
    }
  }
  return { grid: g, shade, colour: shadeColours(), lines: out, interval };
}

/**
 * The shade at grid position (c, r) (columns, rows of cell centres): 0 where the nearest cell is
 * unknown, else bilinear between the known cells of the four about it.
 */
function sampleShade(
  shade: Uint8ClampedArray,
  cols: number,
  rows: number,
  c: number,
  r: number,
): number {
  const nc = Math.min(cols - 1, Math.max(0, Math.round(c)));
  const nr = Math.min(rows - 1, Math.max(0, Math.round(r)));
  if (shade[nr * cols + nc] === 0) return 0;
  const c0 = Math.min(cols - 1, Math.max(0, Math.floor(c)));
  const r0 = Math.min(rows - 1, Math.max(0, Math.floor(r)));
  const c1 = Math.min(cols - 1, c0 + 1);
  const r1 = Math.min(rows - 1, r0 + 1);
  const fx = Math.min(1, Math.max(0, c - c0));
  const fy = Math.min(1, Math.max(0, r - r0));
  let sum = 0;
  let weight = 0;
  const add = (i: number, wt: number) => {
    const v = shade[i];
    if (v === 0 || wt === 0) return;
    sum += v * wt;
    weight += wt;
  };
  add(r0 * cols + c0, (1 - fx) * (1 - fy));
  add(r0 * cols + c1, fx * (1 - fy));
  add(r1 * cols + c0, (1 - fx) * fy);
  add(r1 * cols + c1, fx * fy);
  return weight > 0 ? Math.round(sum / weight) : shade[nr * cols + nc];
}

/** Hillshade and contours of an elevation model (setDem), in a pane beneath the plan's shapes. */
export class TerrainLayer extends L.Layer {
  private map: L.Map | undefined;
  private canvas: HTMLCanvasElement | undefined;
  private dem: Dem | null = null;
  private units: TerrainUnits = { metresPerUnit: 1, unit: 'm' };
  private drawn: Drawn | null = null;
  private job = 0;
  private timer: ReturnType<typeof setTimeout> | undefined;
  /** The view the canvas was last drawn for (for the zoom animation). */
  private drawnView: { bounds: L.LatLngBounds; zoom: number } | null = null;

  constructor(
    private readonly opts: { pane?: string; paneZIndex?: number; padding?: number } = {},
  ) {
    super();
  }

  private get paneName(): string {
    return this.opts.pane ?? 'seedfallTerrain';
  }

  /** The model to draw (null: none); its image and lines are made once, in slices. */
  setDem(dem: Dem | null): this {
    if (dem === this.dem) return this;
    this.dem = dem;
    this.restart();
    return this;
  }

  /** The unit contour heights are chosen and labelled in (the levels are recomputed). */
  setUnits(units: TerrainUnits): this {
    if (units.metresPerUnit === this.units.metresPerUnit && units.unit === this.units.unit) {
      return this;
    }
    this.units = units;
    this.restart();
    return this;
  }

  /** True once the current model's image and lines are ready (or there is no model). */
  get ready(): boolean {
    return this.dem === null || this.drawn !== null;
  }

  /** The contour interval in the display unit (NaN before the model is ready or when flat). */
  get interval(): number {
    return this.drawn?.interval ?? NaN;
  }

  private restart(): void {
    const job = ++this.job;
    clearTimeout(this.timer);
    this.drawn = null;
    this.redraw();
    const dem = this.dem;
    if (!dem) return;
    const steps = prepare(dem, this.units);
    const slice = () => {
      if (job !== this.job) return;
      const t0 = performance.now();
      for (;;) {
        const s = steps.next();
        if (s.done) {
          this.drawn = s.value;
          this.redraw();
          this.fire('terrainready');
          return;
        }
        if (performance.now() - t0 > SLICE_MS) break;
      }
      this.timer = setTimeout(slice, 0);
    };
    this.timer = setTimeout(slice, 0);
  }

  onAdd(map: L.Map): this {
    this.map = map;
    const pane =
      map.getPane(this.paneName) ??
      (() => {
        const p = map.createPane(this.paneName);
        // Above tiles (200), beneath the coordinate grid (350) and the plan's shapes (400).
        p.style.zIndex = String(this.opts.paneZIndex ?? 300);
        p.style.pointerEvents = 'none';
        return p;
      })();
    const canvas = L.DomUtil.create('canvas', 'sf-terrain leaflet-zoom-animated', pane);
    canvas.setAttribute('aria-hidden', 'true');
    canvas.style.position = 'absolute';
    this.canvas = canvas;
    this.redraw();
    return this;
  }

  onRemove(): this {
    this.canvas?.remove();
    this.canvas = this.map = undefined;
    this.drawnView = null;
    return this;
  }

  getEvents(): { [name: string]: L.LeafletEventHandlerFn } {
    return {
      moveend: this.redraw,
      viewreset: this.redraw,
      resize: this.redraw,
      zoomanim: this.animateZoom as L.LeafletEventHandlerFn,
    };
  }

  // As Leaflet's image overlay does: scale and move the last drawing to where the zoom goes.
  private animateZoom(e: L.ZoomAnimEvent): void {
    const map = this.map as
      | (L.Map & {
          _latLngBoundsToNewLayerBounds(b: L.LatLngBounds, zoom: number, c: L.LatLng): L.Bounds;
        })
      | undefined;
    if (!map || !this.canvas || !this.drawnView) return;
    const scale = map.getZoomScale(e.zoom, this.drawnView.zoom);
    const offset = map._latLngBoundsToNewLayerBounds(this.drawnView.bounds, e.zoom, e.center).min;
    if (offset) L.DomUtil.setTransform(this.canvas, offset, scale);
  }

  /** Draws the current view (a canvas over the map with `padding` of a view on each side). */
  redraw(): void {
    const map = this.map;
    const canvas = this.canvas;
    if (!map || !canvas) return;
    const size = map.getSize();
    const pad = size.multiplyBy(this.opts.padding ?? 0.15).round();
    const topLeft = map.containerPointToLayerPoint([0, 0]).subtract(pad);
    const w = size.x + 2 * pad.x;
    const h = size.y + 2 * pad.y;
    const dpr = Math.min(2, window.devicePixelRatio || 1);
    canvas.width = Math.max(1, Math.round(w * dpr));
    canvas.height = Math.max(1, Math.round(h * dpr));
    canvas.style.width = `${w}px`;
    canvas.style.height = `${h}px`;
    L.DomUtil.setPosition(canvas, topLeft);
    this.drawnView = {
      bounds: L.latLngBounds(
        map.layerPointToLatLng(topLeft),
        map.layerPointToLatLng(topLeft.add([w, h])),
      ),
      zoom: map.getZoom(),
    };
    const ctx = canvas.getContext('2d');
    const d = this.drawn;
    if (!ctx || !d || map.options.crs !== L.CRS.EPSG3857) return;
    // Mercator metres → canvas pixels: Leaflet's EPSG:3857 transformation at this zoom.
    const s = map.options.crs.scale(map.getZoom());
    const origin = map.getPixelOrigin();
    const k = s / (2 * Math.PI * R);
    const ox = s / 2 - origin.x - topLeft.x;
    const oy = s / 2 - origin.y - topLeft.y;
    const sx = (X: number) => k * X + ox;
    const sy = (Y: number) => -k * Y + oy;
    this.drawShade(ctx, map, d, topLeft, w, h);
    this.drawContours(ctx, d, sx, sy, dpr, w, h);
  }

  /**
   * The hillshade at one sample per CSS pixel: each pixel's grid position is interpolated in its
   * 16-pixel block from the block's corners (carried exactly: screen → WGS 84 → the grid's CRS),
   * and the shade interpolated bilinearly between the known cells about it.
   */
  private drawShade(
    ctx: CanvasRenderingContext2D,
    map: L.Map,
    d: Drawn,
    topLeft: L.Point,
    w: number,
    h: number,
  ): void {
    const g = d.grid;
    const conv = crsConverter(g.epsg, g.file);
    const nbx = Math.ceil(w / BLOCK);
    const nby = Math.ceil(h / BLOCK);
    // Grid position (column, row of cell centres) of every block corner.
    const gc = new Float64Array((nbx + 1) * (nby + 1));
    const gr = new Float64Array((nbx + 1) * (nby + 1));
    for (let j = 0; j <= nby; j++) {
      for (let i = 0; i <= nbx; i++) {
        const ll = map.layerPointToLatLng(topLeft.add([i * BLOCK, j * BLOCK]));
        const q = conv.forward({ x: ll.lng, y: ll.lat });
        gc[j * (nbx + 1) + i] = (q.x - g.x0) / g.dx - 0.5;
        gr[j * (nbx + 1) + i] = (g.y0 - q.y) / g.dy - 0.5;
      }
    }
    const img = new ImageData(w, h);
    const out = new Uint32Array(img.data.buffer);
    const { cols, rows } = g;
    const shade = d.shade;
    const colour = d.colour;
    let any = false;
    for (let j = 0; j < nby; j++) {
      for (let i = 0; i < nbx; i++) {
        const k00 = j * (nbx + 1) + i;
        const k10 = k00 + 1;
        const k01 = k00 + nbx + 1;
        const k11 = k01 + 1;
        const c00 = gc[k00];
        const c10 = gc[k10];
        const c01 = gc[k01];
        const c11 = gc[k11];
        const r00 = gr[k00];
        const r10 = gr[k10];
        const r01 = gr[k01];
        const r11 = gr[k11];
        // A block wholly beside the grid draws nothing.
        if (
          Math.max(c00, c10, c01, c11) < -0.5 ||
          Math.min(c00, c10, c01, c11) > cols - 0.5 ||
          Math.max(r00, r10, r01, r11) < -0.5 ||
          Math.min(r00, r10, r01, r11) > rows - 0.5
        ) {
          continue;
        }
        const x1 = Math.min(w, (i + 1) * BLOCK);
        const y1 = Math.min(h, (j + 1) * BLOCK);
        for (let y = j * BLOCK; y < y1; y++) {
          const v = (y - j * BLOCK) / BLOCK;
          const cl = c00 + (c01 - c00) * v;
          const cr = c10 + (c11 - c10) * v;
          const rl = r00 + (r01 - r00) * v;
          const rr = r10 + (r11 - r10) * v;
          for (let x = i * BLOCK; x < x1; x++) {
            const u = (x - i * BLOCK) / BLOCK;
            const c = cl + (cr - cl) * u;
            const r = rl + (rr - rl) * u;
            if (!(c >= -0.5 && r >= -0.5 && c <= cols - 0.5 && r <= rows - 0.5)) continue;
            const s = sampleShade(shade, cols, rows, c, r);
            if (s > 0) {
              out[y * w + x] = colour[s];
              any = true;
            }
          }
        }
      }
    }
    if (!any) return;
    // Drawn through a canvas of CSS pixels, scaled to the device's (the shade is smooth).
    const tmp = document.createElement('canvas');
    tmp.width = w;
    tmp.height = h;
    tmp.getContext('2d')!.putImageData(img, 0, 0);
    ctx.setTransform(1, 0, 0, 1, 0, 0);
    ctx.imageSmoothingEnabled = true;
    ctx.drawImage(tmp, 0, 0, ctx.canvas.width, ctx.canvas.height);
  }

  private drawContours(
    ctx: CanvasRenderingContext2D,
    d: Drawn,
    sx: (X: number) => number,
    sy: (Y: number) => number,
    dpr: number,
    w: number,
    h: number,
  ): void {
    ctx.setTransform(dpr, 0, 0, dpr, 0, 0);
    ctx.lineJoin = 'round';
    const shown = d.lines.filter(
      ({ box }) => sx(box[2]) >= 0 && sx(box[0]) <= w && sy(box[1]) >= 0 && sy(box[3]) <= h,
    );
    for (const index of [false, true]) {
      ctx.beginPath();
      for (const { line, merc } of shown) {
        if (line.level.index !== index) continue;
        const n = merc.length / 2;
        let lx = sx(merc[0]);
        let ly = sy(merc[1]);
        ctx.moveTo(lx, ly);
        for (let i = 1; i < n; i++) {
          const x = sx(merc[2 * i]);
          const y = sy(merc[2 * i + 1]);
          // Vertices closer than a pixel to the last drawn add nothing a person can see.
          if (i < n - 1 && Math.abs(x - lx) + Math.abs(y - ly) < 1) continue;
          ctx.lineTo(x, y);
          lx = x;
          ly = y;
        }
      }
      ctx.strokeStyle = index ? INDEX_CONTOUR : CONTOUR;
      ctx.lineWidth = index ? 1.3 : 0.7;
      ctx.stroke();
    }
    this.drawLabels(ctx, shown, sx, sy, w, h);
    ctx.setTransform(1, 0, 0, 1, 0, 0);
  }

  /** Heights along the index contours, every ~360 px of line, upright, kept apart. */
  private drawLabels(
    ctx: CanvasRenderingContext2D,
    shown: Drawn['lines'],
    sx: (X: number) => number,
    sy: (Y: number) => number,
    w: number,
    h: number,
  ): void {
    ctx.font = '10px system-ui, sans-serif';
    ctx.textAlign = 'center';
    ctx.textBaseline = 'middle';
    ctx.lineWidth = 3;
    ctx.strokeStyle = HALO;
    ctx.fillStyle = LABEL;
    const placed: [number, number][] = [];
    const MAX_LABELS = 200;
    for (const { line, merc } of shown) {
      if (!line.level.index) continue;
      const text = `${line.level.shown} ${this.units.unit}`;
      let along = 0;
      let next = 120;
      for (let i = 1; i < merc.length / 2 && placed.length < MAX_LABELS; i++) {
        const x0 = sx(merc[2 * i - 2]);
        const y0 = sy(merc[2 * i - 1]);
        const x1 = sx(merc[2 * i]);
        const y1 = sy(merc[2 * i + 1]);
        along += Math.hypot(x1 - x0, y1 - y0);
        if (along < next) continue;
        const x = (x0 + x1) / 2;
        const y = (y0 + y1) / 2;
        const inside = x > 30 && x < w - 30 && y > 12 && y < h - 12;
        if (!inside || placed.some(([px, py]) => Math.hypot(px - x, py - y) < 90)) continue;
        let angle = Math.atan2(y1 - y0, x1 - x0);
        if (angle > Math.PI / 2) angle -= Math.PI;
        if (angle < -Math.PI / 2) angle += Math.PI;
        ctx.save();
        ctx.translate(x, y);
        ctx.rotate(angle);
        ctx.strokeText(text, 0, 0);
        ctx.fillText(text, 0, 0);
        ctx.restore();
        placed.push([x, y]);
        next = along + 360;
      }
    }
  }
}
