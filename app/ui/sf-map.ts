/** <sf-map>: the planning map, its layers and marks kept in line with the plan store. */
import L from 'leaflet';
import leafletCss from 'leaflet/dist/leaflet.css?inline';
import { LitElement, css, html, unsafeCSS } from 'lit';
import { customElement, property, state } from 'lit/decorators.js';
import {
  buildResultLayers,
  buildSafetyLayers,
  DEFAULT_VISIBILITY,
  escapeHtml,
  Graticule,
  type LayerVisibility,
} from '../map';
import type { Site, Variant } from '../plan';
import { layerBar, layerBarStyles } from './map-layer-bar';
import { finite, planLatLon } from './map-position';
import { MarkerDrag } from './marker-drag';
import { planMarkStyles } from './plan-mark-styles';
import type { PlanStore } from './plan-store';
import { ReleaseTrack } from './release-track';
import { nextSiteId } from './sf-sites-panel';
import { sharedStyles, VARIANT_COLOURS } from './shared-styles';
import { SiteMarkers } from './site-markers';
import { StoreController } from './store-controller';
import { formatLength, formatSpeed } from './units';
import { ZoneDrawing } from './zone-drawing';

/**
 * The planning map: coordinate grid and scale (no tiles needed; a tile URL can be set), the
 * release point, carrier track and its handle, the sites (all draggable), and the results.
 */
@customElement('sf-map')
export class SfMap extends LitElement {
  static styles = [
    unsafeCSS(leafletCss),
    sharedStyles,
    layerBarStyles,
    planMarkStyles,
    css`
      :host {
        display: flex;
        flex-direction: column;
        min-height: 0;
      }
      #map {
        flex: 1;
        min-height: 300px;
        background: #f3f4ef;
      }
      #map.add-mode {
        cursor: crosshair;
      }
      .leaflet-tooltip {
        font:
          12px/1.35 system-ui,
          sans-serif;
        /* Long lines (the included error sources) wrap instead of running off the map. */
        white-space: normal;
        width: max-content;
        max-width: 22rem;
      }
    `,
  ];

  @property({ attribute: false }) store?: PlanStore;
  @state() private vis: LayerVisibility = structuredClone(DEFAULT_VISIBILITY);
  @state() private addMode = false;
  @state() private showHazard = true;

  private map?: L.Map;
  private resultLayer?: L.LayerGroup;
  private tileLayer?: L.TileLayer;
  private tileUrl = '';
  private tileAttribution = '';
  private readonly drag = new MarkerDrag(() => {
    this.store?.commit();
    this.requestUpdate();
  });
  private readonly track = new ReleaseTrack(() => this.store!, this.drag);
  private readonly sites = new SiteMarkers(() => this.store!, this.drag);
  private readonly drawing = new ZoneDrawing(() => this.requestUpdate());
  private drawnResult: unknown = null;
  private drawnVis = '';
  private drawnUnits = '';
  private fitted = false;
  private safetyLayer?: L.LayerGroup;
  private drawnSafety: unknown = null;
  private drawnZones = '';

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

  private readonly onFocus = (e: Event): void =>
    this.sites.focus(this.map, (e as CustomEvent<string>).detail);

  firstUpdated(): void {
    const el = this.renderRoot.querySelector('#map') as HTMLElement;
    const map = L.map(el, { zoomControl: true, attributionControl: true, zoomSnap: 0.25 });
    this.map = map;
    map.attributionControl.setPrefix('Seedfall · coordinate grid WGS 84');
    this.fit();
    new Graticule().addTo(map);
    L.control.scale({ metric: true, imperial: true, position: 'bottomleft' }).addTo(map);
    this.sites.addTo(map);
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
    const lat = finite(s.get('release.lat'));
    const lon = finite(s.get('release.lon'));
    if (lat !== null && lon !== null) pts.push([lat, lon]);
    for (const site of s.rows<Site>('sites')) {
      const [la, lo] = [finite(site.lat), finite(site.lon)];
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

  /** Brings the Leaflet layers in line with the store. */
  private sync(): void {
    const s = this.store;
    const map = this.map;
    if (!s || !map) return;
    if (!this.fitted) this.fit();
    this.syncTiles();
    if (!this.drag.active) {
      this.track.sync(map);
      this.sites.sync();
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
    const unitKey = `${s.settings.units.length}|${s.settings.units.speed}`;
    if (r === this.drawnResult && visKey === this.drawnVis && unitKey === this.drawnUnits) return;
    this.drawnResult = r;
    this.drawnVis = visKey;
    this.drawnUnits = unitKey;
    this.resultLayer?.remove();
    this.resultLayer = undefined;
    if (!r) return;
    this.resultLayer = buildResultLayers(r, this.colour, this.vis, {
      length: (m) => formatLength(m, s.settings.units.length, m < 10 ? 1 : 0),
      speed: (v) => formatSpeed(v, s.settings.units.speed),
    }).addTo(this.map!);
    // Sites may have changed status colour with the new result.
    if (!this.drag.active) this.sites.sync();
  }

  private onMapClick(e: L.LeafletMouseEvent): void {
    if (this.drawing.active) {
      this.drawing.add(e.latlng);
      return;
    }
    if (!this.addMode || !this.store) return;
    const sites = this.store.list('sites');
    this.store.edit('sites', [
      ...sites,
      { id: nextSiteId(this.store.rows<Site>('sites')), ...planLatLon(e.latlng) },
    ]);
  }

  /** No-drop zones (from the plan) and the hazard area (from the safety checks). */
  private syncSafety(): void {
    const s = this.store!;
    const zones = JSON.stringify(s.list('safety.noDropZones'));
    const key = `${zones}|${this.showHazard}`;
    if (s.safety !== this.drawnSafety || key !== this.drawnZones) {
      this.drawnSafety = s.safety;
      this.drawnZones = key;
      this.safetyLayer?.remove();
      this.safetyLayer = buildSafetyLayers(
        s.safety,
        JSON.parse(zones) as unknown[],
        this.showHazard,
      ).addTo(this.map!);
      // Beneath the result shapes, so their tooltips (P(hit), the fall's turbulence) stay in
      // reach inside the hazard area, which covers them all; last first keeps their own order.
      const paths = this.safetyLayer.getLayers().filter((l): l is L.Path => l instanceof L.Path);
      for (const l of paths.reverse()) l.bringToBack();
    }
    this.drawing.place(this.map!);
  }

  render() {
    return html`
      ${layerBar({
        adding: this.addMode,
        drawing: this.drawing,
        showHazard: this.showHazard,
        vis: this.vis,
        variants: this.store?.rows<Variant>('variants') ?? [],
        toggleAdding: () => {
          this.addMode = !this.addMode;
          this.drawing.cancel();
        },
        toggleDrawing: () => {
          if (this.drawing.active) this.drawing.finish(this.store);
          else {
            this.drawing.start();
            this.addMode = false;
          }
        },
        setHazard: (on) => (this.showHazard = on),
        changeVis: (change) => (this.vis = change(this.vis)),
      })}
      <div
        id="map"
        class=${this.addMode ? 'add-mode' : ''}
        role="application"
        aria-label="Planning map"
      ></div>
    `;
  }
}
