import { DEFAULT_SURFACE_EXPONENT, type Uncertainty, type WindLayer } from '../model';
import type { Plan, PlanFile, ResolvedSite, ResolvedVariant, Site, Variant } from './plan';

/**
 * Every default a plan file may leave out, in one place so docs/plan-format.md and the UI can
 * show them. `time` has no fixed default: it is the moment the plan is resolved.
 */
export const DEFAULTS = Object.freeze({
  name: 'Untitled plan',
  groundElevation_m: 0,
  atmosphere: Object.freeze({ isaOffset_K: 0 }),
  winds: Object.freeze({
    reference: 'AGL' as const,
    /** No layers means calm air. */
    layers: Object.freeze([]) as readonly WindLayer[],
    surfaceExponent: DEFAULT_SURFACE_EXPONENT,
  }),
  release: Object.freeze({ reference: 'AGL' as const }),
  /** Ground speed 0 is a hovering carrier. */
  carrier: Object.freeze({ groundSpeed_mps: 0, trackDeg: 0 }),
  /** glideAngle_deg 90 and controlTime_s 0 describe a passive variant (no steering). */
  variant: Object.freeze({ glideAngle_deg: 90, controlTime_s: 0, entryLoss_m: 0 }),
  /** A site's elevation_m defaults to the plan's groundElevation_m. */
  site: Object.freeze({ tolerance_m: 10 }),
  uncertainty: Object.freeze({
    windSpeed_mps: 0,
    windCorrelation_m: 300,
    descentRate_pct: 0,
    releasePosition_m: 0,
    heading_deg: 0,
    releaseTiming_s: 0,
    turbulence: 'auto',
  } satisfies Uncertainty),
  monteCarlo: Object.freeze({ samples: 2000, seed: 1 }),
  requiredPHit: 0.9,
});

function resolveVariant(v: Variant): ResolvedVariant {
  return {
    ...v,
    name: v.name ?? v.id,
    glideAngle_deg: v.glideAngle_deg ?? DEFAULTS.variant.glideAngle_deg,
    controlTime_s: v.controlTime_s ?? DEFAULTS.variant.controlTime_s,
    entryLoss_m: v.entryLoss_m ?? DEFAULTS.variant.entryLoss_m,
  };
}

function resolveSite(s: Site, groundElevation_m: number): ResolvedSite {
  return {
    ...s,
    name: s.name ?? s.id,
    elevation_m: s.elevation_m ?? groundElevation_m,
    tolerance_m: s.tolerance_m ?? DEFAULTS.site.tolerance_m,
    ...(s.elevation_m === undefined ? { elevationDefaulted: true as const } : {}),
  };
}

/**
 * Fills every default of a (validated) plan file; returns new objects and never mutates `file`.
 * Wind layers come back sorted by altitude (stable for equal altitudes). `opts.now` sets the
 * default release time (default: the current time).
 */
export function resolvePlan(file: PlanFile, opts: { now?: Date } = {}): Plan {
  const groundElevation_m = file.groundElevation_m ?? DEFAULTS.groundElevation_m;
  const layers = (file.winds?.layers ?? DEFAULTS.winds.layers)
    .map((l) => ({ ...l }))
    .sort((a, b) => a.altitude_m - b.altitude_m);
  const u = file.uncertainty ?? {};
  const du = DEFAULTS.uncertainty;
  return {
    format: file.format,
    version: file.version,
    name: file.name ?? DEFAULTS.name,
    time: file.time ?? (opts.now ?? new Date()).toISOString(),
    groundElevation_m,
    atmosphere: {
      isaOffset_K: file.atmosphere?.isaOffset_K ?? DEFAULTS.atmosphere.isaOffset_K,
      ...(file.atmosphere?.sounding ? { sounding: structuredClone(file.atmosphere.sounding) } : {}),
    },
    winds: {
      reference: file.winds?.reference ?? DEFAULTS.winds.reference,
      layers,
      surfaceExponent: file.winds?.surfaceExponent ?? DEFAULTS.winds.surfaceExponent,
      ...(file.winds?.forecasts ? { forecasts: structuredClone(file.winds.forecasts) } : {}),
    },
    release: {
      lat: file.release.lat,
      lon: file.release.lon,
      altitude_m: file.release.altitude_m,
      reference: file.release.reference ?? DEFAULTS.release.reference,
    },
    carrier: {
      groundSpeed_mps: file.carrier?.groundSpeed_mps ?? DEFAULTS.carrier.groundSpeed_mps,
      trackDeg: file.carrier?.trackDeg ?? DEFAULTS.carrier.trackDeg,
    },
    variants: file.variants.map(resolveVariant),
    sites: file.sites.map((s) => resolveSite(s, groundElevation_m)),
    uncertainty: {
      windSpeed_mps: u.windSpeed_mps ?? du.windSpeed_mps,
      windCorrelation_m: u.windCorrelation_m ?? du.windCorrelation_m,
      descentRate_pct: u.descentRate_pct ?? du.descentRate_pct,
      releasePosition_m: u.releasePosition_m ?? du.releasePosition_m,
      heading_deg: u.heading_deg ?? du.heading_deg,
      releaseTiming_s: u.releaseTiming_s ?? du.releaseTiming_s,
      turbulence: u.turbulence ?? du.turbulence,
      // Set values only: absent means "modelled" (docs/model.md §8a).
      ...(u.gust_mps !== undefined ? { gust_mps: u.gust_mps } : {}),
      ...(u.gustTime_s !== undefined ? { gustTime_s: u.gustTime_s } : {}),
      ...(u.verticalAir_mps !== undefined ? { verticalAir_mps: u.verticalAir_mps } : {}),
    },
    monteCarlo: {
      samples: file.monteCarlo?.samples ?? DEFAULTS.monteCarlo.samples,
      seed: file.monteCarlo?.seed ?? DEFAULTS.monteCarlo.seed,
    },
    requiredPHit: file.requiredPHit ?? DEFAULTS.requiredPHit,
    // Safety defaults live with the checks (DEFAULT_SAFETY_SETTINGS, DEFAULT_MANUAL_ITEMS).
    ...(file.safety ? { safety: structuredClone(file.safety) } : {}),
    ...(file.terrain ? { terrain: { file: file.terrain.file } } : {}),
  };
}
