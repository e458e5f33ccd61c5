/**
 * Planning results as Leaflet layers: reach areas (circles, or polygons where each ray meets the
 * ground over an elevation model), marks where the ground hides a site, nominal landings, 50 % and 95 % landing
 * ellipses and hover release zones (release windows: window-layers.ts), and the extra shapes of
 * the sites the crew points at or selects. Every shape carries a class `sf-<kind>` (so a person,
 * or a test, can count them; the canvas renderer of big plans draws no elements) and a tooltip
 * saying what it is. Tooltips hold site and variant ids from files, so they are built from text
 * nodes (tooltip.ts).
 */
import L from 'leaflet';
import { fallTurbulenceText } from '../brief';
import {
  type GeoEllipse,
  type GeoPolygon,
  type HiddenBy,
  includedText,
  type PlanResult,
  pHitText,
  type SiteResult,
  type VariantResult,
} from '../planner';
import { circleRing, ellipseRing } from './geometry';
import { lazyTip } from './tooltip';

export type ShapeKind = 'reach' | 'landing' | 'ellipse50' | 'ellipse95' | 'window' | 'zone';

export const SHAPE_KINDS: readonly ShapeKind[] = [
  'reach',
  'landing',
  'ellipse50',
  'ellipse95',
  'window',
  'zone',
];

/** What the map shows. */
export interface LayerVisibility {
  kinds: Record<ShapeKind, boolean>;
  /** Only each site's chosen variant (else every variant switched on in `variants`). */
  chosenOnly: boolean;
  variants: Record<string, boolean>;
}

/**
 * The chosen variant's 95 % ellipse and its window or hover zone; reach areas, 50 % ellipses
 * and uncontrolled landings only for the site pointed at or selected (buildFocusLayers).
 */
export const DEFAULT_VISIBILITY: LayerVisibility = {
  kinds: {
    reach: false,
    landing: false,
    ellipse50: false,
    ellipse95: true,
    window: true,
    zone: true,
  },
  chosenOnly: true,
  variants: {},
};

/** Number formatting supplied by the UI (user's units). */
export interface LayerFormat {
  length: (m: number) => string;
  /** Heights (m) in the user's unit (default: `length`). */
  height?: (m: number) => string;
  /** m/s in the user's unit (default "x.x m/s"). */
  speed?: (mps: number) => string;
}

const f1 = (v: number): string => (Number(v.toFixed(1)) || 0).toFixed(1);
/** A time relative to passing the release point: "+3.2 s", "−1.0 s". */
export const signedSeconds = (t: number): string => `${t >= 0 ? '+' : '−'}${f1(Math.abs(t))} s`;

/** A landing ellipse as a polygon; axes below minAxis_m are drawn at minAxis_m so it stays visible. */
function ellipseLayer(e: GeoEllipse, minAxis_m: number, style: L.PolylineOptions): L.Polygon {
  return L.polygon(
    ellipseRing(
      e.center,
      Math.max(e.semiMajor_m, minAxis_m),
      Math.max(e.semiMinor_m, minAxis_m),
      e.azimuth_deg,
    ),
    style,
  );
}

/** The variants of a site the map shows: its chosen one, or every one switched on. */
export function shownResults(site: SiteResult, vis: LayerVisibility): VariantResult[] {
  if (vis.chosenOnly) return site.byVariant.filter((v) => v.variant === site.variant);
  return site.byVariant.filter((v) => vis.variants[v.variant] !== false);
}

/** What every shape of one build shares. */
interface Ctx {
  colour: (variantId: string) => string;
  fmt: LayerFormat;
  included: string;
  renderer?: L.Renderer;
  /** Extra class on every shape (e.g. `sf-focus`). */
  extra: string;
}

