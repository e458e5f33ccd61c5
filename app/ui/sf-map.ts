import L from 'leaflet';
import leafletCss from 'leaflet/dist/leaflet.css?inline';
import { LitElement, css, html, unsafeCSS } from 'lit';
import { customElement, property, state } from 'lit/decorators.js';
import { styleMap } from 'lit/directives/style-map.js';
import { bearingDeg, distance_m } from '../model';
import type { Site, Variant } from '../plan';
import type { SiteResult } from '../planner';
import { formatCoord, formatLength } from './units';
import {
  bearingHandle,
  buildResultLayers,
  DEFAULT_VISIBILITY,
  escapeHtml,
  Graticule,
  type LayerVisibility,
  SHAPE_KINDS,
  type ShapeKind,
  lazyTip,
  tipNode,
  trackSegment,
} from '../map';
import { getAt } from './paths';
import type { PlanStore } from './plan-store';
import { nextSiteId } from './sf-sites-panel';
import { sharedStyles, VARIANT_COLOURS } from './shared-styles';
import { StoreController } from './store-controller';

/** The track handle sits where the carrier will be this many seconds after the release point. */
const HANDLE_SECONDS = 10;
/** Handle movement toward or away from the release point (m) that still counts as turning only. */
const HANDLE_SLACK_M = 10;
const KIND_LABEL: Record<ShapeKind, string> = {
  reach: 'Reach areas',
  landing: 'Uncontrolled landings',
  ellipse50: '50 % ellipses',
  ellipse95: '95 % ellipses',
  window: 'Release windows',
  zone: 'Hover zones',
};

const num = (v: unknown): number | null => (typeof v === 'number' && Number.isFinite(v) ? v : null);

/** Leaflet rings of a stored polygon's [lon, lat] coordinates, or null when they are not that. */
function zoneRings(c: unknown): L.LatLngTuple[][] | null {
  if (!Array.isArray(c) || c.length === 0) return null;
  const rings: L.LatLngTuple[][] = [];
  for (const ring of c) {
    if (!Array.isArray(ring)) return null;
    const pts: L.LatLngTuple[] = [];
    for (const p of ring) {
      const [lon, lat] = Array.isArray(p) ? [num(p[0]), num(p[1])] : [null, null];
      if (lon === null || lat === null) return null;
      pts.push([lat, lon]);
    }
    rings.push(pts);
  }
  return rings;
}

/** A site's marker icon; its id comes from a file, so the label is a text node, never HTML. */
function siteIcon(label: string, bad: boolean): L.DivIcon {
  // The label sits inside the dot, which is not positioned, so it is still placed against the
  // icon box.
  const dot = document.createElement('div');
  dot.className = bad ? 'site-dot bad' : 'site-dot';
  const text = document.createElement('span');
  text.className = 'site-label';
  text.textContent = label;
  dot.append(text);
  return L.divIcon({ className: `sf-site-icon sf-site`, html: dot, iconSize: [14, 14] });
}

/**
 * The planning map: coordinate grid and scale (no tiles needed; a tile URL can be set), the
 * release point, carrier track and its handle, the sites (all draggable), and the results.
 */
@customElement('sf-map')
export class SfMap extends LitElement {
  static styles = [
    unsafeCSS(leafletCss),
    sharedStyles,
    css`
      :host {
        display: flex;
        flex-direction: column;
        min-height: 0;
      }
      .bar {
        display: flex;
        flex-wrap: wrap;
        gap: 4px 12px;
        align-items: center;
        padding: 4px 8px;
        background: var(--sf-panel);
        border-bottom: 1px solid var(--sf-line);
        font-size: 13px;
      }
      .bar label {
        display: inline-flex;
        gap: 4px;
        align-items: center;
        white-space: nowrap;
      }
      .swatch {
        width: 10px;
        height: 10px;
        border-radius: 2px;
        display: inline-block;
      }
      .adding {
        background: #0f766e;
        color: #fff;
        border-color: #0f766e;
      }
      #map {
        flex: 1;
        min-height: 300px;
        background: #f3f4ef;
      }
      #map.add-mode {
        cursor: crosshair;
      }
      .sf-site-icon,
      .sf-release-icon,
      .sf-handle-icon {
        background: none;
        border: none;
      }
      .site-dot {
        width: 14px;
        height: 14px;
        border-radius: 50%;
        background: #fff;
        border: 3px solid #1a7f37;
        box-sizing: border-box;
        box-shadow: 0 0 0 1px #fff;
      }
      .site-dot.bad {
        border-color: #b42318;
      }
      .site-label {
        position: absolute;
        left: 16px;
        top: -3px;
        font:
          600 12px system-ui,
          sans-serif;
        color: #1c2b27;
        text-shadow:
          0 0 3px #fff,
          0 0 3px #fff,
          0 0 2px #fff;
        white-space: nowrap;
      }
      .release-mark {
        width: 20px;
        height: 20px;
        transform: rotate(45deg);
        background: #1c2b27;
        border: 3px solid #fff;
        box-sizing: border-box;
        box-shadow: 0 0 0 1px #1c2b27;
      }
      .handle-mark {
        width: 14px;
        height: 14px;
        border-radius: 3px;
        background: #fff;
        border: 3px solid #1c2b27;
        box-sizing: border-box;
      }
      .leaflet-tooltip {
        font:
          12px/1.35 system-ui,
          sans-serif;
      }
    `,
  ];

