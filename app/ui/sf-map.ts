/** <sf-map>: the planning map, its layers and marks kept in line with the plan store. */
import L from 'leaflet';
import leafletCss from 'leaflet/dist/leaflet.css?inline';
import { LitElement, css, html, unsafeCSS } from 'lit';
import { customElement, property, state } from 'lit/decorators.js';
import {
  buildFocusLayers,
  buildResultLayers,
  buildSafetyLayers,
  buildWindowLayers,
  DEFAULT_VISIBILITY,
  Graticule,
  type LayerFormat,
  type LayerVisibility,
  SHAPE_KINDS,
  TerrainLayer,
} from '../map';
import type { Site, Variant } from '../plan';
import { basemap } from './basemap-state';
import { basemapSet, BasemapView } from './basemap-view';
import { layerBar, layerBarStyles } from './map-layer-bar';
import { CursorReadout, finite, planLatLon } from './map-position';
import { MAP_KEYS_HELP, MapKeys } from './map-keys';
import { MarkerDrag } from './marker-drag';
import { planMarkStyles } from './plan-mark-styles';
import type { PlanStore } from './plan-store';
import { ReleaseTrack } from './release-track';
import { nextSiteId } from './sf-sites-panel';
import { sharedStyles, VARIANT_COLOURS } from './shared-styles';
import { SiteMarkers } from './site-markers';
import { StoreController } from './store-controller';
import { formatQuantity, formatSpeed, fromDisplay, quantityUnit } from './units';
import { ZoneDrawing } from './zone-drawing';
import type { Settings } from './saved-state';

/** Above this many sites the result shapes are drawn on one canvas instead of as SVG elements. */
export const CANVAS_SITES = 300;
const WINDOW_PANE = 'seedfallWindows';

