/**
 * The focused map's keys. The map is one tab stop (no mark on it is one); with a site selected,
 * the arrow keys move that site, Enter opens its details and Escape lets it go; with none, the
 * arrow keys pan the map as Leaflet does.
 */
import type L from 'leaflet';
import type { Site } from '../plan';
import { dragPointTo, shownPosition } from './map-position';
import type { PlanStore } from './plan-store';

/** Screen pixels one arrow key press moves the selected site; with Shift, 1. */
export const KEY_STEP_PX = 10;

/** The map's keys in words: its accessible description and the hint shown while it has focus. */
export const MAP_KEYS_HELP =
  'Arrow keys pan the map; + and − zoom. With a site selected (its marker or its results row), ' +
  `arrow keys move it ${KEY_STEP_PX} screen pixels (with Shift 1 pixel), one undo step per ` +
  'key press or hold; Enter opens its details; Escape clears the selection.';

const ARROWS: Record<string, [number, number]> = {
  ArrowLeft: [-1, 0],
  ArrowRight: [1, 0],
  ArrowUp: [0, -1],
  ArrowDown: [0, 1],
};

/** Keyboard handling of the selected site on the focused map. */
export class MapKeys {
  /** Transient moves made since the last undo step. */
  private moved = false;

  /** `open` asks the app to show the site's details (and give them the focus). */
  constructor(
    private readonly store: () => PlanStore | undefined,
    private readonly open: (id: string) => void,
  ) {}

  addTo(map: L.Map): this {
    const el = map.getContainer();
    // Capture runs before Leaflet's own keydown listener on the same element, so a key used
    // here stops there (no panning while a site moves).
    el.addEventListener('keydown', (e) => this.onKeyDown(map, e), true);
    // Held keys repeat: the moves of one press or hold become one undo step when it is let go.
    el.addEventListener('keyup', (e) => {
      if (e.key in ARROWS) this.settle();
    });
    el.addEventListener('blur', () => this.settle());
    return this;
  }

  private onKeyDown(map: L.Map, e: KeyboardEvent): void {
    // A press on a mark makes Leaflet hide the map's focus outline until a key reaches the
    // window; the keys used here (and Leaflet's own) stop before it, so it comes back now.
    if (e.target === map.getContainer()) map.getContainer().style.outlineStyle = '';
    const s = this.store();
    const id = s?.selectedSite ?? null;
    // Only the map itself: a key on one of its controls (zoom buttons) is that control's.
    if (!s || id === null || e.target !== map.getContainer()) return;
    if (e.altKey || e.ctrlKey || e.metaKey) return;
    if (e.key in ARROWS) {
      const i = s.rows<Site>('sites').findIndex((x) => x.id === id);
      const path = `sites[${i}]`;
      const at = i < 0 ? null : shownPosition(s, path);
      if (!at) return;
      e.preventDefault();
      e.stopImmediatePropagation();
      const step = e.shiftKey ? 1 : KEY_STEP_PX;
      const [dx, dy] = ARROWS[e.key];
      // Unrounded world pixels at the current zoom (container points are whole pixels).
      const zoom = map.getZoom();
      const to = map.unproject(
        map.project([at.lat, at.lon], zoom).add([dx * step, dy * step]),
        zoom,
      );
      dragPointTo(s, path, to);
      this.moved = true;
      const p = map.latLngToContainerPoint(to);
      const size = map.getSize();
      if (p.x < 0 || p.y < 0 || p.x > size.x || p.y > size.y) map.panTo(to);
    } else if (e.key === 'Enter') {
      e.preventDefault();
      e.stopImmediatePropagation();
      this.settle();
      this.open(id);
    } else if (e.key === 'Escape') {
      e.preventDefault();
      e.stopImmediatePropagation();
      this.settle();
      s.selectSite(null);
      // The details view gives the focus back to where it came from; the map keeps it here.
      map.getContainer().focus({ preventScroll: true });
    }
  }

  /** Makes the moves so far one undo step. */
  private settle(): void {
    if (!this.moved) return;
    this.moved = false;
    this.store()?.commit();
  }
}