  @property({ attribute: false }) store?: PlanStore;
  @state() private vis: LayerVisibility = structuredClone(DEFAULT_VISIBILITY);
  @state() private addMode = false;
  @state() private drawMode = false;
  @state() private drawPts: L.LatLng[] = [];
  @state() private showHazard = true;

  private map?: L.Map;
  private resultLayer?: L.LayerGroup;
  private tileLayer?: L.TileLayer;
  private tileUrl = '';
  private tileAttribution = '';
  private releaseMarker?: L.Marker;
  private handleMarker?: L.Marker;
  private trackLine?: L.Polyline;
  private siteLayer = L.layerGroup();
  private siteMarkers = new Map<number, L.Marker>();
  /** What each site marker shows (icon label and status, tooltip text), to skip what is unchanged. */
  private siteDrawn = new Map<number, { icon: string; tip: string }>();
  private dragging = false;
  private drawnResult: unknown = null;
  private drawnVis = '';
  private drawnUnits = '';
  private fitted = false;
  private safetyLayer?: L.LayerGroup;
  private drawnSafety: unknown = null;
  private drawnZones = '';
  private drawLine?: L.Polyline;

  constructor() {
    super();
    new StoreController(this, () => this.store);
  }

  connectedCallback(): void {
    super.connectedCallback();
    this.store?.addEventListener('focus-site', this.onFocus);
  }

  disconnectedCallback(): void {
    this.store?.removeEventListener('focus-site', this.onFocus);
    super.disconnectedCallback();
  }

  private readonly onFocus = (e: Event): void => {
    const id = (e as CustomEvent<string>).detail;
    const sites = (this.store?.get('sites') as Site[] | undefined) ?? [];
    const i = sites.findIndex((s) => s.id === id);
    const m = this.siteMarkers.get(i);
    if (!this.map || !m) return;
    this.map.setView(m.getLatLng(), Math.max(this.map.getZoom(), 17));
    m.openTooltip();
  };

  firstUpdated(): void {
    const el = this.renderRoot.querySelector('#map') as HTMLElement;
    const map = L.map(el, { zoomControl: true, attributionControl: true, zoomSnap: 0.25 });
    this.map = map;
    map.attributionControl.setPrefix('Seedfall · coordinate grid WGS 84');
    this.fit();
    new Graticule().addTo(map);
    L.control.scale({ metric: true, imperial: true, position: 'bottomleft' }).addTo(map);
    this.siteLayer.addTo(map);
    map.on('click', (e: L.LeafletMouseEvent) => this.onMapClick(e));
    new ResizeObserver(() => map.invalidateSize()).observe(el);
    this.sync();
  }

  updated(): void {
    this.sync();
  }

  /** Fits the view to the release point and the sites (once, on first valid data). */
  private fit(): void {
    const s = this.store;
    if (!s || !this.map) return;
    const pts: L.LatLngTuple[] = [];
    const lat = num(s.get('release.lat'));
    const lon = num(s.get('release.lon'));
    if (lat !== null && lon !== null) pts.push([lat, lon]);
    for (const site of s.rows<Site>('sites')) {
      const [la, lo] = [num(site.lat), num(site.lon)];
      if (la !== null && lo !== null) pts.push([la, lo]);
    }
    if (pts.length === 0) {
      this.map.setView([0, 0], 2);
      return;
    }
    if (pts.length === 1) this.map.setView(pts[0], 16);
    else this.map.fitBounds(L.latLngBounds(pts).pad(0.25));
    this.fitted = true;
  }

