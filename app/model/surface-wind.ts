/**
 * Wind near the ground from one surface reading (an anemometer at a known height), extended up to
 * the lowest forecast layer by the log law or the power law (docs/model.md §12), and merged under a
 * forecast profile. Direction is held constant with height: turning of the wind near the ground
 * (Ekman spiral) is not modelled.
 */
import type { WindLayer } from './types';
import { windComponents, windFromComponents } from './wind';

export type TerrainClass =
  'sea' | 'smooth' | 'open' | 'roughly-open' | 'rough' | 'very-rough' | 'closed' | 'chaotic';

export interface Terrain {
  label: string;
  /** Roughness length, m: Davenport–Wieringa classification (WMO). */
  z0_m: number;
  /** Power-law (Hellmann) exponent in neutral air; see `source`. */
  alpha: number;
  /** Where alpha comes from. */
  source: string;
}

const KALT = 'Kaltschmitt et al., Renewable Energy (2007) p. 55, neutral';

/** Neutral Hellmann exponents of Kaltschmitt et al., Renewable Energy (2007) p. 55. */
export const HELLMANN_NEUTRAL = Object.freeze({
  openWater: 0.1,
  flatOpenCoast: 0.16,
  inhabited: 0.34,
});

/**
 * Terrain classes. z0: Davenport–Wieringa (WMO code list). α: published where a source gives it;
 * the others are interpolated in log z0 between the neighbouring sourced classes (smooth between
 * sea 0.10 and open 1/7; rough and very rough between 0.2 at z0 0.1 m and 0.34 at z0 1 m). The
 * flat-open-coast 0.16 is not a class: it exceeds open land's 1/7 (a coast is a different
 * stability regime, not a smoother surface), so it is offered as HELLMANN_NEUTRAL.flatOpenCoast.
 */
export const TERRAIN: Readonly<Record<TerrainClass, Terrain>> = Object.freeze({
  sea: { label: 'sea, open water', z0_m: 0.0002, alpha: 0.1, source: `${KALT}: open water` },
  smooth: {
    label: 'smooth: mud flats, snow, featureless land',
    z0_m: 0.005,
    alpha: 0.13,
    source: 'interpolated in log z0 (sea … open)',
  },
  open: {
    label: 'open: flat grassland, few obstacles',
    z0_m: 0.03,
    alpha: 1 / 7,
    source: 'open land, common practice',
  },
  'roughly-open': {
    label: 'roughly open: low crops, scattered obstacles',
    z0_m: 0.1,
    alpha: 0.2,
    source: 'IEC 61400-1 normal wind profile',
  },
  rough: {
    label: 'rough: high crops, scattered buildings',
    z0_m: 0.25,
    alpha: 0.26,
    source: 'interpolated in log z0 (roughly-open … closed)',
  },
  'very-rough': {
    label: 'very rough: orchards, bushland, mixed farm buildings',
    z0_m: 0.5,
    alpha: 0.3,
    source: 'interpolated in log z0 (roughly-open … closed)',
  },
  closed: {
    label: 'closed: forest, suburb',
    z0_m: 1.0,
    alpha: 0.34,
    source: `${KALT}: human inhabited areas`,
  },
  chaotic: {
    label: 'chaotic: city centre',
    z0_m: 2.0,
    alpha: 0.4,
    source: 'city centre, from memory',
  },
});

export interface SurfaceReading {
  /** Height of the measurement above ground, m. */
  height_m: number;
  speed_mps: number;
  /** Direction the wind blows from, degrees true. */
  fromDeg: number;
}

export interface SurfaceProfileOptions {
  law: 'log' | 'power';
  terrain: TerrainClass;
  /** Top of the profile, m AGL: normally the lowest forecast layer. */
  upTo_m: number;
  /** Spacing of the layers, m (default 10). */
  step_m?: number;
  /** Overrides the class's power-law exponent. */
  alpha?: number;
  /** Overrides the class's roughness length, m. */
  z0_m?: number;
}

