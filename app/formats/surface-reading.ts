// A surface reading blended under a plan's forecast layers within the plan file's limits.
import { fmt, rangeProblem, schemaMaxItems } from './import-limits';
import {
  mergeSurfaceProfile,
  surfaceProfile,
  type SurfaceProfileOptions,
  type SurfaceReading,
  type WindLayer,
} from '../model';

export interface SurfaceBlend {
  /** The blended layers, m AGL, ascending; the forecast unchanged when `added` is false. */
  layers: WindLayer[];
  /** True when the surface profile went into the layers. */
  added: boolean;
  problems: string[];
}

/**
 * A surface reading's profile blended under forecast layers (m AGL) within the plan's limits
 * (import-limits.ts): the profile's spacing is widened so that the layers stay within the schema's
 * winds.layers maxItems (reported), and a blend with any layer outside the schema's ranges is
 * refused with the altitude, field and range. Never throws.
 */
export function blendSurfaceReading(
  forecastLayers: readonly WindLayer[],
  reading: SurfaceReading,
  opts: SurfaceProfileOptions,
): SurfaceBlend {
  const forecast = [...forecastLayers].sort((a, b) => a.altitude_m - b.altitude_m);
  const max = schemaMaxItems('winds.layers');
  const refuse = (why: string): SurfaceBlend => ({
    layers: forecast,
    added: false,
    problems: [`${why}; the surface profile was not added`],
  });
  for (const [path, v] of [
    ['winds.layers[].speed_mps', reading.speed_mps],
    ['winds.layers[].fromDeg', reading.fromDeg],
  ] as const) {
    const bad = rangeProblem(path, v);
    if (bad) return refuse(`reading ${bad}`);
  }
  // With a forecast the profile's top layer is dropped (it is the forecast's lowest); without one
  // it is kept, so it needs a place of its own.
  const room = max - forecast.length - (forecast.length === 0 ? 1 : 0);
  if (room < 1)
    return refuse(`the plan's wind already holds ${fmt(forecast.length)} layers, the most it can`);
  const step0 = opts.step_m !== undefined && opts.step_m > 0 ? opts.step_m : 10;
  const span = opts.upTo_m - reading.height_m;
  const step = span > 0 ? Math.max(step0, Math.ceil(span / room)) : step0;
  const surface = surfaceProfile(reading, { ...opts, step_m: step });
  if (surface.length === 0)
    return refuse('the reading cannot be extended (height or values not usable)');
  const layers = mergeSurfaceProfile(forecast, surface);
  for (const l of layers) {
    const bad =
      rangeProblem('winds.layers[].altitude_m', l.altitude_m) ??
      rangeProblem('winds.layers[].speed_mps', l.speed_mps) ??
      rangeProblem('winds.layers[].fromDeg', l.fromDeg);
    if (bad) return refuse(`the extended profile at ${fmt(l.altitude_m)} m AGL has ${bad}`);
  }
  if (layers.length > max)
    return refuse(`the blend has ${fmt(layers.length)} layers, more than the plan's ${fmt(max)}`);
  const problems =
    step > step0
      ? [
          `surface profile spaced every ${fmt(step)} m instead of ${fmt(step0)} m so the plan's wind holds at most ${fmt(max)} layers`,
        ]
      : [];
  return { layers, added: true, problems };
}