  /**
   * Position at a plan path (`release`, `sites[3]`): the draft's, unless its lat or lon has a
   * problem (out of range, unreadable), then the last valid plan's so nothing jumps off the map.
   */
  private position(path: string): { lat: number; lon: number } | null {
    const s = this.store!;
    const bad = s.messageAt(`${path}.lat`) || s.messageAt(`${path}.lon`);
    const src: unknown = bad ? s.plan : s.draft;
    const lat = num(getAt(src, `${path}.lat`));
    const lon = num(getAt(src, `${path}.lon`));
    return lat === null || lon === null ? null : { lat, lon };
  }

  /** Brings the Leaflet layers in line with the store. */
  private sync(): void {
    const s = this.store;
    const map = this.map;
    if (!s || !map) return;
    if (!this.fitted) this.fit();
    this.syncTiles();
    if (!this.dragging) {
      this.syncRelease();
      this.syncSites();
    }
    this.syncResults();
    this.syncSafety();
  }

  private syncTiles(): void {
    const { tileUrl, tileAttribution } = this.store!.settings;
    if (tileUrl === this.tileUrl && tileAttribution === this.tileAttribution) return;
    this.tileUrl = tileUrl;
    this.tileAttribution = tileAttribution;
    this.tileLayer?.remove();
    this.tileLayer = undefined;
    if (tileUrl) {
      // Leaflet's attribution control inserts HTML; the typed attribution is shown as text.
      this.tileLayer = L.tileLayer(tileUrl, {
        attribution: escapeHtml(tileAttribution),
        maxZoom: 22,
        maxNativeZoom: 19,
      });
      this.tileLayer.addTo(this.map!);
    }
  }

  private syncRelease(): void {
    const s = this.store!;
    const map = this.map!;
    const rp = this.position('release');
    if (!rp) return;
    const { lat, lon } = rp;
    const trackDeg = num(s.get('carrier.trackDeg')) ?? 0;
    const speed = num(s.get('carrier.groundSpeed_mps')) ?? 0;
    if (!this.releaseMarker) {
      this.releaseMarker = L.marker([lat, lon], {
        draggable: true,
        keyboard: true,
        title: 'Release point (drag to move)',
        icon: L.divIcon({
          className: 'sf-release-icon sf-release',
          html: '<div class="release-mark"></div>',
          iconSize: [20, 20],
        }),
        zIndexOffset: 1000,
      }).addTo(map);
      this.releaseMarker.on('dragstart', () => (this.dragging = true));
      this.releaseMarker.on('drag', () => {
        const p = this.releaseMarker!.getLatLng();
        const rel = (this.store!.get('release') as Record<string, unknown>) ?? {};
        this.store!.edit(
          'release',
          { ...rel, lat: +p.lat.toFixed(7), lon: +p.lng.toFixed(7) },
          { transient: true },
        );
        this.placeTrack();
      });
      this.releaseMarker.on('dragend', () => this.endDrag());
    } else {
      this.releaseMarker.setLatLng([lat, lon]);
    }
    this.releaseMarker
      .unbindTooltip()
      .bindTooltip(
        tipNode([
          `Release point · ${formatCoord(rp, s.settings.units.coords)}`,
          speed > 0
            ? `carrier ${speed.toFixed(1)} m/s on ${Math.round(trackDeg)}° true`
            : 'carrier hovering',
        ]),
      );
    this.placeTrack();
  }