/** One shape of a kind (not windows) for a site's variant, or null when it has none. */
function shape(kind: ShapeKind, site: SiteResult, v: VariantResult, ctx: Ctx): L.Layer | null {
  const c = ctx.colour(v.variant);
  const who = `${site.id} · ${v.variant}`;
  const { fmt, included, renderer } = ctx;
  const cls = (k: string): string => (ctx.extra ? `sf-${k} ${ctx.extra}` : `sf-${k}`);
  if (kind === 'reach') {
    const ground = v.reachPolygon ?? v.terrain?.reachPolygon;
    if (ground && ground.coordinates[0]?.length >= 4) return reachPolygonLayer(ground, who, v, ctx);
    if (!(v.reachRadius_m > 0)) return null;
    return L.polygon(circleRing(v.nominalLanding, v.reachRadius_m, 96), {
      color: c,
      weight: 1.5,
      dashArray: '6 5',
      fillOpacity: 0.04,
      className: cls('reach'),
      renderer,
    }).bindTooltip(
      lazyTip(
        `Reach area · ${who}`,
        `radius ${fmt.length(v.reachRadius_m)} about the uncontrolled landing`,
        `site ${v.reachable ? 'reachable' : 'NOT reachable'} (miss ${fmt.length(v.nominalMiss_m)})`,
      ),
      { sticky: true },
    );
  }
  if (kind === 'ellipse95' || kind === 'ellipse50') {
    const big = kind === 'ellipse95';
    const e = big ? v.ellipse95 : v.ellipse50;
    return ellipseLayer(e, big ? 0.3 : 0.2, {
      color: c,
      weight: big ? 1.5 : 1,
      fillOpacity: big ? 0.1 : 0.3,
      className: cls(kind),
      renderer,
    }).bindTooltip(
      lazyTip(
        `${big ? 95 : 50} % landing ellipse · ${who}`,
        big
          ? `${fmt.length(e.semiMajor_m)} × ${fmt.length(e.semiMinor_m)}, major axis ${Math.round(e.azimuth_deg)}°`
          : `${fmt.length(e.semiMajor_m)} × ${fmt.length(e.semiMinor_m)}`,
        `P(hit) ${pHitText(v.pHit, v.pHitSE)} · CEP ${fmt.length(v.cep_m)}`,
        `This fall: ${fallTurbulenceText(v, fmt.speed)}`,
        included,
      ),
      { sticky: true },
    );
  }
  if (kind === 'landing') {
    return L.circleMarker([v.nominalLanding.lat, v.nominalLanding.lon], {
      radius: 3.5,
      color: c,
      weight: 2,
      fillColor: '#fff',
      fillOpacity: 1,
      className: cls('landing'),
      renderer,
    }).bindTooltip(
      lazyTip(
        `Uncontrolled landing · ${who}`,
        `fall ${f1(v.fallTime_s)} s · release ${signedSeconds(v.release.time_s)}`,
        `site P(hit) with this variant ${pHitText(v.pHit, v.pHitSE)}`,
      ),
    );
  }
  const z = v.releaseZone;
  if (kind === 'zone' && z) {
    return L.polygon(circleRing(z.center, Math.max(z.radius_m, 0.5), 72), {
      color: c,
      weight: 2,
      dashArray: '2 5',
      fillOpacity: 0.06,
      className: cls('zone'),
      renderer,
    }).bindTooltip(
      lazyTip(
        `Hover release zone · ${who}`,
        `hold within ${fmt.length(z.radius_m)} of the centre for P(hit) ≥ required`,
        `P(hit) ${pHitText(v.pHit, v.pHitSE)}`,
        included,
      ),
      { sticky: true },
    );
  }
  return null;
}

/** The steering reach where each ray meets the ground (planned over an elevation model). */
function reachPolygonLayer(poly: GeoPolygon, who: string, v: VariantResult, ctx: Ctx): L.Layer {
  const cls = ctx.extra ? `sf-reach sf-reach-ground ${ctx.extra}` : 'sf-reach sf-reach-ground';
  return L.polygon(
    poly.coordinates[0].map(([lon, lat]): L.LatLngTuple => [lat, lon]),
    {
      color: ctx.colour(v.variant),
      weight: 1,
      fillOpacity: 0.03,
      className: cls,
      renderer: ctx.renderer,
    },
  ).bindTooltip(
    lazyTip(
      `Reach area over the ground · ${who}`,
      'where the steered descent can meet the ground, ray by ray',
      `site ${v.reachable ? 'reachable' : 'NOT reachable'} (miss ${ctx.fmt.length(v.nominalMiss_m)})`,
    ),
    { sticky: true },
  );
}

