import { DEFAULT_SURFACE_EXPONENT } from './constants';
import type { AltitudeReference, WindLayer } from './types';

const DEG = Math.PI / 180;

/** Wind vector a body drifts with: east and north components, m/s. */
export interface WindVector {
  east_mps: number;
  north_mps: number;
}

/** East/north components of a meteorological wind (blowing from fromDeg, degrees true). */
export function windComponents(fromDeg: number, speed_mps: number): WindVector {
  return {
    east_mps: -speed_mps * Math.sin(fromDeg * DEG),
    north_mps: -speed_mps * Math.cos(fromDeg * DEG),
  };
}

/** Meteorological from-direction (degrees true, 0..360) and speed of a drift vector. */
export function windFromComponents(v: WindVector): { fromDeg: number; speed_mps: number } {
  const speed_mps = Math.hypot(v.east_mps, v.north_mps);
  if (speed_mps === 0) return { fromDeg: 0, speed_mps: 0 };
  const fromDeg = (Math.atan2(-v.east_mps, -v.north_mps) / DEG + 360) % 360;
  return { fromDeg, speed_mps };
}

export interface WindProfileOptions {
  reference?: AltitudeReference;
  /** Plan ground elevation, m MSL: AGL layers are above it, and the surface power law starts at it. */
  groundElevation_m?: number;
  /** Power-law exponent below the lowest layer (u ∝ h^α), default 1/7. */
  surfaceExponent?: number;
}

/**
 * A wind profile over altitude MSL (docs/model.md §2): east/north components interpolated linearly
 * between layers, constant above the top layer, and below the lowest layer (when it is above the
 * ground) a power law in height above the plan ground, u(h) = u_low·(h/h_low)^α, zero at and
 * below the ground. No layers means calm.
 */
export class WindProfile {
  /** Layer altitudes, m MSL, ascending. */
  readonly z: Float64Array;
  readonly east: Float64Array;
  readonly north: Float64Array;
  readonly ground_m: number;
  readonly alpha: number;

  constructor(layers: readonly WindLayer[], opts: WindProfileOptions = {}) {
    const ground = opts.groundElevation_m ?? 0;
    const offset = (opts.reference ?? 'AGL') === 'AGL' ? ground : 0;
    const sorted = [...layers].sort((a, b) => a.altitude_m - b.altitude_m);
    this.z = Float64Array.from(sorted, (l) => l.altitude_m + offset);
    this.east = Float64Array.from(sorted, (l) => windComponents(l.fromDeg, l.speed_mps).east_mps);
    this.north = Float64Array.from(sorted, (l) => windComponents(l.fromDeg, l.speed_mps).north_mps);
    this.ground_m = ground;
    this.alpha = opts.surfaceExponent ?? DEFAULT_SURFACE_EXPONENT;
  }

  /** Wind at altitude z_m (MSL) written into out (avoids allocation in hot loops). */
  sample(z_m: number, out: WindVector): WindVector {
    const n = this.z.length;
    if (n === 0) {
      out.east_mps = 0;
      out.north_mps = 0;
      return out;
    }
    const zs = this.z;
    if (z_m >= zs[n - 1]) {
      out.east_mps = this.east[n - 1];
      out.north_mps = this.north[n - 1];
      return out;
    }
    if (z_m <= zs[0]) {
      const hLow = zs[0] - this.ground_m;
      const h = z_m - this.ground_m;
      const k = hLow <= 0 ? 1 : h <= 0 ? 0 : Math.pow(h / hLow, this.alpha);
      out.east_mps = this.east[0] * k;
      out.north_mps = this.north[0] * k;
      return out;
    }
    let lo = 0;
    let hi = n - 1;
    while (hi - lo > 1) {
      const mid = (lo + hi) >> 1;
      if (zs[mid] <= z_m) lo = mid;
      else hi = mid;
    }
    const t = (z_m - zs[lo]) / (zs[hi] - zs[lo]);
    out.east_mps = this.east[lo] + t * (this.east[hi] - this.east[lo]);
    out.north_mps = this.north[lo] + t * (this.north[hi] - this.north[lo]);
    return out;
  }

  /** Wind at altitude z_m (MSL). */
  at(z_m: number): WindVector {
    return this.sample(z_m, { east_mps: 0, north_mps: 0 });
  }

  /** Layer altitudes (m MSL) where the profile has a kink, for integration grids. */
  breakpoints(): number[] {
    return Array.from(this.z);
  }
}
