/**
 * The sites on the map: a draggable marker each, labelled with its id, coloured by its result.
 * Labels are placed so that none overlaps another or a marker (map/layout.ts placeLabels); a
 * label moved away from its marker gets a short leader line, and one with no free place is
 * hidden at this zoom and shown while its marker is pointed at. A click selects the site.
 */
import L from 'leaflet';
import { lazyTip, placeLabels, siteIcon, siteMarker, type LabelRequest } from '../map';
import type { Site } from '../plan';
import { pHitText, type SiteResult } from '../planner';
import { dragPointTo, shownPosition } from './map-position';
import type { MarkerDrag } from './marker-drag';
import type { PlanStore } from './plan-store';
import { formatQuantity } from './units';

/** The site dot's size and the label's font and line height (plan-mark-styles.ts). */
const DOT_PX = 14;
const LABEL_FONT = '600 12px system-ui, sans-serif';
const LABEL_HEIGHT_PX = 15;
/** Markers this far outside the view still get a place, so a short pan shows labels. */
const VIEW_MARGIN_PX = 100;

/** What the markers tell the map. */
export interface SiteMarkerEvents {
  /** The pointer came onto a site's marker (its id), or left it (null). */
  hover(id: string | null): void;
}

/** The site markers (by row index in the plan's site list) on their own layer. */
export class SiteMarkers {
  private readonly layer = L.layerGroup();
  private readonly markers = new Map<number, L.Marker>();
  /** What each marker shows (icon label and status, tooltip text), to skip what is unchanged. */
  private readonly drawn = new Map<number, { icon: string; tip: string }>();
  private readonly widths = new Map<string, number>();
  private measure?: CanvasRenderingContext2D | null;
  private map?: L.Map;
  private selected: string | null = null;

  constructor(
    private readonly store: () => PlanStore,
    private readonly drag: MarkerDrag,
    private readonly events: SiteMarkerEvents,
  ) {}

  addTo(map: L.Map): this {
    this.map = map;
    this.layer.addTo(map);
    map.on('zoomend moveend resize', () => this.layoutLabels());
    return this;
  }

  /** Centres the map on the site with this id (zoomed in to at least 17) and opens its tooltip. */
  focus(map: L.Map | undefined, id: string): void {
    const sites = this.store().rows<Site>('sites');
    const i = sites.findIndex((s) => s.id === id);
    const m = this.markers.get(i);
    if (!map || !m) return;
    map.setView(m.getLatLng(), Math.max(map.getZoom(), 17));
    m.openTooltip();
  }

  /** Marks the selected site's marker (class `selected`) and gives its label the first place. */
  select(id: string | null): void {
    this.selected = id;
    const sites = this.store().rows<Site>('sites');
    for (const [i, m] of this.markers) {
      m.getElement()?.classList.toggle('selected', id !== null && String(sites[i]?.id) === id);
    }
    this.layoutLabels();
  }

  /**
   * Site markers in line with the draft and the result. Only what changed is touched: a marker's
   * icon is rebuilt when its label or status changes and its tooltip when its text does, so a
   * store change (a progress tick, an edit) costs one pass over the sites, not a rebuild of every
   * marker with its DOM and listeners.
   */
  sync(): void {
    const s = this.store();
    const sites = s.rows<Site>('sites');
    const result = s.result;
    const byId = new Map<string, SiteResult>();
    for (const r of result?.sites ?? []) if (!byId.has(r.id)) byId.set(r.id, r);
    for (const [i, m] of this.markers) {
      if (i >= sites.length) {
        m.remove();
        this.markers.delete(i);
        this.drawn.delete(i);
      }
    }
    const u = s.settings.units;
    let changed = false;
    sites.forEach((site, i) => {
      const at = shownPosition(s, `sites[${i}]`);
      if (!at) return;
      const r = byId.get(String(site.id));
      const bad = r ? !r.meetsRequired : false;
      const label = String(site.id ?? '');
      const tipText = r
        ? `Site ${label}${site.name ? ` · ${site.name}` : ''} — ${r.variant}, P(hit) ${pHitText(r.pHit, r.pHitSE)}, CEP ${formatQuantity(r.cep_m, 'distance', u)}, ${r.reachable ? 'reachable' : 'not reachable'}`
        : `Site ${label}`;
      const iconKey = `${bad ? 'bad' : 'ok'}|${label}`;
      let m = this.markers.get(i);
      const drawn = this.drawn.get(i);
      if (!m) {
        const marker = siteMarker([at.lat, at.lon], label, bad).addTo(this.layer);
        this.drag.wire(marker, {
          move: () => dragPointTo(this.store(), `sites[${i}]`, marker.getLatLng()),
        });
        const idNow = (): string | null => {
          const row = this.store().rows<Site>('sites')[i];
          return row ? String(row.id ?? '') : null;
        };
        marker.on('click', () => this.store().selectSite(idNow()));
        marker.on('mouseover', () => this.events.hover(idNow()));
        marker.on('mouseout', () => this.events.hover(null));
        this.markers.set(i, marker);
        m = marker;
        changed = true;
      } else {
        const ll = m.getLatLng();
        if (ll.lat !== at.lat || ll.lng !== at.lon) {
          m.setLatLng([at.lat, at.lon]);
          changed = true;
        }
        if (drawn?.icon !== iconKey) {
          m.setIcon(siteIcon(label, bad));
          changed = true;
        }
      }
      if (drawn?.icon !== iconKey) {
        const el = m.getElement();
        el?.setAttribute('data-site', label);
        // Not a tab stop (the map is): an image named after its site.
        el?.setAttribute('role', 'img');
        el?.setAttribute('aria-label', `Site ${label}`);
        el?.classList.toggle('selected', label === this.selected);
      }
      if (drawn?.tip !== tipText) {
        // Site ids and names come from files: the tooltip is text nodes, built when it opens.
        m.unbindTooltip().bindTooltip(lazyTip(tipText), { direction: 'top', offset: [0, -8] });
      }
      this.drawn.set(i, { icon: iconKey, tip: tipText });
    });
    if (changed) this.layoutLabels();
  }

