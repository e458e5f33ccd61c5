/**
 * Plan file v1 types. `PlanFile` is what a file holds (optional fields may be absent);
 * `Plan` is the same with every default filled in (see `resolvePlan` in plan-defaults.ts).
 * Field names are a contract: docs/plan-format.md documents each one.
 */
import type {
  AltitudeReference,
  Guidance,
  TurbulenceClass,
  Uncertainty,
  WindLayer,
} from '../model';

export type { AltitudeReference, Guidance, TurbulenceClass, Uncertainty, WindLayer };

/** A wind profile valid at a time (ISO 8601). */
export interface TimedWinds {
  time: string;
  /** Reference of these layers' altitudes (default: winds.reference). */
  reference?: AltitudeReference;
  layers: WindLayer[];
}

export interface Variant {
  id: string;
  name?: string;
  guidance: Guidance;
  /** Steady autorotation descent speed at sea-level ISA density (1.225 kg/m³), m/s. */
  descentRate_mps: number;
  /** Angle of the full-authority glide below horizontal in still air, degrees. */
  glideAngle_deg?: number;
  /** Longest steering (thruster) time after the entry, s. */
  controlTime_s?: number;
  /** Altitude lost after release before steering can start, m. */
  entryLoss_m?: number;
  /** Mass the descent rate was measured with, kg. */
  referenceMass_kg?: number;
  /** Mass flown in this plan (vehicle + sensor), kg. */
  payloadMass_kg?: number;
  /** Overrides the relaxation time τ = w/g of the forward throw, s. */
  throwTime_s?: number;
  /** Largest wind the variant is cleared to fly in, m/s (used by the safety checks). */
  maxWind_mps?: number;
  /** Cost of flying one, in the team's own unit (same for every variant); default 0. */
  cost?: number;
}

export interface Site {
  id: string;
  name?: string;
  lat: number;
  lon: number;
  /** Ground elevation at the site, m MSL. */
  elevation_m?: number;
  /** Landing within this distance of the site counts as a hit, m. */
  tolerance_m?: number;
  /** Pins a variant id instead of taking the recommended one. */
  variant?: string;
}

/** Temperatures aloft; density then comes from them (hydrostatic) instead of the ISA offset. */
export interface Sounding {
  reference?: AltitudeReference;
  surfacePressure_hPa?: number;
  levels: { altitude_m: number; temperature_K: number }[];
}

/** A no-drop zone: GeoJSON Feature with a Polygon geometry ([lon, lat]). */
export interface NoDropZone {
  type: 'Feature';
  properties?: { name?: string };
  geometry: { type: 'Polygon'; coordinates: number[][][] };
}

export interface ChecklistItem {
  id: string;
  text: string;
  state: 'open' | 'done' | 'n/a';
  who?: string;
  when?: string;
  note?: string;
}

/** Safety settings, zones, the crew checklist and the ready sign-off (all optional in a file). */
export interface SafetySection {
  ceiling_m?: number;
  noDropBuffer_m?: number;
  hazardBuffer_m?: number;
  thrustMargin_pct?: number;
  terrainClearance_m?: number;
  noDropZones?: NoDropZone[];
  checklist?: ChecklistItem[];
  signoff?: Signoff;
}

/** Who marked the plan ready, for which plan, and why failing checks were accepted. */
export interface Signoff {
  who: string;
  when: string;
  reason?: string;
  /** Fingerprint of the plan when signed (planFingerprint); a changed plan voids the sign-off. */
  planHash?: string;
  /** Failing automatic checks the reason covers; a check failing later is not covered. */
  covers?: string[];
}

/** The elevation model a plan names: a .tif/.tiff/.asc path relative to the plan file's folder. */
export interface PlanTerrainFile {
  file: string;
}

export interface PlanFile {
  format: 'seedfall-plan';
  version: 1;
  name?: string;
  /** Planned release time, ISO 8601 with zone. */
  time?: string;
  groundElevation_m?: number;
  atmosphere?: { isaOffset_K?: number; sounding?: Sounding };
  winds?: {
    reference?: AltitudeReference;
    layers?: WindLayer[];
    surfaceExponent?: number;
    /** Further profiles with valid times for the release-time timeline. */
    forecasts?: TimedWinds[];
  };
  release: { lat: number; lon: number; altitude_m: number; reference?: AltitudeReference };
  carrier?: { groundSpeed_mps?: number; trackDeg?: number };
  variants: Variant[];
  sites: Site[];
  uncertainty?: Partial<Uncertainty>;
  monteCarlo?: { samples?: number; seed?: number };
  requiredPHit?: number;
  safety?: SafetySection;
  terrain?: PlanTerrainFile;
}

/** A plan with every default applied; what the core computes on. */
export interface Plan {
  format: 'seedfall-plan';
  version: 1;
  name: string;
  time: string;
  groundElevation_m: number;
  atmosphere: { isaOffset_K: number; sounding?: Sounding };
  winds: {
    reference: AltitudeReference;
    layers: WindLayer[];
    surfaceExponent: number;
    forecasts?: TimedWinds[];
  };
  release: { lat: number; lon: number; altitude_m: number; reference: AltitudeReference };
  carrier: { groundSpeed_mps: number; trackDeg: number };
  variants: ResolvedVariant[];
  sites: ResolvedSite[];
  uncertainty: Uncertainty & { turbulence: TurbulenceClass };
  monteCarlo: { samples: number; seed: number };
  requiredPHit: number;
  /** As in the file; defaults are applied by the safety checks (DEFAULT_SAFETY_SETTINGS). */
  safety?: SafetySection;
  /** As in the file (absent when the file has none). */
  terrain?: PlanTerrainFile;
}

export interface ResolvedVariant extends Variant {
  name: string;
  glideAngle_deg: number;
  controlTime_s: number;
  entryLoss_m: number;
}

export interface ResolvedSite extends Site {
  name: string;
  elevation_m: number;
  tolerance_m: number;
  /** Present (true) when the file gave no elevation and it is the plan's ground: a terrain model then sets it. */
  elevationDefaulted?: true;
}