/**
 * The planning map: coordinate grid and scale (no tiles needed; a PMTiles archive or a tile URL
 * can be set), the release point, carrier track and its handle, the sites (all draggable), and
 * the results.
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
        /* Nothing of the map (grid, shapes, labels) is ever drawn outside its own box. */
        overflow: hidden;
        position: relative;
      }
      #map {
        flex: 1;
        min-height: 0;
        background: #f3f4ef;
        /* Its own stacking context: Leaflet's panes (z-index 400–1000) stay inside it. */
        isolation: isolate;
        contain: paint;
        /* Panning never selects the scale or attribution text. */
        user-select: none;
        -webkit-user-select: none;
      }
      #map:focus {
        outline: none;
      }
      #map:focus-visible {
        outline: 3px solid #0f766e;
        outline-offset: -3px;
      }
      /* The keys in words while the map has the keyboard focus. */
      .map-help {
        display: none;
        position: absolute;
        left: 56px;
        right: 56px;
        bottom: 44px;
        z-index: 1100;
        padding: 4px 8px;
        background: rgb(255 255 255 / 94%);
        border: 1px solid #0f766e;
        border-radius: 4px;
        font-size: 12px;
        pointer-events: none;
      }
      #map:focus-visible ~ .map-help {
        display: block;
      }
      .leaflet-control-container {
        user-select: none;
        -webkit-user-select: none;
      }
      .sf-window-time {
        font-weight: 600;
        padding: 1px 4px;
      }
      #map.add-mode {
        cursor: crosshair;
      }
      .sf-cursor {
        background: rgba(255, 255, 255, 0.85);
        padding: 1px 6px;
        font:
          11px/1.4 system-ui,
          sans-serif;
        font-variant-numeric: tabular-nums;
        color: #1f2328;
        white-space: nowrap;
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
  @state() private addMode = false;

  private map?: L.Map;
  private resultLayer?: L.LayerGroup;
  /** The base layer: a PMTiles archive, the tile URL (kept tiles first), or none. */
  private readonly basemapView = new BasemapView();
  private readonly onBasemap = (): void => this.requestUpdate();
  private readonly drag = new MarkerDrag(() => {
    this.store?.commit();
    this.requestUpdate();
  });
  private readonly track = new ReleaseTrack(() => this.store!, this.drag);
  private readonly sites = new SiteMarkers(() => this.store!, this.drag, {
    hover: (id) => {
      this.hovered = id;
      this.syncFocus();
    },
  });
  private windowLayer?: L.LayerGroup;
  private focusLayer?: L.LayerGroup;
  private canvas?: L.Canvas;
  private windowCanvas?: L.Canvas;
  private hovered: string | null = null;
  private selected: string | null = null;
  private drawnFocus = '';
  private readonly drawing = new ZoneDrawing(() => this.requestUpdate());
  private drawnResult: unknown = null;
  private drawnVis = '';
  private drawnUnits = '';
  private fitted = false;
  private safetyLayer?: L.LayerGroup;
  private drawnSafety: unknown = null;
  private drawnZones = '';
  /** Hillshade and contours of the elevation model (store.dem). */
  private readonly terrain = new TerrainLayer();
  private readonly cursor = new CursorReadout(() => this.store);

  constructor() {
    super();
    new StoreController(this, () => this.store);
  }

  connectedCallback(): void {
    super.connectedCallback();
    this.store?.addEventListener('focus-site', this.onFocus);
    this.store?.addEventListener('select-site', this.onSelect);
    basemap.addEventListener('change', this.onBasemap);
    void basemap.restore();
  }

  disconnectedCallback(): void {
    this.store?.removeEventListener('focus-site', this.onFocus);
    this.store?.removeEventListener('select-site', this.onSelect);
    basemap.removeEventListener('change', this.onBasemap);
    super.disconnectedCallback();
  }

  private readonly onFocus = (e: Event): void =>
    this.sites.focus(this.map, (e as CustomEvent<string>).detail);

  /** The selected site: its marker ringed, its windows on top with their times, its shapes. */
  private readonly onSelect = (e: Event): void => {
    this.selected = (e as CustomEvent<string | null>).detail;
    this.sites.select(this.selected);
    this.syncWindows();
    this.syncFocus();
  };

  /** The layer switches: the user's saved choice over the defaults, key by key. */
  private get vis(): LayerVisibility {
    const saved = this.store?.settings.mapLayers ?? {};
    const kinds = { ...DEFAULT_VISIBILITY.kinds };
    for (const k of SHAPE_KINDS) kinds[k] = saved[k] ?? kinds[k];
    return {
      kinds,
      chosenOnly: saved.chosenOnly ?? DEFAULT_VISIBILITY.chosenOnly,
      variants: this.variantVis,
    };
  }

  /** Which variants are compared (for this visit only: variant ids come and go with plans). */
  @state() private variantVis: Record<string, boolean> = {};

  private get showHazard(): boolean {
    return this.store?.settings.mapLayers.hazard ?? true;
  }

  /** The terrain layer's switch (on unless switched off; shown only with an elevation model). */
  private get showTerrain(): boolean {
    return this.store?.settings.mapLayers.terrain ?? true;
  }

  /** The base map's switch (on unless switched off; shown only with a base map set). */
  private get showBasemap(): boolean {
    return this.store?.settings.mapLayers.basemap ?? true;
  }

  /** Keeps the switches in settings (stored for the next visit). */
  private setLayers(vis: LayerVisibility, hazard: boolean, terrain = this.showTerrain): void {
    this.variantVis = vis.variants;
    const mapLayers: Settings['mapLayers'] = {
      hazard,
      chosenOnly: vis.chosenOnly,
      terrain,
      basemap: this.showBasemap,
    };
    for (const k of SHAPE_KINDS) mapLayers[k] = vis.kinds[k];
    this.store?.setSettings({ mapLayers });
  }

  firstUpdated(): void {
    const el = this.renderRoot.querySelector('#map') as HTMLElement;
    const map = L.map(el, { zoomControl: true, attributionControl: true, zoomSnap: 0.25 });
    this.map = map;
    map.attributionControl.setPrefix('Seedfall · coordinate grid WGS 84');
    this.fit();
    // The scale first, so the grid's labels know what it covers from the start.
    L.control.scale({ metric: true, imperial: true, position: 'bottomleft' }).addTo(map);
    new Graticule().addTo(map);
    // Release windows above the other result shapes (overlay pane 400), below the markers.
    map.createPane(WINDOW_PANE).style.zIndex = '450';
    this.sites.addTo(map);
    // Lanes of release windows are screen pixels apart.
    map.on('zoomend', () => this.syncWindows());
    map.on('click', (e: L.LeafletMouseEvent) => this.onMapClick(e));
    this.cursor.addTo(map);
    new MapKeys(
      () => this.store,
      (id) =>
        this.dispatchEvent(
          new CustomEvent<string>('sf-open-site', { detail: id, bubbles: true, composed: true }),
        ),
    ).addTo(map);
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
    this.syncTerrain();
    this.syncResults();
    this.syncSafety();
  }

  /** The elevation model's hillshade and contours, in the display unit, when switched on. */
  private syncTerrain(): void {
    const s = this.store!;
    const map = this.map!;
    const units = s.settings.units;
    this.terrain.setUnits({
      metresPerUnit: fromDisplay(1, 'height', units),
      unit: quantityUnit('height', units),
    });
    this.terrain.setDem(s.dem);
    const on = s.dem !== null && this.showTerrain;
    if (on && !map.hasLayer(this.terrain)) this.terrain.addTo(map);
    if (!on && map.hasLayer(this.terrain)) this.terrain.remove();
    this.cursor.show();
  }

  private syncTiles(): void {
    const { tileUrl, tileAttribution } = this.store!.settings;
    this.basemapView.sync(this.map!, tileUrl, tileAttribution, this.showBasemap);
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
    this.syncWindows();
    this.syncFocus(true);
    if (!r) return;
    this.resultLayer = buildResultLayers(
      r,
      this.colour,
      this.vis,
      this.format(),
      this.renderer(r.sites.length),
    ).addTo(this.map!);
    // Sites may have changed status colour with the new result.
    if (!this.drag.active) this.sites.sync();
  }

  private format(): LayerFormat {
    const u = this.store!.settings.units;
    return {
      length: (m) => formatQuantity(m, 'distance', u),
      height: (m) => formatQuantity(m, 'height', u),
      speed: (v) => formatSpeed(v, u.speed),
    };
  }

  /** One canvas for the shapes of a big plan (SVG elements by the thousand pan slowly). */
  private renderer(sites: number): L.Renderer | undefined {
    if (sites <= CANVAS_SITES) return undefined;
    this.canvas ??= L.canvas({ padding: 0.5 });
    return this.canvas;
  }

  /** Release windows in lanes beside the track, the selected site's on top. */
  private syncWindows(): void {
    const map = this.map;
    const r = this.store?.result;
    this.windowLayer?.remove();
    this.windowLayer = undefined;
    if (!map || !r) return;
    const c = map.latLngToContainerPoint([r.releasePoint.lat, r.releasePoint.lon]);
    const metresPerPixel =
      map.distance(map.containerPointToLatLng(c), map.containerPointToLatLng(c.add([100, 0]))) /
      100;
    if (!(metresPerPixel > 0)) return;
    this.windowLayer = buildWindowLayers(r, this.colour, this.vis, {
      metresPerPixel,
      selected: this.selected,
      pane: WINDOW_PANE,
      renderer:
        r.sites.length > CANVAS_SITES
          ? (this.windowCanvas ??= L.canvas({ padding: 0.5, pane: WINDOW_PANE }))
          : undefined,
    }).addTo(map);
  }

  /** Reach, 50 % ellipse and landing of the site pointed at and the selected one. */
  private syncFocus(force = false): void {
    const map = this.map;
    const r = this.store?.result;
    const ids = [...new Set([this.selected, this.hovered])].filter((x): x is string => !!x);
    const key = `${ids.join('\n')}|${this.selected}`;
    if (!force && key === this.drawnFocus) return;
    this.drawnFocus = key;
    this.focusLayer?.remove();
    this.focusLayer = undefined;
    if (!map || !r || ids.length === 0) return;
    this.focusLayer = buildFocusLayers(
      r,
      ids,
      this.selected,
      this.colour,
      this.vis,
      this.format(),
    ).addTo(map);
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
        terrain: this.store?.dem ? this.showTerrain : null,
        basemap: basemapSet(this.store?.settings.tileUrl ?? '') ? this.showBasemap : null,
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
        setHazard: (on) => this.setLayers(this.vis, on),
        setTerrain: (on) => this.setLayers(this.vis, this.showHazard, on),
        setBasemap: (on) =>
          this.store?.setSettings({
            mapLayers: { ...this.store.settings.mapLayers, basemap: on },
          }),
        changeVis: (change) => this.setLayers(change(this.vis), this.showHazard),
      })}
      <div
        id="map"
        class=${this.addMode ? 'add-mode' : ''}
        role="application"
        aria-label="Planning map"
        aria-describedby="map-help"
      ></div>
      <p id="map-help" class="map-help">${MAP_KEYS_HELP}</p>
    `;
  }
}
