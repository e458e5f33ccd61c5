// Small types of the physical model, used by the plan file's types too (plan.ts re-exports them).

export type AltitudeReference = 'AGL' | 'MSL';
export type Guidance = 'passive' | 'fixed-heading' | 'homing';
/** Intensity class of the modelled turbulence; `auto` takes it from the plan's wind at 20 ft. */
export type TurbulenceClass = 'none' | 'light' | 'moderate' | 'severe' | 'auto';

export interface WindLayer {
  /** Altitude of the layer, m, above ground or sea level per `winds.reference`. */
  altitude_m: number;
  /** Meteorological direction the wind blows from, degrees true. */
  fromDeg: number;
  speed_mps: number;
}

export interface Uncertainty {
  /** 1σ wind error per horizontal component, m/s. */
  windSpeed_mps: number;
  /** Altitude over which wind errors decorrelate (exp(−Δz/L)), m. */
  windCorrelation_m: number;
  /** 1σ descent-rate error, % of the nominal rate. */
  descentRate_pct: number;
  /** 1σ release position error per horizontal axis, m. */
  releasePosition_m: number;
  /** 1σ heading error of steered variants, degrees. */
  heading_deg: number;
  /** 1σ release timing error, s (moves the release along the carrier track). */
  releaseTiming_s: number;
  /** Modelled turbulence (gusts and vertical air) where not set below; a resolved plan has it. */
  turbulence?: TurbulenceClass;
  /** Set 1σ horizontal gust per component, m/s (replaces the modelled gust). */
  gust_mps?: number;
  /** Set correlation time of the gust the vehicle falls through, s. */
  gustTime_s?: number;
  /** Set 1σ vertical air velocity, constant through one fall, m/s (replaces the modelled one). */
  verticalAir_mps?: number;
}
