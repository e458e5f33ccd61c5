// What planDrop returns: results per variant, per site and for the plan (docs/model.md §7–10).
import type { LatLon, Vec } from '../model';
import type { ResolvedVariant } from '../plan';
import type { ErrorSource } from './error-sources';
import type { Recommendation } from './recommend';

/** A landing ellipse on the globe. */
export interface GeoEllipse {
  center: LatLon;
  semiMajor_m: number;
  semiMinor_m: number;
  azimuth_deg: number;
}

/**
 * Times (s, relative to passing the plan's release point) when releasing meets requiredPHit.
 * `openUnbounded` / `closeUnbounded` are present (true) only when P(hit) still met the
 * requirement at the farthest release the search tried: that edge is then the search limit, and
 * the window reaches farther.
 */
export interface ReleaseWindow {
  open_s: number;
  close_s: number;
  best: LatLon;
  best_s: number;
  openUnbounded?: true;
  closeUnbounded?: true;
}

/**
 * Where a hovering carrier may hold: a disc about `center`. `unbounded` is present (true) only
 * when the direction that sets the radius reached the search limit: the radius is then a lower
 * bound.
 */
export interface ReleaseZone {
  center: LatLon;
  radius_m: number;
  unbounded?: true;
}

/** Result of one variant for one site (docs/model.md §7–10). */
export interface VariantResult {
  variant: string;
  guidance: ResolvedVariant['guidance'];
  /** Where and when this variant is released for the site (time relative to the plan's release point). */
  release: LatLon & { time_s: number };
  fallTime_s: number;
  nominalLanding: LatLon;
  /** Distance from the nominal (uncontrolled) landing to the site, m. */
  nominalMiss_m: number;
  reachRadius_m: number;
  reachable: boolean;
  ellipse50: GeoEllipse;
  ellipse95: GeoEllipse;
  ellipse99: GeoEllipse;
  meanLanding: LatLon;
  cep_m: number;
  /** Share of the reported samples within the tolerance (independent of those that chose the release). */
  pHit: number;
  /** Monte Carlo standard error of pHit, √(p(1−p)/n). */
  pHitSE: number;
  /** Gust of this fall: time-RMS 1σ per component (m/s) and mean correlation time (s); 0 = none. */
  gust_mps: number;
  gustTime_s: number;
  /** 1σ vertical air velocity, constant through the fall, m/s; 0 = none. */
  verticalAir_mps: number;
  releaseWindow: ReleaseWindow | null;
  releaseZone: ReleaseZone | null;
  headingTrue_deg?: number;
  headingMag_deg?: number | null;
  thrustTime_s?: number;
}

export interface SiteResult extends VariantResult {
  id: string;
  name: string;
  /** The site's position. */
  lat: number;
  lon: number;
  /** The recommended variant id (cheapest meeting requiredPHit, ties in catalogue order; else best P(hit)). */
  recommended: string;
  /** Why: meets / below (none meets) / unreachable (no variant can reach the site), in words. */
  recommendation: Recommendation;
  /** True when the site pins its variant. */
  pinned: boolean;
  meetsRequired: boolean;
  comparison: {
    variant: string;
    reachable: boolean;
    pHit: number;
    pHitSE: number;
    cep_m: number;
    /** The variant's `cost` (0 when the plan gives none). */
    cost: number;
  }[];
  byVariant: VariantResult[];
}

export interface PlanResult {
  name: string;
  time: string;
  declination_deg: number | null;
  declinationModel: string | null;
  releaseAltitudeMSL_m: number;
  /** The plan's release point: the frame origin and, when moving, time 0 of the track. */
  releasePoint: LatLon;
  track: { unit: Vec; groundSpeed_mps: number; trackDeg: number };
  sites: SiteResult[];
  /** Error sources the Monte Carlo flew (σ above zero), in words. */
  errorSources: ErrorSource[];
  warnings: string[];
}

export interface PlanOptions {
  /** Samples used for each P(hit) probe of window and zone searches (default min(samples, 128)). */
  probeSamples?: number;
  /** Called after each site with the number of sites done and the total. */
  onProgress?: (done: number, total: number) => void;
}
