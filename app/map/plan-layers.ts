/**
 * Planning results as Leaflet layers: reach areas, nominal landings, 50 % and 95 % landing
 * ellipses, release windows on the carrier track and hover release zones. Every shape carries a
 * class `sf-<kind>` (so a person, or a test, can count them) and a tooltip saying what it is.
 * Tooltips hold site and variant ids from files, so they are built from text nodes (tooltip.ts).
 */
import L from 'leaflet';
import { fallTurbulenceText } from '../brief';
import {
  type GeoEllipse,
  includedText,
  type PlanResult,
  pHitText,
  type SiteResult,
  type VariantResult,
} from '../planner';
import { circleRing, ellipseRing, trackSegment } from './geometry';
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

export const DEFAULT_VISIBILITY: LayerVisibility = {
  kinds: { reach: true, landing: true, ellipse50: true, ellipse95: true, window: true, zone: true },
  chosenOnly: true,
  variants: {},
};

/** Number formatting supplied by the UI (user's units). */
export interface LayerFormat {
  length: (m: number) => string;
  /** m/s in the user's unit (default "x.x m/s"). */
  speed?: (mps: number) => string;
}

const f1 = (v: number): string => (Number(v.toFixed(1)) || 0).toFixed(1);
const signed = (t: number): string => `${t >= 0 ? '+' : '−'}${f1(Math.abs(t))} s`;

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

function shownResults(site: SiteResult, vis: LayerVisibility): VariantResult[] {
  if (vis.chosenOnly) return site.byVariant.filter((v) => v.variant === site.variant);
  return site.byVariant.filter((v) => vis.variants[v.variant] !== false);
}

/** Builds the result layers of a plan; `colour` gives each variant id its colour. */
export function buildResultLayers(
  result: PlanResult,
  colour: (variantId: string) => string,
  vis: LayerVisibility,
  fmt: LayerFormat,
): L.LayerGroup {
  const group = L.layerGroup();
  const release = (v: VariantResult) => v.release;
  const included = includedText(result.errorSources);
  for (const site of result.sites) {
    for (const v of shownResults(site, vis)) {
      const c = colour(v.variant);
      const who = `${site.id} · ${v.variant}`;
      if (vis.kinds.reach && v.reachRadius_m > 0) {
        L.polygon(circleRing(v.nominalLanding, v.reachRadius_m, 96), {
          color: c,
          weight: 1.5,
          dashArray: '6 5',
          fillOpacity: 0.04,
          className: 'sf-reach',
        })
          .bindTooltip(
            lazyTip(
              `Reach area · ${who}`,
              `radius ${fmt.length(v.reachRadius_m)} about the uncontrolled landing`,
              `site ${v.reachable ? 'reachable' : 'NOT reachable'} (miss ${fmt.length(v.nominalMiss_m)})`,
            ),
            { sticky: true },
          )
          .addTo(group);
      }
      if (vis.kinds.ellipse95) {
        const e = v.ellipse95;
        ellipseLayer(e, 0.3, { color: c, weight: 1.5, fillOpacity: 0.1, className: 'sf-ellipse95' })
          .bindTooltip(
            lazyTip(
              `95 % landing ellipse · ${who}`,
              `${fmt.length(e.semiMajor_m)} × ${fmt.length(e.semiMinor_m)}, major axis ${Math.round(e.azimuth_deg)}°`,
              `P(hit) ${pHitText(v.pHit, v.pHitSE)} · CEP ${fmt.length(v.cep_m)}`,
              `This fall: ${fallTurbulenceText(v, fmt.speed)}`,
              included,
            ),
            { sticky: true },
          )
          .addTo(group);
      }
      if (vis.kinds.ellipse50) {
        const e = v.ellipse50;
        ellipseLayer(e, 0.2, { color: c, weight: 1, fillOpacity: 0.3, className: 'sf-ellipse50' })
          .bindTooltip(
            lazyTip(
              `50 % landing ellipse · ${who}`,
              `${fmt.length(e.semiMajor_m)} × ${fmt.length(e.semiMinor_m)}`,
              `P(hit) ${pHitText(v.pHit, v.pHitSE)} · CEP ${fmt.length(v.cep_m)}`,
              `This fall: ${fallTurbulenceText(v, fmt.speed)}`,
              included,
            ),
            { sticky: true },
          )
          .addTo(group);
      }
      if (vis.kinds.landing) {
        L.circleMarker([v.nominalLanding.lat, v.nominalLanding.lon], {
          radius: 3.5,
          color: c,
          weight: 2,
          fillColor: '#fff',
          fillOpacity: 1,
          className: 'sf-landing',
        })
          .bindTooltip(
            lazyTip(
              `Uncontrolled landing · ${who}`,
              `fall ${f1(v.fallTime_s)} s · release ${signed(release(v).time_s)}`,
              `site P(hit) with this variant ${pHitText(v.pHit, v.pHitSE)}`,
            ),
          )
          .addTo(group);
      }
      const w = v.releaseWindow;
      if (vis.kinds.window && w && result.track.groundSpeed_mps > 0) {
        const rp = result.releasePoint;
        const line = trackSegment(
          rp,
          result.track.trackDeg,
          result.track.groundSpeed_mps,
          w.open_s,
          w.close_s,
        );
        const tip = lazyTip(
          `Release window · ${who}`,
          `opens ${signed(w.open_s)}, closes ${signed(w.close_s)} (relative to passing the release point)`,
          `best ${signed(w.best_s)} · P(hit) ${pHitText(v.pHit, v.pHitSE)}`,
          included,
        );
        L.polyline(line, {
          color: c,
          weight: 7,
          opacity: 0.55,
          lineCap: 'butt',
          className: 'sf-window',
        })
          .bindTooltip(tip, { sticky: true })
          .addTo(group);
        for (const [p, label] of [
          [line[0], `opens ${signed(w.open_s)}`],
          [line[line.length - 1], `closes ${signed(w.close_s)}`],
        ] as const) {
          L.circleMarker(p, {
            radius: 4,
            color: c,
            weight: 2,
            fillColor: '#fff',
            fillOpacity: 1,
            className: 'sf-window-mark',
          })
            .bindTooltip(lazyTip(`${who}: ${label}`))
            .addTo(group);
        }
      }
      const z = v.releaseZone;
      if (vis.kinds.zone && z) {
        L.polygon(circleRing(z.center, Math.max(z.radius_m, 0.5), 72), {
          color: c,
          weight: 2,
          dashArray: '2 5',
          fillOpacity: 0.06,
          className: 'sf-zone',
        })
          .bindTooltip(
            lazyTip(
              `Hover release zone · ${who}`,
              `hold within ${fmt.length(z.radius_m)} of the centre for P(hit) ≥ required`,
              `P(hit) ${pHitText(v.pHit, v.pHitSE)}`,
              included,
            ),
            { sticky: true },
          )
          .addTo(group);
      }
    }
  }
  return group;
}
