/**
 * Air density from a measured or forecast temperature profile by hydrostatic integration
 * (docs/model.md §11): dp/dH = −g0·p/(R·T) in geopotential altitude H (USSA 1976 eq. 18 converts
 * from geometric), temperature piecewise linear in H between the sounding's levels, so each layer
 * has a closed form: lapse L ≠ 0 → p2 = p1·(T2/T1)^(−g0/(R·L)); L = 0 → p2 = p1·exp(−g0·ΔH/(R·T1)).
 * ρ = p/(R·T). Below the lowest level the temperature follows the USSA 1976 lapse rate; above the
 * highest it is held constant.
 */
import { airAt, densityAt, geopotentialAltitude, type AirState } from './atmosphere';
import { G0, LAPSE_K_PER_M, R_AIR } from './constants';
import type { AltitudeReference } from './types';

export interface SoundingAtmosphereOptions {
  /** Pressure at the lowest level, Pa (default: USSA 1976 pressure at that altitude). */
  surfacePressure_Pa?: number;
  /** Reference of the temperatures' altitudes (default 'MSL'); AGL adds groundElevation_m. */
  reference?: AltitudeReference;
  /** Ground elevation, m MSL (used with reference 'AGL'). */
  groundElevation_m?: number;
}

/** Least separation of two sounding levels, m: closer ones are one level. */
const MIN_LEVEL_GAP_M = 0.001;

/** Pressure at H from (H1, T1, p1) along a layer of lapse L, K per geopotential m. */
function layerPressure(p1: number, T1: number, L: number, dH: number): number {
  const x = (L * dH) / T1;
  if (Math.abs(x) < 1e-12) return p1 * Math.exp((-G0 * dH) / (R_AIR * T1));
  // (T/T1)^(−g/(R·L)) written with log1p so small lapses stay accurate.
  return p1 * Math.exp((-G0 / (R_AIR * L)) * Math.log1p(x));
}

/**
 * Atmosphere of a sounding: `densityAt(z_m)` plays the role of atmosphere.ts's densityAt
 * (geometric altitude, m MSL → kg/m³). With no usable temperatures it is the USSA 1976 atmosphere.
 * Temperatures that are not finite and positive are ignored; of levels closer than 1 mm the lowest
 * (of equal altitudes, the first given) is used.
 */
export class SoundingAtmosphere {
  /** Level geopotential altitudes, m, ascending. */
  readonly H: Float64Array;
  readonly T: Float64Array;
  readonly p: Float64Array;

  constructor(
    temperatures: readonly { altitude_m: number; temperature_K: number }[],
    opts: SoundingAtmosphereOptions = {},
  ) {
    const offset = opts.reference === 'AGL' ? (opts.groundElevation_m ?? 0) : 0;
    let levels: { z: number; T: number }[] = [];
    for (const t of Array.isArray(temperatures) ? temperatures : []) {
      const z = (t?.altitude_m ?? NaN) + offset;
      const T = t?.temperature_K ?? NaN;
      if (Number.isFinite(z) && Number.isFinite(T) && T > 0) levels.push({ z, T });
    }
    // Stable sort keeps the first of repeated altitudes first; a level within MIN_LEVEL_GAP_M of
    // the one kept below it is dropped, so no layer has a zero (or denormal) thickness and a lapse
    // of ±Infinity or NaN.
    const sorted = levels.sort((a, b) => a.z - b.z);
    levels = [];
    for (const l of sorted) {
      if (levels.length === 0 || l.z - levels[levels.length - 1].z >= MIN_LEVEL_GAP_M)
        levels.push(l);
    }
    const n = levels.length;
    this.H = Float64Array.from(levels, (l) => geopotentialAltitude(l.z));
    this.T = Float64Array.from(levels, (l) => l.T);
    this.p = new Float64Array(n);
    if (n === 0) return;
    const p0 = opts.surfacePressure_Pa;
    this.p[0] = p0 !== undefined && p0 > 0 ? p0 : airAt(levels[0].z).pressure_Pa;
    for (let i = 1; i < n; i++) {
      const dH = this.H[i] - this.H[i - 1];
      const L = (this.T[i] - this.T[i - 1]) / dH;
      this.p[i] = layerPressure(this.p[i - 1], this.T[i - 1], L, dH);
    }
  }

  /** Temperature, pressure and density at geometric altitude z_m (m MSL). */
  airAt(z_m: number): AirState {
    const n = this.H.length;
    if (n === 0) return airAt(z_m);
    const h = geopotentialAltitude(z_m);
    const { H, T, p } = this;
    let i: number;
    let L: number;
    if (h <= H[0]) {
      i = 0;
      L = LAPSE_K_PER_M;
    } else if (h >= H[n - 1]) {
      i = n - 1;
      L = 0;
    } else {
      let lo = 0;
      let hi = n - 1;
      while (hi - lo > 1) {
        const mid = (lo + hi) >> 1;
        if (H[mid] <= h) lo = mid;
        else hi = mid;
      }
      i = lo;
      L = (T[hi] - T[lo]) / (H[hi] - H[lo]);
    }
    const dH = h - H[i];
    const temperature_K = T[i] + L * dH;
    const pressure_Pa = layerPressure(p[i], T[i], L, dH);
    return { temperature_K, pressure_Pa, density_kgm3: pressure_Pa / (R_AIR * temperature_K) };
  }

  /** Density, kg/m³, at geometric altitude z_m (m MSL). NaN in, NaN out. */
  densityAt(z_m: number): number {
    if (this.H.length === 0) return densityAt(z_m);
    return this.airAt(z_m).density_kgm3;
  }
}
