// The area a plan's descents can reach: what an elevation model must cover (docs/model.md §18).
import { type LocalBox, LocalFrame } from '../model';
import { massFactor, type Plan } from '../plan';

const DEG = Math.PI / 180;

/** A WGS 84 box, degrees. */
export interface AreaBox {
  south: number;
  west: number;
  north: number;
  east: number;
}

/** Largest margin about the sites (m): a plan whose descents could drift farther is not flown over terrain beyond it. */
export const MAX_TERRAIN_MARGIN_M = 30_000;

/**
 * Margin (m) about the sites and the release point that holds every descent the planner flies:
 * the fall time bound T = H / (0.6 · slowest sea-level descent rate) over the fall height H from
 * the release to 100 m below the lowest site, times the strongest wind plus three standard
 * deviations of wind error plus the gust (set, else 1.5 m/s), plus the farthest glide cot γ · H,
 * the forward throw and the carrier's track checked beyond the windows (carrier speed × 32 s)
 * and 200 m; at most MAX_TERRAIN_MARGIN_M.
 */
export function terrainMargin_m(plan: Plan): number {
  const ground = plan.groundElevation_m;
  const top = plan.release.altitude_m + (plan.release.reference === 'AGL' ? ground : 0);
  const lowest = Math.min(ground, ...plan.sites.map((s) => s.elevation_m)) - 100;
  const h = Math.max(1, top - lowest);
  const slowest = Math.min(...plan.variants.map((v) => v.descentRate_mps * massFactor(v)));
  const t = h / (0.6 * slowest);
  const layers = [...plan.winds.layers, ...(plan.winds.forecasts ?? []).flatMap((f) => f.layers)];
  const wind = Math.max(0, ...layers.map((l) => l.speed_mps));
  const u = plan.uncertainty;
  const spread = 3 * u.windSpeed_mps + (u.gust_mps ?? 1.5);
  const glide = Math.max(
    0,
    ...plan.variants.map((v) =>
      v.guidance === 'passive' ? 0 : h / Math.tan(v.glideAngle_deg * DEG),
    ),
  );
  const m = (wind + spread) * t + glide + 32 * plan.carrier.groundSpeed_mps + 200;
  return Math.min(MAX_TERRAIN_MARGIN_M, m);
}

/** The area in the plan's local frame (origin at the release point), m. */
export function terrainLocalBox(plan: Plan, frame = new LocalFrame(plan.release)): LocalBox {
  const pts = [{ x: 0, y: 0 }, ...plan.sites.map((s) => frame.toLocal(s))];
  const m = terrainMargin_m(plan);
  return {
    xMin: Math.min(...pts.map((p) => p.x)) - m,
    xMax: Math.max(...pts.map((p) => p.x)) + m,
    yMin: Math.min(...pts.map((p) => p.y)) - m,
    yMax: Math.max(...pts.map((p) => p.y)) + m,
  };
}

/**
 * The WGS 84 box an elevation model must cover for this plan: terrainLocalBox's outline. Read
 * this window of a DEM (readGeoTiffDem / readAsciiGrid `box`) before planning over it.
 */
export function terrainArea(plan: Plan): AreaBox {
  const frame = new LocalFrame(plan.release);
  const b = terrainLocalBox(plan, frame);
  const lats: number[] = [];
  const lons: number[] = [];
  for (let i = 0; i <= 8; i++) {
    const u = b.xMin + ((b.xMax - b.xMin) * i) / 8;
    const v = b.yMin + ((b.yMax - b.yMin) * i) / 8;
    for (const p of [
      frame.toLatLon(u, b.yMin),
      frame.toLatLon(u, b.yMax),
      frame.toLatLon(b.xMin, v),
      frame.toLatLon(b.xMax, v),
    ]) {
      lats.push(p.lat);
      lons.push(p.lon);
    }
  }
  // A hair beyond the outline, so the planner's own check of the same box passes after rounding.
  const pad = 1e-7;
  return {
    south: Math.min(...lats) - pad,
    north: Math.max(...lats) + pad,
    west: Math.min(...lons) - pad,
    east: Math.max(...lons) + pad,
  };
}
