/**
 * A latitude/longitude grid with edge labels, so the map is readable without any tile server.
 * Lines are redrawn at a "nice" interval (niceInterval) after every move or zoom; labels are
 * kept on the left (latitude) and bottom (longitude) edges of the view while panning.
 * Everything is drawn in its own pane below the overlay pane, so planner layers stay on top.
 */
import L from 'leaflet';
import { intervalDecimals, niceInterval } from './geometry';

export { niceInterval } from './geometry';

/** Options of the Graticule layer. */
export interface GraticuleOptions {
  /** Line colour (CSS). */
  color?: string;
  /** Line width in CSS pixels. */
  weight?: number;
  /** Line opacity 0–1. */
  opacity?: number;
  /**
   * Label text of a line at value degrees (longitude wrapped into [-180, 180)); step_deg is the
   * current interval, for choosing decimals. Default: "47.25°N", "8.5°E".
   */
  labelFormat?: (value: number, axis: 'lat' | 'lon', step_deg: number) => string;
  /** Pane name; created (z-index paneZIndex) if the map lacks it. */
  pane?: string;
  /** z-index of a created pane; Leaflet's tile pane is 200, overlay pane 400. */
  paneZIndex?: number;
  /** Wanted number of lines across the view, per axis (see niceInterval). */
  targetLines?: number;
}

const DEFAULTS = {
  color: '#6f7780',
  weight: 1,
  opacity: 0.55,
  pane: 'seedfallGraticule',
  paneZIndex: 350,
  targetLines: Math.sqrt(40),
};

// Web Mercator stops at ±85.0511°; lines beyond it would be drawn at infinity.
const MAX_LAT = 85;
// Guard against pathological views (e.g. zoom 0 in a very wide window): never draw more.
const MAX_LINES_PER_AXIS = 200;

/** "47.25°N" / "8.5°E" with the decimals the step needs. */
export function defaultLabelFormat(value: number, axis: 'lat' | 'lon', step_deg: number): string {
  const d = intervalDecimals(step_deg);
  const text = Math.abs(value).toFixed(d);
  // The equator, prime meridian and antimeridian have no hemisphere.
  if (Number(text) === 0 || (axis === 'lon' && Number(text) === 180)) return `${text}°`;
  const hemi = axis === 'lat' ? (value > 0 ? 'N' : 'S') : value > 0 ? 'E' : 'W';
  return `${text}°${hemi}`;
}

function wrapLon(lon: number): number {
  const l = (((lon + 180) % 360) + 360) % 360;
  return l - 180;
}

interface Label {
  el: HTMLElement;
  axis: 'lat' | 'lon';
  value: number; // unwrapped degrees, as drawn
}

/** Latitude/longitude grid layer with edge labels, for maps without a base layer. */
export class Graticule extends L.Layer {
  private readonly opts: Required<Omit<GraticuleOptions, 'labelFormat'>> &
    Pick<GraticuleOptions, 'labelFormat'>;
  private map: L.Map | undefined;
  private renderer: L.Renderer | undefined;
  private lines: L.LayerGroup | undefined;
  private labelBox: HTMLElement | undefined;
  private labels: Label[] = [];

  constructor(options: GraticuleOptions = {}) {
    super();
    this.opts = { ...DEFAULTS, ...options };
  }

  onAdd(map: L.Map): this {
    this.map = map;
    const pane =
      map.getPane(this.opts.pane) ??
      (() => {
        const p = map.createPane(this.opts.pane);
        p.style.zIndex = String(this.opts.paneZIndex);
        p.style.pointerEvents = 'none';
        return p;
      })();
    // Its own renderer, so removing the grid removes its SVG element too.
    this.renderer = L.svg({ pane: this.opts.pane, padding: 0.5 });
    this.lines = L.layerGroup().addTo(map);
    this.labelBox = L.DomUtil.create('div', 'seedfall-graticule-labels leaflet-zoom-hide', pane);
    Object.assign(this.labelBox.style, { position: 'absolute', left: '0', top: '0', zIndex: '1' });
    map.whenReady(this.redraw, this);
    return this;
  }

  onRemove(map: L.Map): this {
    this.lines?.remove();
    if (this.renderer) map.removeLayer(this.renderer);
    this.labelBox?.remove();
    this.lines = this.renderer = this.labelBox = this.map = undefined;
    this.labels = [];
    return this;
  }

  getEvents(): { [name: string]: L.LeafletEventHandlerFn } {
    return { moveend: this.redraw, zoomend: this.redraw, viewreset: this.redraw, move: this.place };
  }