  /** Label width in pixels, measured once per text without a page layout. */
  private labelWidth(text: string): number {
    let w = this.widths.get(text);
    if (w === undefined) {
      if (this.measure === undefined)
        this.measure = document.createElement('canvas').getContext('2d');
      if (this.measure) this.measure.font = LABEL_FONT;
      // A little over the text, for the halo; 7 px a character where no canvas is at hand.
      w = Math.ceil((this.measure?.measureText(text).width ?? text.length * 7) + 4);
      if (this.widths.size > 5000) this.widths.clear();
      this.widths.set(text, w);
    }
    return w;
  }

  /**
   * Places every label in view (map/layout.ts placeLabels), the selected site's first, then in
   * plan order; the rest are hidden (class `off`) until their marker is pointed at.
   */
  layoutLabels(): void {
    const map = this.map;
    if (!map || this.drag.active) return;
    const size = map.getSize();
    const sites = this.store().rows<Site>('sites');
    const entries: { el: HTMLElement; req: LabelRequest; first: boolean }[] = [];
    const hidden: HTMLElement[] = [];
    for (const [i, m] of this.markers) {
      const label = m.getElement()?.querySelector<HTMLElement>('.site-label');
      if (!label) continue;
      const p = map.latLngToContainerPoint(m.getLatLng());
      const inView =
        p.x > -VIEW_MARGIN_PX &&
        p.y > -VIEW_MARGIN_PX &&
        p.x < size.x + VIEW_MARGIN_PX &&
        p.y < size.y + VIEW_MARGIN_PX;
      if (!inView) {
        hidden.push(label);
        continue;
      }
      const text = label.textContent ?? '';
      entries.push({
        el: label,
        req: { x: p.x, y: p.y, width: this.labelWidth(text), height: LABEL_HEIGHT_PX },
        first: this.selected !== null && String(sites[i]?.id) === this.selected,
      });
    }
    entries.sort((a, b) => Number(b.first) - Number(a.first));
    const places = placeLabels(
      entries.map((e) => e.req),
      { markerSize: DOT_PX },
    );
    const c = DOT_PX / 2;
    entries.forEach(({ el, req }, k) => {
      const place = places[k];
      const leader = el.previousElementSibling as HTMLElement | null;
      if (!place) {
        hidden.push(el);
        return;
      }
      el.classList.remove('off');
      el.style.left = `${c + place.dx}px`;
      el.style.top = `${c + place.dy}px`;
      if (leader?.classList.contains('site-leader')) {
        if (place.leader) {
          // From the dot's edge to the nearest point of the label box.
          const nx = Math.max(place.dx, Math.min(0, place.dx + req.width));
          const ny = Math.max(place.dy, Math.min(0, place.dy + req.height));
          const len = Math.hypot(nx, ny);
          leader.style.display = 'block';
          leader.style.width = `${Math.max(0, len - c)}px`;
          leader.style.transform = `rotate(${Math.atan2(ny, nx)}rad) translateX(${c}px)`;
        } else leader.style.display = '';
      }
    });
    for (const el of hidden) {
      el.classList.add('off');
      el.style.left = el.style.top = '';
      const leader = el.previousElementSibling as HTMLElement | null;
      if (leader?.classList.contains('site-leader')) leader.style.display = '';
    }
  }
}
