// What planDrop returns: results per variant, per site and for the plan (docs/model.md §7–10).
import type { ElevationModel, LatLon, Vec } from '../model';
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

/** A GeoJSON Polygon (RFC 7946): one closed ring of [lon, lat], counter-clockwise. */
export interface GeoPolygon {
  type: 'Polygon';
  coordinates: [number, number][][];
}

/** A point of the nominal fall seen from the side: distance from the release, altitude, ground. */
export interface FallProfilePoint {
  /** horizontal distance from the release point along the path, m */
  dist_m: number;
  /** altitude MSL of the vehicle, m */
  alt_m: number;
  /** ground MSL under it, m; null where the elevation model has no height */
  ground_m: number | null;
}

/** Ground higher than the site that the descent aimed at it meets first (docs/model.md §18). */
export interface HiddenBy {
  /** where the aimed descent meets the ground */
  lat: number;
  lon: number;
  ground_m: number;
  /** how far that ground is above the site's ground, m, and from the site, m */
  aboveSite_m: number;
  fromSite_m: number;
}

/** Terrain results of one variant for one site; present only when planned over an elevation model. */
export interface VariantTerrain {
  /** MSL ground at the nominal landing, m; null when the nominal descent met no known ground. */
  landingGround_m: number | null;
  /** The steering reach on the ground (≥ 72 rays); null for passive or when a ray met no known ground. */
  reachPolygon: GeoPolygon | null;
  /** The nominal descent from the release to the ground, at most 121 points. */
  fallProfile: FallProfilePoint[];
  /** Present when a ridge or slope hides the site from the descent aimed at it. */
  hiddenBy?: HiddenBy;
  /** Share of the reported samples whose descent met no known ground (counted as misses). */
  offTerrain: number;
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
  /** MSL ground at the nominal landing (m); present only when planned over an elevation model. */
  landingGround_m?: number | null;
  /** The steering reach on the ground as a GeoJSON Polygon; present only over an elevation model. */
  reachPolygon?: GeoPolygon | null;
  /** Profile, hidden ground and off-model share; present only over an elevation model. */
  terrain?: VariantTerrain;
}

/** Where a site's elevation came from, when planned over an elevation model. */
export interface SiteGround {
  /** the elevation the site's falls aim at, m MSL */
  elevation_m: number;
  /**
   * `typed` in the plan (it wins), read from the elevation model (`terrain`), or the plan's
   * ground (`plan-ground`) when neither gives one (a warning says so)
   */
  source: 'typed' | 'terrain' | 'plan-ground';
  /** the model's height at the site, m MSL; null where it has none */
  terrain_m: number | null;
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
  /** Present only when planned over an elevation model. */
  ground?: SiteGround;
}

/** A point where the carrier flies, with the ground under it (for the clearance check). */
export interface CarrierGroundPoint {
  lat: number;
  lon: number;
  /** MSL ground under the carrier, m; null where the model has no height */
  ground_m: number | null;
  /** `track`: along the carrier's track over the release windows; `hover`: a hover point */
  kind: 'track' | 'hover';
  /** the site whose release this point is (hover points) */
  site?: string;
}

/** What the plan was flown over, when it had an elevation model. */
export interface PlanTerrain {
  /** the model's name (its file) */
  name: string;
  /** ground under the carrier along its track or at its hover points, at most 2,001 points */
  carrier: CarrierGroundPoint[];
  /** lowest and highest ground under the carrier, m MSL (null when none is known) */
  carrierGroundMin_m: number | null;
  carrierGroundMax_m: number | null;
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
  /** Present only when planned over an elevation model. */
  terrain?: PlanTerrain;
}

export interface PlanOptions {
  /** Samples used for each P(hit) probe of window and zone searches (default min(samples, 128)). */
  probeSamples?: number;
  /** Called after each site with the number of sites done and the total. */
  onProgress?: (done: number, total: number) => void;
  /**
   * Ground to fly over (docs/model.md §18): each descent ends where it meets this model, sites
   * without a typed elevation take theirs from it. It must cover terrainArea(plan).
   */
  terrain?: ElevationModel;
}