  /** Rebuild lines and labels for the current view. */
  redraw(): void {
    const map = this.map;
    if (!map || !this.lines || !this.labelBox) return;
    this.lines.clearLayers();
    this.labelBox.replaceChildren();
    this.labels = [];

    const view = map.getBounds();
    const size = map.getSize();
    if (size.x === 0 || size.y === 0) return;
    const latStep = niceInterval(view.getNorth() - view.getSouth(), this.opts.targetLines);
    const lonStep = niceInterval(view.getEast() - view.getWest(), this.opts.targetLines);
    // Draw half a view beyond each edge, like the renderer's padding, so panning shows no ends.
    const pad = view.pad(0.5);
    const south = Math.max(pad.getSouth(), -MAX_LAT);
    const north = Math.min(pad.getNorth(), MAX_LAT);
    const west = pad.getWest();
    const east = pad.getEast();
    const style: L.PolylineOptions = {
      renderer: this.renderer,
      pane: this.opts.pane,
      color: this.opts.color,
      weight: this.opts.weight,
      opacity: this.opts.opacity,
      interactive: false,
    };
    const format = this.opts.labelFormat ?? defaultLabelFormat;

    if (latStep > 0) {
      const d = intervalDecimals(latStep);
      const k0 = Math.ceil(south / latStep);
      const k1 = Math.floor(north / latStep);
      for (let k = k0; k <= k1 && k - k0 < MAX_LINES_PER_AXIS; k++) {
        const lat = Number((k * latStep).toFixed(d));
        L.polyline(
          [
            [lat, west],
            [lat, east],
          ],
          style,
        ).addTo(this.lines);
        this.addLabel('lat', lat, format(lat, 'lat', latStep));
      }
    }
    if (lonStep > 0) {
      const d = intervalDecimals(lonStep);
      const k0 = Math.ceil(west / lonStep);
      const k1 = Math.floor(east / lonStep);
      for (let k = k0; k <= k1 && k - k0 < MAX_LINES_PER_AXIS; k++) {
        const lon = Number((k * lonStep).toFixed(d));
        L.polyline(
          [
            [south, lon],
            [north, lon],
          ],
          style,
        ).addTo(this.lines);
        this.addLabel('lon', lon, format(Number(wrapLon(lon).toFixed(d)), 'lon', lonStep));
      }
    }
    this.place();
  }

  private addLabel(axis: 'lat' | 'lon', value: number, text: string): void {
    if (!this.labelBox) return;
    const el = L.DomUtil.create('div', `seedfall-graticule-label ${axis}`, this.labelBox);
    const span = L.DomUtil.create('span', '', el);
    span.textContent = text;
    Object.assign(el.style, { position: 'absolute', left: '0', top: '0' });
    Object.assign(span.style, {
      display: 'inline-block',
      whiteSpace: 'nowrap',
      font: '11px/1.2 system-ui, sans-serif',
      color: '#1f2328',
      // A light halo keeps the text readable over lines and filled areas.
      textShadow: '0 0 2px #fff, 0 0 2px #fff, 0 0 3px #fff, 0 0 4px #fff',
      transform: axis === 'lat' ? 'translate(3px, -50%)' : 'translate(-50%, calc(-100% - 3px))',
    });
    this.labels.push({ el, axis, value });
  }

  // Labels stay on the view's left and bottom edges while the pane moves with the map.
  private place(): void {
    const map = this.map;
    if (!map) return;
    const size = map.getSize();
    const topLeft = map.containerPointToLayerPoint([0, 0]);
    const bottomRight = map.containerPointToLayerPoint([size.x, size.y]);
    const centre = map.getCenter();
    for (const label of this.labels) {
      const p =
        label.axis === 'lat'
          ? L.point(topLeft.x, map.latLngToLayerPoint([label.value, centre.lng]).y)
          : L.point(map.latLngToLayerPoint([centre.lat, label.value]).x, bottomRight.y);
      // Hide labels that would sit in the bottom-left corner where both axes meet, or off view.
      const hidden =
        label.axis === 'lat'
          ? p.y < topLeft.y + 8 || p.y > bottomRight.y - 22
          : p.x < topLeft.x + 56 || p.x > bottomRight.x - 8;
      label.el.style.display = hidden ? 'none' : '';
      L.DomUtil.setPosition(label.el, p);
    }
    this.hideUnderControls(map);
  }

  // Hide labels that a control (zoom buttons, scale bar, attribution, the app's own) covers.
  // All rectangles are read before any style is written, so this costs one layout per move.
  private hideUnderControls(map: L.Map): void {
    const controls = [...map.getContainer().querySelectorAll('.leaflet-control')]
      .map((e) => e.getBoundingClientRect())
      .filter((r) => r.width > 0 && r.height > 0);
    if (controls.length === 0) return;
    const shown = this.labels.filter((l) => l.el.style.display !== 'none');
    const rects = shown.map((l) => (l.el.firstElementChild ?? l.el).getBoundingClientRect());
    shown.forEach((label, i) => {
      const a = rects[i];
      const covered = controls.some(
        (b) => a.left < b.right && b.left < a.right && a.top < b.bottom && b.top < a.bottom,
      );
      if (covered) label.el.style.display = 'none';
    });
  }
}

/** Factory in Leaflet's style: graticule(options).addTo(map). */
export function graticule(options?: GraticuleOptions): Graticule {
  return new Graticule(options);
}