/** Speed ratio u(z)/u(z_ref) by the chosen law (z, z_ref in m above ground). */
export function speedRatio(
  z_m: number,
  zRef_m: number,
  law: 'log' | 'power',
  z0_m: number,
  alpha: number,
): number {
  // Log law u = (u*/κ)·ln(z/z0): κ and u* cancel in the ratio.
  if (law === 'log') return Math.log(z_m / z0_m) / Math.log(zRef_m / z0_m);
  return Math.pow(z_m / zRef_m, alpha);
}

/**
 * Wind layers (m AGL, ascending) from the reading's height up to upTo_m, every step_m and at
 * upTo_m, direction constant. Returns [] when the reading is unusable (non-finite values, a height
 * not above z0 for the log law, or a negative speed).
 */
export function surfaceProfile(reading: SurfaceReading, opts: SurfaceProfileOptions): WindLayer[] {
  const t = TERRAIN[opts.terrain] ?? TERRAIN.open;
  const z0 = opts.z0_m ?? t.z0_m;
  const alpha = opts.alpha ?? t.alpha;
  const { height_m: zr, speed_mps: ur, fromDeg } = reading;
  const step = opts.step_m !== undefined && opts.step_m > 0 ? opts.step_m : 10;
  const ok =
    [zr, ur, fromDeg, opts.upTo_m, z0, alpha].every(Number.isFinite) &&
    zr > 0 &&
    ur >= 0 &&
    (opts.law !== 'log' || (z0 > 0 && zr > z0));
  if (!ok) return [];
  const layer = (z: number): WindLayer => ({
    altitude_m: z,
    fromDeg,
    speed_mps: z === zr ? ur : ur * speedRatio(z, zr, opts.law, z0, alpha),
  });
  const out = [layer(zr)];
  // At most 10 000 layers, however small the step.
  const n = Math.min(10000, Math.ceil((opts.upTo_m - zr) / step - 1e-9));
  for (let i = 1; i < n; i++) out.push(layer(zr + i * step));
  if (opts.upTo_m > zr) out.push(layer(opts.upTo_m));
  return out;
}

/**
 * Surface layers under a forecast (both in the same reference). Forecast layers are kept as they
 * are; surface layers at or above the lowest forecast layer are dropped. Below it, the wind blends
 * linearly in height from the surface profile (at the reading) to the forecast's lowest layer
 * carried down with the surface profile's shape, so the reading is kept and the profile meets the
 * forecast without a jump: w = (z − z_r)/(z_f − z_r), v = (1 − w)·S(z) + w·F·|S(z)|/|S(z_f)|.
 */
export function mergeSurfaceProfile(
  forecastLayers: readonly WindLayer[],
  surfaceLayers: readonly WindLayer[],
): WindLayer[] {
  const forecast = [...forecastLayers].sort((a, b) => a.altitude_m - b.altitude_m);
  const surface = [...surfaceLayers].sort((a, b) => a.altitude_m - b.altitude_m);
  if (forecast.length === 0) return surface;
  const low = forecast[0];
  const below = surface.filter((l) => l.altitude_m < low.altitude_m);
  if (below.length === 0) return forecast;
  const zr = below[0].altitude_m;
  // Surface speed at the forecast's lowest layer (interpolated), else at the top surface layer.
  const next = surface.find((l) => l.altitude_m >= low.altitude_m);
  const last = below[below.length - 1];
  const sTop = next
    ? last.speed_mps +
      ((next.speed_mps - last.speed_mps) * (low.altitude_m - last.altitude_m)) /
        (next.altitude_m - last.altitude_m)
    : last.speed_mps;
  const F = windComponents(low.fromDeg, low.speed_mps);
  const span = low.altitude_m - zr;
  const blended = below.map((l): WindLayer => {
    const w = span > 0 ? (l.altitude_m - zr) / span : 0;
    const S = windComponents(l.fromDeg, l.speed_mps);
    const shape = sTop > 0 ? l.speed_mps / sTop : 1;
    const v = windFromComponents({
      east_mps: (1 - w) * S.east_mps + w * F.east_mps * shape,
      north_mps: (1 - w) * S.north_mps + w * F.north_mps * shape,
    });
    // Keep the reading verbatim (no round trip through components).
    if (w === 0) return { ...l };
    return { altitude_m: l.altitude_m, fromDeg: v.fromDeg, speed_mps: v.speed_mps };
  });
  return [...blended, ...forecast];
}