  /** Track line and handle from the current draft. */
  private placeTrack(): void {
    const s = this.store!;
    const map = this.map!;
    const rp = this.position('release');
    if (!rp) return;
    const trackDeg = num(s.get('carrier.trackDeg')) ?? 0;
    const speed = num(s.get('carrier.groundSpeed_mps')) ?? 0;
    const len = Math.max(40, speed * HANDLE_SECONDS);
    const line = trackSegment(
      rp,
      trackDeg,
      1,
      -Math.max(400, speed * 40),
      Math.max(400, speed * 40),
    );
    if (!this.trackLine) {
      this.trackLine = L.polyline(line, {
        color: '#1c2b27',
        weight: 1.5,
        dashArray: '10 6',
        className: 'sf-track',
        interactive: false,
      }).addTo(map);
    } else this.trackLine.setLatLngs(line);
    const hp = bearingHandle(rp, trackDeg, len);
    if (!this.handleMarker) {
      this.handleMarker = L.marker(hp, {
        draggable: true,
        title: `Carrier track handle: drag to set the track; its distance is ${HANDLE_SECONDS} s of flight`,
        icon: L.divIcon({
          className: 'sf-handle-icon sf-track-handle',
          html: '<div class="handle-mark"></div>',
          iconSize: [14, 14],
        }),
        zIndexOffset: 900,
      }).addTo(map);
      let startDist = 0;
      const releaseNow = () => ({
        lat: num(this.store!.get('release.lat')) ?? 0,
        lon: num(this.store!.get('release.lon')) ?? 0,
      });
      this.handleMarker.on('dragstart', () => {
        this.dragging = true;
        const p = this.handleMarker!.getLatLng();
        startDist = distance_m(releaseNow(), { lat: p.lat, lon: p.lng });
      });
      this.handleMarker.on('drag', () => {
        const st = this.store!;
        const r = releaseNow();
        const p = this.handleMarker!.getLatLng();
        const h = { lat: p.lat, lon: p.lng };
        const d = distance_m(r, h);
        const carrier = (st.get('carrier') as Record<string, unknown>) ?? {};
        // Turning the handle sets the track only; pulling it in or out by more than HANDLE_SLACK_M
        // also sets the speed (distance = HANDLE_SECONDS of flight; under 20 m means hover).
        const oldSpeed = num(carrier.groundSpeed_mps) ?? 0;
        const speed_mps =
          Math.abs(d - startDist) <= HANDLE_SLACK_M
            ? oldSpeed
            : d < 20
              ? 0
              : Math.round((d / HANDLE_SECONDS) * 10) / 10;
        st.edit(
          'carrier',
          {
            ...carrier,
            trackDeg: (Math.round(bearingDeg(r, h) * 10) / 10) % 360,
            groundSpeed_mps: speed_mps,
          },
          { transient: true },
        );
        this.trackLine?.setLatLngs(trackSegment(r, bearingDeg(r, h), 1, -400, 400));
      });
      this.handleMarker.on('dragend', () => this.endDrag());
    } else if (!this.dragging) this.handleMarker.setLatLng(hp);
  }

  private endDrag(): void {
    this.dragging = false;
    this.store?.commit();
    this.requestUpdate();
  }

