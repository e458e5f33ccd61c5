/** Shared helpers of the unit tests: float comparison, distance on the ellipsoid, test plans. */
import { Geodesic } from 'geographiclib-geodesic';
import { expect } from 'vitest';
import type { Plan, PlanFile } from '../../app/plan/plan';
import { resolvePlan } from '../../app/plan/plan-defaults';

/** Fixed resolution time, inside the WMM2025 validity span, so results never depend on the clock. */
export const NOW = new Date('2026-06-01T10:00:00Z');

/** Asserts |actual − expected| ≤ tol (tol in the quantity's own unit). */
export function expectClose(actual: number, expected: number, tol: number, what = ''): void {
  expect(
    Math.abs(actual - expected),
    `${what ? `${what}: ` : ''}actual ${actual}, expected ${expected} ± ${tol}`,
  ).toBeLessThanOrEqual(tol);
}

/**
 * Geodesic distance (m) between two WGS84 points by GeographicLib (Karney 2013, npm
 * geographiclib-geodesic): a reference library independent of the core's proj4 frame.
 */
export function geodesicDistance_m(
  a: { lat: number; lon: number },
  b: { lat: number; lon: number },
): number {
  return Geodesic.WGS84.Inverse(a.lat, a.lon, b.lat, b.lon).s12 as number;
}

/** Asserts two WGS84 points are within tol_m metres of each other (GeographicLib distance). */
export function expectNearLatLng(
  a: { lat: number; lon: number },
  b: { lat: number; lon: number },
  tol_m: number,
  what = '',
): void {
  const d = geodesicDistance_m(a, b);
  expect(
    d,
    `${what ? `${what}: ` : ''}(${a.lat}, ${a.lon}) is ${d} m from (${b.lat}, ${b.lon}), allowed ${tol_m} m`,
  ).toBeLessThanOrEqual(tol_m);
}

/** WGS84 point `east_m`, `north_m` from `from` along the geodesic (GeographicLib Direct). */
export function offsetLatLng(
  from: { lat: number; lon: number },
  east_m: number,
  north_m: number,
): { lat: number; lon: number } {
  const s = Math.hypot(east_m, north_m);
  if (s === 0) return { lat: from.lat, lon: from.lon };
  const az = (Math.atan2(east_m, north_m) * 180) / Math.PI;
  const r = Geodesic.WGS84.Direct(from.lat, from.lon, az, s);
  return { lat: r.lat2 as number, lon: r.lon2 as number };
}

/** Release point of the test plans (an invented open-country spot). */
export const RELEASE = { lat: 47.5, lon: 21.1 };

/**
 * A valid resolved Plan: one passive variant, one site 20 m north-east of the release point,
 * calm air, a hovering carrier at 100 m AGL, no uncertainty, fixed time and seed. `overrides`
 * replace whole top-level fields of the plan file before defaults are filled in.
 */
export function makePlan(overrides: Partial<PlanFile> = {}): Plan {
  const base: PlanFile = {
    format: 'seedfall-plan',
    version: 1,
    name: 'unit test plan',
    time: NOW.toISOString(),
    groundElevation_m: 0,
    release: { lat: RELEASE.lat, lon: RELEASE.lon, altitude_m: 100, reference: 'AGL' },
    carrier: { groundSpeed_mps: 0, trackDeg: 0 },
    winds: { reference: 'AGL', layers: [] },
    variants: [{ id: 'drifter', guidance: 'passive', descentRate_mps: 3 }],
    sites: [{ id: 's1', ...offsetLatLng(RELEASE, 14, 14) }],
    monteCarlo: { samples: 200, seed: 7 },
  };
  return resolvePlan({ ...base, ...overrides }, { now: NOW });
}
