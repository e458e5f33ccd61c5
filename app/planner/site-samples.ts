// One site × variant's Monte Carlo landings and fall profile, as planDrop reported them, for the
// site details view: the same seed, the same release (with the moving carrier's best-time shift)
// and the same main stream, so the points give exactly the P(hit) and CEP the results show.
import type { ElevationModel } from '../model';
import type { Plan } from '../plan';
import { reportedStream } from './planner';
import type { VariantResult } from './results';

/** A landing ellipse about a centre given in metres east/north of the site. */
export interface SiteEllipse {
  east_m: number;
  north_m: number;
  semiMajor_m: number;
  semiMinor_m: number;
  /** Major-axis azimuth, degrees true. */
  azimuth_deg: number;
}

/** The nominal fall: time, height above the site's ground and wind drift, node by node from release. */
export interface FallProfile {
  time_s: number[];
  height_m: number[];
  driftEast_m: number[];
  driftNorth_m: number[];
}

export interface SiteSamples {
  siteId: string;
  variantId: string;
  /**
   * Every reported landing (monteCarlo.samples of them), metres east and north of the site; NaN
   * for a descent that met no known ground over an elevation model.
   */
  east_m: Float64Array;
  north_m: Float64Array;
  tolerance_m: number;
  ellipse50: SiteEllipse;
  ellipse95: SiteEllipse;
  /** The re-flown result (equal to planDrop's for this site and variant). */
  result: VariantResult;
  profile: FallProfile;
}

export interface SiteSamplesOptions {
  /** Most fall profile nodes kept (evenly spaced, first and last always kept); default 200. */
  maxProfilePoints?: number;
  /** The elevation model the plan is flown over (as planDrop's `terrain`). */
  terrain?: ElevationModel;
}

/** Indices 0 … n−1 thinned evenly to at most `max` (first and last kept). */
export function evenIndices(n: number, max: number): number[] {
  const m = Math.max(2, Math.floor(max));
  if (n <= m) return Array.from({ length: n }, (_, i) => i);
  return Array.from({ length: m }, (_, k) => Math.round((k * (n - 1)) / (m - 1)));
}

/**
 * The landings (m from the site) and nominal fall profile of `variantId` at `siteId`, re-flown
 * as planDrop flies them; null when either id is not in the plan.
 */
export function siteSamples(
  plan: Plan,
  siteId: string,
  variantId: string,
  opts: SiteSamplesOptions = {},
): SiteSamples | null {
  const r = reportedStream(plan, siteId, variantId, { terrain: opts.terrain });
  if (!r) return null;
  const n = r.xs.length;
  const east = new Float64Array(n);
  const north = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    // The same operations, in the same order, as the planner's summary (x + shift, then − site).
    east[i] = r.xs[i] + r.shift.x - r.site.x;
    north[i] = r.ys[i] + r.shift.y - r.site.y;
  }
  const ell = (e: typeof r.stats.ellipse50): SiteEllipse => ({
    east_m: e.center.x - r.site.x,
    north_m: e.center.y - r.site.y,
    semiMajor_m: e.semiMajor_m,
    semiMinor_m: e.semiMinor_m,
    azimuth_deg: e.azimuth_deg,
  });
  const t = r.table;
  const idx = evenIndices(t.z.length, opts.maxProfilePoints ?? 200);
  const site = plan.sites.find((s) => s.id === siteId);
  return {
    siteId,
    variantId,
    east_m: east,
    north_m: north,
    tolerance_m: site?.tolerance_m ?? 0,
    ellipse50: ell(r.stats.ellipse50),
    ellipse95: ell(r.stats.ellipse95),
    result: r.result,
    profile: {
      time_s: idx.map((i) => t.t[i]),
      height_m: idx.map((i) => t.z[i] - t.bottom_m),
      driftEast_m: idx.map((i) => t.dEast[i]),
      driftNorth_m: idx.map((i) => t.dNorth[i]),
    },
  };
}
