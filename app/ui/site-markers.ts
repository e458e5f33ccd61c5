/** The sites on the map: a draggable marker each, labelled with its id, coloured by its result. */
import L from 'leaflet';
import { siteIcon, siteMarker, lazyTip } from '../map';
import type { Site } from '../plan';
import { pHitText, type SiteResult } from '../planner';
import { dragPointTo, shownPosition } from './map-position';
import type { MarkerDrag } from './marker-drag';
import type { PlanStore } from './plan-store';
import { formatLength } from './units';

/** The site markers (by row index in the plan's site list) on their own layer. */
export class SiteMarkers {
  private readonly layer = L.layerGroup();
  private readonly markers = new Map<number, L.Marker>();
  /** What each marker shows (icon label and status, tooltip text), to skip what is unchanged. */
  private readonly drawn = new Map<number, { icon: string; tip: string }>();

  constructor(
    private readonly store: () => PlanStore,
    private readonly drag: MarkerDrag,
  ) {}

  addTo(map: L.Map): this {
    this.layer.addTo(map);
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
    sites.forEach((site, i) => {
      const at = shownPosition(s, `sites[${i}]`);
      if (!at) return;
      const r = byId.get(String(site.id));
      const bad = r ? !r.meetsRequired : false;
      const label = String(site.id ?? '');
      const tipText = r
        ? `Site ${label}${site.name ? ` · ${site.name}` : ''} — ${r.variant}, P(hit) ${pHitText(r.pHit, r.pHitSE)}, CEP ${formatLength(r.cep_m, u.length, 1)}, ${r.reachable ? 'reachable' : 'not reachable'}`
        : `Site ${label}`;
      const iconKey = `${bad ? 'bad' : 'ok'}|${label}`;
      let m = this.markers.get(i);
      const drawn = this.drawn.get(i);
      if (!m) {
        const marker = siteMarker([at.lat, at.lon], label, bad).addTo(this.layer);
        this.drag.wire(marker, {
          move: () => dragPointTo(this.store(), `sites[${i}]`, marker.getLatLng()),
        });
        this.markers.set(i, marker);
        m = marker;
      } else {
        const ll = m.getLatLng();
        if (ll.lat !== at.lat || ll.lng !== at.lon) m.setLatLng([at.lat, at.lon]);
        if (drawn?.icon !== iconKey) m.setIcon(siteIcon(label, bad));
      }
      if (drawn?.icon !== iconKey) {
        m.getElement()?.setAttribute('data-site', label);
        m.getElement()?.setAttribute('aria-label', `Site ${label}`);
      }
      if (drawn?.tip !== tipText) {
        // Site ids and names come from files: the tooltip is text nodes, built when it opens.
        m.unbindTooltip().bindTooltip(lazyTip(tipText), { direction: 'top', offset: [0, -8] });
      }
      this.drawn.set(i, { icon: iconKey, tip: tipText });
    });
  }
}
