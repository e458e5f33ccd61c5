// P(hit) and CEP of one site over release altitude: the planner run at each height.
import type { ElevationModel } from '../model';
import type { Plan } from '../plan';
import { planDrop } from './planner';

export interface SweepPoint {
  /** Release altitude above the plan ground, m. */
  altitude_m: number;
  pHit: number;
  /** Monte Carlo standard error of pHit. */
  pHitSE: number;
  cep_m: number;
  reachable: boolean;
}

/**
 * P(hit), CEP (m) and reachability of one site with one variant at each release altitude
 * (m above plan ground). Every altitude uses the same Monte Carlo stream (the reduced plan has
 * one site and one variant), so the curve's steps come from the altitude, not from resampling.
 * Altitudes at or below the site's ground are left out (nothing falls there).
 * Throws when the site or variant id is not in the plan.
 */
export function altitudeSweep(
  plan: Plan,
  siteId: string,
  variantId: string,
  altitudesAGL_m: number[],
  opts: { samples?: number; terrain?: ElevationModel } = {},
): SweepPoint[] {
  const site = plan.sites.find((s) => s.id === siteId);
  const variant = plan.variants.find((v) => v.id === variantId);
  if (!site) throw new Error(`altitudeSweep: no site "${siteId}" in the plan`);
  if (!variant) throw new Error(`altitudeSweep: no variant "${variantId}" in the plan`);
  const samples = Math.max(1, Math.round(opts.samples ?? Math.min(plan.monteCarlo.samples, 400)));
  const aboveSite = altitudesAGL_m.filter((h) => plan.groundElevation_m + h > site.elevation_m);
  return aboveSite.map((altitude_m) => {
    const one: Plan = {
      ...plan,
      release: { ...plan.release, altitude_m, reference: 'AGL' },
      sites: [{ ...site, variant: variant.id }],
      variants: [variant],
      monteCarlo: { ...plan.monteCarlo, samples },
    };
    const s = planDrop(one, { probeSamples: 64, terrain: opts.terrain }).sites[0];
    return { altitude_m, pHit: s.pHit, pHitSE: s.pHitSE, cep_m: s.cep_m, reachable: s.reachable };
  });
}

/** Release heights above plan ground for a sweep: 0.4 to 2 times the planned one. */
export function sweepHeightsAGL(plan: Plan, releaseAltitudeMSL_m: number): number[] {
  const agl = releaseAltitudeMSL_m - plan.groundElevation_m;
  return [0.4, 0.55, 0.7, 0.85, 1, 1.2, 1.4, 1.7, 2].map((k) => Math.round(agl * k));
}
