// What every safety check shares: its result, the settings, and the helpers that read a plan's
// variants and winds. Figures from published rules are shown for orientation only.
import type { Feature, MultiPolygon, Polygon } from 'geojson';
import { type Plan, planWindProfile, type ResolvedVariant } from '../plan';
import type { PlanResult } from '../planner';

export const DEG = Math.PI / 180;

// WMO: surface wind is measured 10 m above open ground (common practice).
export const SURFACE_HEIGHT_M = 10;

export const LOCAL_RULES =
  'Local rules govern: the figure is shown for orientation and may not apply where you fly.';

/** Settings of the automatic checks (the user sets them to match local rules). */
export interface SafetySettings {
  /** Highest release altitude allowed, m above the release ground. */
  ceiling_m: number;
  /** Areas where nothing may land; `properties.name` labels each. */
  noDropZones: Feature<Polygon | MultiPolygon>[];
  /** Least clearance between a 99 % landing ellipse and a no-drop zone, m. */
  noDropBuffer_m: number;
  /** Margin grown around the hazard area, m. */
  hazardBuffer_m: number;
  /** Share of each fixed-heading variant's control time kept in reserve, %. */
  thrustMargin_pct: number;
  /** Least height of the carrier above the terrain along its track or at hover points, m. */
  terrainClearance_m: number;
}

/**
 * Defaults: 120 m ceiling (common practice; 14 CFR 107.51(b) is 400 ft AGL), 10 m, 20 m, 20 %,
 * 30 m above the terrain (common practice).
 */
export const DEFAULT_SAFETY_SETTINGS: Readonly<SafetySettings> = Object.freeze({
  ceiling_m: 120,
  noDropZones: [],
  noDropBuffer_m: 10,
  hazardBuffer_m: 20,
  thrustMargin_pct: 20,
  terrainClearance_m: 30,
});

export type CheckStatus = 'pass' | 'fail' | 'warn' | 'n/a';

/** One automatic check: a stable id, a verdict, the reason in words and the figures behind it. */
export interface CheckResult {
  id: string;
  title: string;
  status: CheckStatus;
  why: string;
  numbers: Record<string, number | string>;
  items?: Record<string, number | string>[];
  /** Ids of the sites the finding is about, in plan order (the panel links each one). */
  sites?: string[];
}

export interface SafetyReport {
  checks: CheckResult[];
  hazardArea: Feature<Polygon | MultiPolygon>;
  hazardArea_m2: number;
}

export const RANK: Record<CheckStatus, number> = { 'n/a': 0, pass: 1, warn: 2, fail: 3 };
export const worst = (a: CheckStatus, b: CheckStatus): CheckStatus => (RANK[b] > RANK[a] ? b : a);
/** Worst item status; 'n/a' when there is nothing to check. */
export const overall = (items: { status?: number | string }[], n: number): CheckStatus =>
  items.reduce<CheckStatus>((a, i) => worst(a, i.status as CheckStatus), n ? 'pass' : 'n/a');
export const r1 = (x: number): number => Math.round(x * 10) / 10;
export const r3 = (x: number): number => Math.round(x * 1000) / 1000;

/** A site as a reader finds it: its id, and its name in quotes when the name says more. */
export function siteLabel(result: PlanResult, id: string): string {
  const name = result.sites.find((s) => s.id === id)?.name?.trim() ?? '';
  return name && name !== id ? `${id} “${name}”` : id;
}

/** Phrases as a short list: "a", "a and b", "a, b, c and d", "a, b, c and 14 more" (never "1 more"). */
export function shortList(parts: readonly string[], shown = 3): string {
  if (parts.length <= 1) return parts[0] ?? '';
  if (parts.length <= shown + 1) {
    return `${parts.slice(0, -1).join(', ')} and ${parts[parts.length - 1]}`;
  }
  return `${parts.slice(0, shown).join(', ')} and ${parts.length - shown} more`;
}

/** "1 site" / "3 sites". */
export const sitesWord = (n: number): string => `${n} site${n === 1 ? '' : 's'}`;

/** Variants chosen for at least one site, in catalogue order. */
export function usedVariants(plan: Plan, result: PlanResult): ResolvedVariant[] {
  const ids = new Set(result.sites.map((s) => s.variant));
  return plan.variants.filter((v) => ids.has(v.id));
}

/** Wind speeds (m/s) at release, at the surface, and the strongest between them. */
export function windSpeeds(
  plan: Plan,
  result: PlanResult,
): { release_mps: number; surface_mps: number; surfaceHeight_m: number; max_mps: number } {
  const wind = planWindProfile(plan);
  const ground = plan.groundElevation_m;
  const top = result.releaseAltitudeMSL_m;
  const speed = (z: number): number => Math.hypot(wind.at(z).east_mps, wind.at(z).north_mps);
  // 10 m above the ground, or the profile's lowest layer when that is lower (and above ground).
  const low = wind.z.length > 0 ? wind.z[0] : Infinity;
  const surfaceZ = Math.min(
    top,
    low > ground && low < ground + SURFACE_HEIGHT_M ? low : ground + SURFACE_HEIGHT_M,
  );
  const release_mps = speed(top);
  const surface_mps = speed(surfaceZ);
  // Linear between layers and monotone below the lowest, so the column maximum is at a node.
  let max_mps = Math.max(release_mps, surface_mps);
  for (const z of wind.breakpoints())
    if (z > surfaceZ && z < top) max_mps = Math.max(max_mps, speed(z));
  return { release_mps, surface_mps, surfaceHeight_m: surfaceZ - ground, max_mps };
}