  /**
   * Site markers in line with the draft and the result. Only what changed is touched: a marker's
   * icon is rebuilt when its label or status changes and its tooltip when its text does, so a
   * store change (a progress tick, an edit) costs one pass over the sites, not a rebuild of every
   * marker with its DOM and listeners.
   */
  private syncSites(): void {
    const s = this.store!;
    const sites = s.rows<Site>('sites');
    const result = s.result;
    const byId = new Map<string, SiteResult>();
    for (const r of result?.sites ?? []) if (!byId.has(r.id)) byId.set(r.id, r);
    for (const [i, m] of this.siteMarkers) {
      if (i >= sites.length) {
        m.remove();
        this.siteMarkers.delete(i);
        this.siteDrawn.delete(i);
      }
    }
    const u = s.settings.units;
    sites.forEach((site, i) => {
      const at = this.position(`sites[${i}]`);
      if (!at) return;
      const r = byId.get(String(site.id));
      const bad = r ? !r.meetsRequired : false;
      const label = String(site.id ?? '');
      const tipText = r
        ? `Site ${label}${site.name ? ` · ${site.name}` : ''} — ${r.variant}, P(hit) ${r.pHit.toFixed(2)}, CEP ${formatLength(r.cep_m, u.length, 1)}, ${r.reachable ? 'reachable' : 'not reachable'}`
        : `Site ${label}`;
      const iconKey = `${bad ? 'bad' : 'ok'}|${label}`;
      let m = this.siteMarkers.get(i);
      const drawn = this.siteDrawn.get(i);
      if (!m) {
        m = L.marker([at.lat, at.lon], {
          draggable: true,
          keyboard: true,
          icon: siteIcon(label, bad),
        }).addTo(this.siteLayer);
        const marker = m;
        m.on('dragstart', () => (this.dragging = true));
        m.on('drag', () => {
          const p = marker.getLatLng();
          const cur = (this.store!.get(`sites[${i}]`) as Record<string, unknown>) ?? {};
          this.store!.edit(
            `sites[${i}]`,
            { ...cur, lat: +p.lat.toFixed(7), lon: +p.lng.toFixed(7) },
            { transient: true },
          );
        });
        m.on('dragend', () => this.endDrag());
        this.siteMarkers.set(i, m);
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
      this.siteDrawn.set(i, { icon: iconKey, tip: tipText });
    });
  }

  private colour = (variantId: string): string => {
    const variants = this.store?.rows<Variant>('variants') ?? [];
    const i = Math.max(
      0,
      variants.findIndex((v) => v.id === variantId),
    );
    return VARIANT_COLOURS[i % VARIANT_COLOURS.length];
  };

  private syncResults(): void {
    const s = this.store!;
    const r = s.result;
    const visKey = JSON.stringify(this.vis);
    const unitKey = s.settings.units.length;
    if (r === this.drawnResult && visKey === this.drawnVis && unitKey === this.drawnUnits) return;
    this.drawnResult = r;
    this.drawnVis = visKey;
    this.drawnUnits = unitKey;
    this.resultLayer?.remove();
    this.resultLayer = undefined;
    if (!r) return;
    this.resultLayer = buildResultLayers(r, this.colour, this.vis, {
      length: (m) => formatLength(m, s.settings.units.length, m < 10 ? 1 : 0),
    }).addTo(this.map!);
    // Sites may have changed status colour with the new result.
    if (!this.dragging) this.syncSites();
  }

  private onMapClick(e: L.LeafletMouseEvent): void {
    if (this.drawMode) {
      this.drawPts = [...this.drawPts, e.latlng];
      return;
    }
    if (!this.addMode || !this.store) return;
    const sites = this.store.list('sites');
    this.store.edit('sites', [
      ...sites,
      {
        id: nextSiteId(this.store.rows<Site>('sites')),
        lat: +e.latlng.lat.toFixed(7),
        lon: +e.latlng.lng.toFixed(7),
      },
    ]);
  }

  /** No-drop zones (from the plan) and the hazard area (from the safety checks). */
  private syncSafety(): void {
    const s = this.store!;
    const zones = JSON.stringify(s.list('safety.noDropZones'));
    const key = `${zones}|${this.showHazard}`;
    if (s.safety === this.drawnSafety && key === this.drawnZones) {
      this.placeDrawing();
      return;
    }
    this.drawnSafety = s.safety;
    this.drawnZones = key;
    this.safetyLayer?.remove();
    const group = L.layerGroup();
    const hz = s.safety?.hazardArea;
    if (hz && this.showHazard) {
      const polys =
        hz.geometry.type === 'Polygon' ? [hz.geometry.coordinates] : hz.geometry.coordinates;
      for (const p of polys) {
        L.polygon(
          p.map((ring) => ring.map(([lon, lat]) => [lat, lon] as L.LatLngTuple)),
          {
            color: '#b42318',
            weight: 2,
            dashArray: '10 4 2 4',
            fillOpacity: 0.05,
            className: 'sf-hazard',
          },
        )
          .bindTooltip(
            tipNode([
              'Hazard area — keep people clear',
              `${(s.safety!.hazardArea_m2 / 10000).toFixed(2)} ha, ` +
                `99 % landing ellipses swept over the windows plus the ground under the releases, ` +
                `grown by ${s.safety!.settings.hazardBuffer_m} m`,
            ]),
            { sticky: true },
          )
          .addTo(group);
      }
    }
    for (const z of JSON.parse(zones) as {
      properties?: { name?: unknown };
      geometry?: { coordinates?: unknown };
    }[]) {
      // A zone of the wrong shape is not drawn; validation names it under the Safety tab.
      const rings = zoneRings(z?.geometry?.coordinates);
      if (!rings) continue;
      const tip = tipNode([`No-drop zone: ${String(z.properties?.name ?? '') || 'unnamed'}`]);
      L.polygon(rings, {
        color: '#1c2b27',
        weight: 1.5,
        fillColor: '#1c2b27',
        fillOpacity: 0.18,
        className: 'sf-nodrop',
      })
        .bindTooltip(tip, { sticky: true })
        .addTo(group);
    }
    this.safetyLayer = group.addTo(this.map!);
    this.placeDrawing();
  }

  /** The zone being drawn, as a dashed outline through the clicked corners. */
  private placeDrawing(): void {
    if (!this.drawMode || this.drawPts.length === 0) {
      this.drawLine?.remove();
      this.drawLine = undefined;
      return;
    }
    const pts = [...this.drawPts, this.drawPts[0]];
    if (!this.drawLine) {
      this.drawLine = L.polyline(pts, {
        color: '#1c2b27',
        dashArray: '4 4',
        weight: 2,
        className: 'sf-drawing',
      }).addTo(this.map!);
    } else this.drawLine.setLatLngs(pts);
  }

  private finishZone(): void {
    const s = this.store;
    if (s && this.drawPts.length >= 3) {
      const zones = s.list('safety.noDropZones');
      const ring = this.drawPts.map((p) => [+p.lng.toFixed(7), +p.lat.toFixed(7)]);
      ring.push([...ring[0]]);
      s.edit('safety.noDropZones', [
        ...zones,
        {
          type: 'Feature',
          properties: { name: `Zone ${zones.length + 1}` },
          geometry: { type: 'Polygon', coordinates: [ring] },
        },
      ]);
    }
    this.drawMode = false;
    this.drawPts = [];
  }

  private toggleKind(k: ShapeKind, on: boolean): void {
    this.vis = { ...this.vis, kinds: { ...this.vis.kinds, [k]: on } };
  }

  render() {
    const variants = this.store?.rows<Variant>('variants') ?? [];
    return html`
      <div class="bar" role="toolbar" aria-label="Map layers">
        <button
          class=${this.addMode ? 'adding' : ''}
          aria-pressed=${this.addMode ? 'true' : 'false'}
          @click=${() => {
            this.addMode = !this.addMode;
            this.drawMode = false;
            this.drawPts = [];
          }}
        >
          ${this.addMode ? 'Adding sites: click the map' : 'Add sites by clicking'}
        </button>
        <button
          class=${this.drawMode ? 'adding' : ''}
          aria-pressed=${this.drawMode ? 'true' : 'false'}
          @click=${() => {
            if (this.drawMode) this.finishZone();
            else {
              this.drawMode = true;
              this.addMode = false;
            }
          }}
        >
          ${
            this.drawMode
              ? this.drawPts.length >= 3
                ? `Finish zone (${this.drawPts.length} corners)`
                : `Click ${3 - this.drawPts.length} more corner(s)…`
              : 'Draw no-drop zone'
          }
        </button>
        ${
          this.drawMode
            ? html`<button @click=${() => ((this.drawMode = false), (this.drawPts = []))}>
                Cancel
              </button>`
            : ''
        }
        <label
          ><input
            type="checkbox"
            data-kind="hazard"
            .checked=${this.showHazard}
            @change=${(e: Event) => (this.showHazard = (e.target as HTMLInputElement).checked)}
          />Hazard area</label
        >
        ${SHAPE_KINDS.map(
          (k) =>
            html`<label
              ><input
                type="checkbox"
                data-kind=${k}
                .checked=${this.vis.kinds[k]}
                @change=${(e: Event) => this.toggleKind(k, (e.target as HTMLInputElement).checked)}
              />${KIND_LABEL[k]}</label
            >`,
        )}
        <label
          ><input
            type="checkbox"
            data-kind="chosen-only"
            .checked=${this.vis.chosenOnly}
            @change=${(e: Event) => (this.vis = { ...this.vis, chosenOnly: (e.target as HTMLInputElement).checked })}
          />Chosen variant only</label
        >
        ${variants.map(
          (v, i) =>
            html`<label
              title=${this.vis.chosenOnly ? 'Clear “Chosen variant only” to compare variants' : ''}
              ><input
                type="checkbox"
                data-variant=${String(v.id)}
                ?disabled=${this.vis.chosenOnly}
                .checked=${this.vis.variants[String(v.id)] !== false}
                @change=${(e: Event) =>
                  (this.vis = {
                    ...this.vis,
                    variants: {
                      ...this.vis.variants,
                      [String(v.id)]: (e.target as HTMLInputElement).checked,
                    },
                  })}
              /><span
                class="swatch"
                style=${styleMap({ background: VARIANT_COLOURS[i % VARIANT_COLOURS.length] })}
              ></span
              >${String(v.id ?? '')}</label
            >`,
        )}
      </div>
      <div
        id="map"
        class=${this.addMode ? 'add-mode' : ''}
        role="application"
        aria-label="Planning map"
      ></div>
    `;
  }
}
