/**
 * Positions on the map: where a plan path's point is drawn, a dropped point in plan degrees, and
 * the readout of the position and ground height under the cursor.
 */
import L from 'leaflet';
import { getAt } from './paths';
import type { PlanStore } from './plan-store';
import { formatCoord, formatQuantity } from './units';

/** The value when it is a finite number, else null. */
export const finite = (v: unknown): number | null =>
  typeof v === 'number' && Number.isFinite(v) ? v : null;

/**
 * Position at a plan path (`release`, `sites[3]`): the draft's, unless its lat or lon has a
 * problem (out of range, unreadable), then the last valid plan's so nothing jumps off the map.
 */
export function shownPosition(store: PlanStore, path: string): { lat: number; lon: number } | null {
  const bad = store.messageAt(`${path}.lat`) || store.messageAt(`${path}.lon`);
  const src: unknown = bad ? store.plan : store.draft;
  const lat = finite(getAt(src, `${path}.lat`));
  const lon = finite(getAt(src, `${path}.lon`));
  return lat === null || lon === null ? null : { lat, lon };
}

/** A point on the map as the plan stores it: degrees rounded to 7 decimals (about 1 cm). */
export function planLatLon(p: L.LatLng): { lat: number; lon: number } {
  return { lat: +p.lat.toFixed(7), lon: +p.lng.toFixed(7) };
}

/** Moves the point at a plan path to where its marker is while it is dragged (no undo step yet). */
export function dragPointTo(store: PlanStore, path: string, p: L.LatLng): void {
  const cur = (store.get(path) as Record<string, unknown>) ?? {};
  store.edit(path, { ...cur, ...planLatLon(p) }, { transient: true });
}

/**
 * The position under the cursor in the bottom-right corner of the map, in the chosen coordinate
 * format, with the ground's height there when an elevation model is loaded ("no height" outside
 * it). Updated at most once per animation frame however fast the pointer moves.
 */
export class CursorReadout {
  private el: HTMLElement | undefined;
  private at: L.LatLng | null = null;
  private frame = 0;

  constructor(private readonly store: () => PlanStore | undefined) {}

  addTo(map: L.Map): this {
    const Control = L.Control.extend({
      onAdd: () => {
        const el = L.DomUtil.create('div', 'sf-cursor leaflet-control');
        el.dataset.testid = 'cursor-readout';
        el.setAttribute('aria-live', 'off');
        el.hidden = true;
        this.el = el;
        return el;
      },
    });
    new Control({ position: 'bottomright' }).addTo(map);
    map.on('mousemove', (e: L.LeafletMouseEvent) => this.point(e.latlng));
    map.on('mouseout', () => this.point(null));
    return this;
  }

  /** Shows the point (null: the cursor left the map) on the next frame. */
  point(at: L.LatLng | null): void {
    this.at = at;
    if (this.frame) return;
    this.frame = requestAnimationFrame(() => {
      this.frame = 0;
      this.show();
    });
  }

  /** Writes the readout now (also when the units or the model change). */
  show(): void {
    const el = this.el;
    const s = this.store();
    if (!el || !s) return;
    const p = this.at;
    el.hidden = p === null;
    if (!p) return;
    const units = s.settings.units;
    const ll = { lat: p.lat, lon: L.Util.wrapNum(p.lng, [-180, 180], true) };
    let text = formatCoord(ll, units.coords);
    if (s.dem) {
      const h = s.dem.sample(ll);
      text += h === null ? ' · no height' : ` · ground ${formatQuantity(h, 'height', units)}`;
    }
    el.textContent = text;
  }
}