/** "Hidden: ground 35 m above the site, 120 m before it" (heights and distances in the user's units). */
export function hiddenText(h: HiddenBy, fmt: LayerFormat): string {
  const height = fmt.height ?? fmt.length;
  return `Hidden: ground ${height(h.aboveSite_m)} above the site, ${fmt.length(h.fromSite_m)} before it`;
}

/**
 * A site hidden by the ground: a dark square-ish dot where the descent aimed at it meets the
 * ground first, joined to the site by a thin dotted line (so it is read as the site's, not as
 * another site).
 */
function hiddenMark(site: SiteResult, v: VariantResult, h: HiddenBy, ctx: Ctx): L.Layer {
  const tip = lazyTip(
    hiddenText(h, ctx.fmt),
    `${site.id} · ${v.variant}: the descent aimed at the site meets this ground first`,
  );
  return L.layerGroup([
    L.polyline(
      [
        [h.lat, h.lon],
        [site.lat, site.lon],
      ],
      {
        color: '#3b2a20',
        weight: 1,
        dashArray: '2 3',
        interactive: false,
        className: 'sf-hidden-line',
        renderer: ctx.renderer,
      },
    ),
    L.circleMarker([h.lat, h.lon], {
      radius: 4,
      color: '#fff',
      weight: 1.5,
      fillColor: '#3b2a20',
      fillOpacity: 1,
      className: 'sf-hidden',
      renderer: ctx.renderer,
    }).bindTooltip(tip),
  ]);
}

// Drawn in this order, one kind at a time, so that across all sites the wide, faint shapes lie
// beneath the small ones and every shape's tooltip stays within reach of the pointer.
const DRAW_ORDER: readonly ShapeKind[] = ['reach', 'ellipse95', 'zone', 'ellipse50', 'landing'];

/**
 * Builds the result layers of a plan (all but the release windows); `colour` gives each variant
 * id its colour; `renderer` (e.g. L.canvas() for big plans) draws them all.
 */
export function buildResultLayers(
  result: PlanResult,
  colour: (variantId: string) => string,
  vis: LayerVisibility,
  fmt: LayerFormat,
  renderer?: L.Renderer,
): L.LayerGroup {
  const group = L.layerGroup();
  const ctx: Ctx = {
    colour,
    fmt,
    included: includedText(result.errorSources),
    renderer,
    extra: '',
  };
  for (const kind of DRAW_ORDER) {
    if (!vis.kinds[kind]) continue;
    for (const site of result.sites) {
      for (const v of shownResults(site, vis)) shape(kind, site, v, ctx)?.addTo(group);
    }
  }
  // Hidden sites are always marked: the site cannot be reached as planned.
  for (const site of result.sites) {
    for (const v of shownResults(site, vis)) {
      const h = v.terrain?.hiddenBy;
      if (h) hiddenMark(site, v, h, ctx).addTo(group);
    }
  }
  return group;
}

/**
 * The shapes switched off in `vis` (reach area, 50 % ellipse, uncontrolled landing) for the
 * sites with these ids (pointed at or selected), class `sf-focus` besides their kind's, and for
 * the selected site (`selected`) an outline around its 95 % ellipses (`sf-ellipse95-selected`).
 */
export function buildFocusLayers(
  result: PlanResult,
  ids: readonly string[],
  selected: string | null,
  colour: (variantId: string) => string,
  vis: LayerVisibility,
  fmt: LayerFormat,
): L.LayerGroup {
  const group = L.layerGroup();
  const ctx: Ctx = {
    colour,
    fmt,
    included: includedText(result.errorSources),
    extra: 'sf-focus',
  };
  const sites = result.sites.filter((s) => ids.includes(s.id));
  for (const kind of DRAW_ORDER) {
    for (const site of sites) {
      for (const v of shownResults(site, vis)) {
        if (kind === 'ellipse95' && site.id === selected) {
          ellipseLayer(v.ellipse95, 0.3, {
            color: '#1c2b27',
            weight: 3,
            fill: false,
            interactive: false,
            className: 'sf-ellipse95-selected',
          }).addTo(group);
        }
        if (vis.kinds[kind] || kind === 'ellipse95' || kind === 'zone') continue;
        shape(kind, site, v, ctx)?.addTo(group);
      }
    }
  }
  return group;
}
