/**
 * Automatic pre-release safety checks, recomputed from a plan, its result and the safety
 * settings, and the readiness rule that combines them with the crew's manual checklist.
 * Figures from published rules are shown for orientation only: local rules govern.
 */
import type { Feature, MultiPolygon, Polygon } from 'geojson';
import {
  civilTwilight,
  densityAt,
  LocalFrame,
  RHO0,
  sunElevationDeg,
  WMM_VALIDITY,
} from '../model';
import {
  boxGap,
  boxOf,
  circumscribed,
  clearanceLocal,
  hazardPieces,
  hazardArea,
  localZone,
} from './hazard-area';
import { type Plan, planWindProfile, type ResolvedVariant, soundingDensity } from '../plan';
import { type PlanResult } from '../planner';

const DEG = Math.PI / 180;

/** Joules per foot-pound-force, exact: 0.3048 m × 4.4482216152605 N (NIST SP 811, App. B). */
export const J_PER_FT_LBF = 0.3048 * 4.4482216152605;
/** 14 CFR 107 subpart D, Category 2: 11 ft-lbf (≈ 14.9 J). Shown with the local-rules caution. */
export const IMPACT_CAT2_FT_LBF = 11;
/** 14 CFR 107 subpart D, Category 3: 25 ft-lbf (≈ 33.9 J). */
export const IMPACT_CAT3_FT_LBF = 25;
// WMO: surface wind is measured 10 m above open ground (common practice).
const SURFACE_HEIGHT_M = 10;

const LOCAL_RULES =
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
}

/** Defaults: 120 m ceiling (common practice; 14 CFR 107.51(b) is 400 ft AGL), 10 m, 20 m, 20 %. */
export const DEFAULT_SAFETY_SETTINGS: Readonly<SafetySettings> = Object.freeze({
  ceiling_m: 120,
  noDropZones: [],
  noDropBuffer_m: 10,
  hazardBuffer_m: 20,
  thrustMargin_pct: 20,
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
}

export interface SafetyReport {
  checks: CheckResult[];
  hazardArea: Feature<Polygon | MultiPolygon>;
  hazardArea_m2: number;
}

const RANK: Record<CheckStatus, number> = { 'n/a': 0, pass: 1, warn: 2, fail: 3 };
const worst = (a: CheckStatus, b: CheckStatus): CheckStatus => (RANK[b] > RANK[a] ? b : a);
/** Worst item status; 'n/a' when there is nothing to check. */
const overall = (items: { status?: number | string }[], n: number): CheckStatus =>
  items.reduce<CheckStatus>((a, i) => worst(a, i.status as CheckStatus), n ? 'pass' : 'n/a');
const r1 = (x: number): number => Math.round(x * 10) / 10;
const r3 = (x: number): number => Math.round(x * 1000) / 1000;

/** Variants chosen for at least one site, in catalogue order. */
function usedVariants(plan: Plan, result: PlanResult): ResolvedVariant[] {
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

function windCheck(plan: Plan, result: PlanResult): CheckResult {
  const w = windSpeeds(plan, result);
  const used = usedVariants(plan, result);
  const items = used.map((v) => {
    const s: CheckStatus =
      v.maxWind_mps === undefined ? 'warn' : w.max_mps > v.maxWind_mps ? 'fail' : 'pass';
    return {
      variant: v.id,
      limit_mps: v.maxWind_mps ?? 'no limit set',
      status: s,
    };
  });
  const status = overall(items, used.length);
  const why =
    status === 'fail'
      ? `Wind up to ${r1(w.max_mps)} m/s between the surface and the release altitude exceeds the limit of ${items
          .filter((i) => i.status === 'fail')
          .map((i) => i.variant)
          .join(', ')}.`
      : status === 'warn'
        ? `No wind limit set for ${items
            .filter((i) => i.status === 'warn')
            .map((i) => i.variant)
            .join(', ')}; the wind could not be checked for it.`
        : status === 'n/a'
          ? 'No variant is used.'
          : `Wind up to ${r1(w.max_mps)} m/s is within every used variant's limit.`;
  return {
    id: 'wind-limit',
    title: 'Wind within variant limits',
    status,
    why,
    numbers: {
      release_mps: r3(w.release_mps),
      surface_mps: r3(w.surface_mps),
      surfaceHeight_m: r3(w.surfaceHeight_m),
      strongest_mps: r3(w.max_mps),
    },
    items,
  };
}

function ceilingCheck(plan: Plan, result: PlanResult, st: SafetySettings): CheckResult {
  const agl = result.releaseAltitudeMSL_m - plan.groundElevation_m;
  const ok = agl <= st.ceiling_m;
  return {
    id: 'ceiling',
    title: 'Release altitude under the ceiling',
    status: ok ? 'pass' : 'fail',
    why:
      `Release at ${r1(agl)} m above the ground is ${ok ? 'within' : 'above'} the ceiling setting ` +
      `of ${r1(st.ceiling_m)} m. Set the ceiling to the local limit (120 m is common practice; ` +
      `14 CFR 107.51(b) allows 400 ft AGL in the US). ${LOCAL_RULES}`,
    numbers: {
      releaseAGL_m: r3(agl),
      releaseMSL_m: r3(result.releaseAltitudeMSL_m),
      ceilingSetting_m: st.ceiling_m,
    },
  };
}

function noDropCheck(result: PlanResult, st: SafetySettings): CheckResult {
  const zones = st.noDropZones;
  if (zones.length === 0 || result.sites.length === 0) {
    return {
      id: 'no-drop-zones',
      title: 'Landing ellipses clear of no-drop zones',
      status: 'n/a',
      why: zones.length === 0 ? 'No no-drop zones are entered.' : 'The plan has no sites.',
      numbers: { zones: zones.length, buffer_m: st.noDropBuffer_m },
    };
  }
  const frame = new LocalFrame(result.releasePoint);
  // Every landing the plan allows: each 99 % ellipse swept over its release window (or widened by
  // its hover zone), the same pieces the hazard area is built from.
  const shapes = hazardPieces(result, frame)
    .filter((p) => p.kind === 'landing')
    .map((hp) => {
      const ring = circumscribed(hp.piece);
      return { site: hp.site, ring, box: boxOf(ring) };
    });
  // Per zone, pieces nearest first by their boxes; the gap between boxes is a lower bound on the
  // clearance, so once it reaches both the buffer and the least clearance found so far no later
  // piece can be reported or lower the least. Same answer as every piece against every zone.
  const found: (number | undefined)[][] = zones.map(() => []);
  let least = Infinity;
  zones.forEach((z, zi) => {
    const local = localZone(frame, z.geometry);
    if (local.polygons.length === 0) return;
    const order = shapes
      .map((sh, i) => ({ i, gap: boxGap(sh.box, local.box) }))
      .sort((a, b) => a.gap - b.gap || a.i - b.i);
    for (const { i, gap } of order) {
      if (gap >= st.noDropBuffer_m && gap >= least) break;
      const c = clearanceLocal(shapes[i].ring, local);
      found[zi][i] = c;
      least = Math.min(least, c);
    }
  });
  const items: Record<string, number | string>[] = [];
  shapes.forEach((sh, i) => {
    zones.forEach((z, zi) => {
      const c = found[zi][i];
      if (c !== undefined && c < st.noDropBuffer_m) {
        const name = String(z.properties?.name ?? `zone ${zi + 1}`);
        items.push({ site: sh.site, zone: name, clearance_m: r1(c) });
      }
    });
  });
  const ok = items.length === 0;
  return {
    id: 'no-drop-zones',
    title: 'Landing ellipses clear of no-drop zones',
    status: ok ? 'pass' : 'fail',
    why: ok
      ? `Every 99 % landing ellipse, over its whole release window, is at least ${st.noDropBuffer_m} m from every no-drop zone.`
      : `${items.length} site–zone pair(s) closer than ${st.noDropBuffer_m} m (0 m = overlapping).`,
    numbers: { zones: zones.length, buffer_m: st.noDropBuffer_m, leastClearance_m: r1(least) },
    items,
  };
}

/** Impact energy (J) of mass_kg at vertical w_mps and horizontal u_mps: ½·m·(w² + u²). */
export function impactEnergy_J(mass_kg: number, w_mps: number, u_mps: number): number {
  return 0.5 * mass_kg * (w_mps * w_mps + u_mps * u_mps);
}

function energyCheck(plan: Plan, result: PlanResult): CheckResult {
  // The same air the planner used: the plan's sounding when it has one, else the ISA offset.
  const density =
    soundingDensity(plan) ?? ((z: number) => densityAt(z, plan.atmosphere.isaOffset_K));
  const used = usedVariants(plan, result);
  const surface = windSpeeds(plan, result).surface_mps;
  const cat2 = IMPACT_CAT2_FT_LBF * J_PER_FT_LBF;
  const cat3 = IMPACT_CAT3_FT_LBF * J_PER_FT_LBF;
  const elevationOf = new Map<string, number>();
  for (const p of plan.sites) if (!elevationOf.has(p.id)) elevationOf.set(p.id, p.elevation_m);
  const items = used.map((v): Record<string, number | string> => {
    const mass = v.payloadMass_kg ?? v.referenceMass_kg;
    if (mass === undefined) return { variant: v.id, status: 'warn', note: 'mass unknown' };
    const massFactor =
      v.payloadMass_kg && v.referenceMass_kg ? Math.sqrt(v.payloadMass_kg / v.referenceMass_kg) : 1;
    // Highest site is the thinnest air and the fastest touchdown: w ∝ √(ρ0/ρ) (momentum theory).
    let elev = -Infinity;
    for (const s of result.sites) {
      if (s.variant === v.id)
        elev = Math.max(elev, elevationOf.get(s.id) ?? plan.groundElevation_m);
    }
    const w = v.descentRate_mps * massFactor * Math.sqrt(RHO0 / density(elev));
    // Steered vehicles may still glide at full authority at touchdown: add w·cot γ to the wind.
    const steer = v.guidance === 'passive' ? 0 : w / Math.tan(v.glideAngle_deg * DEG);
    const u = surface + steer;
    const e = impactEnergy_J(mass, w, u);
    const s: CheckStatus = e > cat3 ? 'fail' : e > cat2 ? 'warn' : 'pass';
    return {
      variant: v.id,
      status: s,
      mass_kg: mass,
      vertical_mps: r3(w),
      horizontal_mps: r3(u),
      speed_mps: r3(Math.hypot(w, u)),
      energy_J: r3(e),
      energy_ftlbf: r3(e / J_PER_FT_LBF),
    };
  });
  const status = overall(items, used.length);
  const limits =
    `14 CFR 107 subpart D (US) allows 11 ft-lbf (14.9 J) for Category 2 and ` +
    `25 ft-lbf (33.9 J) for Category 3 operations over people. ${LOCAL_RULES}`;
  const top = items.reduce(
    (m, i) => Math.max(m, typeof i.energy_J === 'number' ? i.energy_J : 0),
    0,
  );
  return {
    id: 'impact-energy',
    title: 'Impact energy',
    status,
    why:
      (status === 'n/a'
        ? 'No variant is used. '
        : items.some((i) => i.note)
          ? 'Mass unknown for some variant: enter payloadMass_kg. '
          : `Worst case touchdown energy ${r1(top)} J (${r1(top / J_PER_FT_LBF)} ft-lbf). `) +
      limits,
    numbers: {
      worst_J: r3(top),
      worst_ftlbf: r3(top / J_PER_FT_LBF),
      category2_J: r3(cat2),
      category3_J: r3(cat3),
      surfaceWind_mps: r3(surface),
    },
    items,
  };
}

function magneticCheck(plan: Plan, result: PlanResult): CheckResult {
  const fixed = usedVariants(plan, result).some((v) => v.guidance === 'fixed-heading');
  const t = new Date(plan.time).getTime();
  const ok = t >= Date.parse(WMM_VALIDITY.validFrom) && t <= Date.parse(WMM_VALIDITY.validTo);
  return {
    id: 'magnetic-model',
    title: 'Magnetic model valid for the plan time',
    status: !fixed ? 'n/a' : ok ? 'pass' : 'fail',
    why: !fixed
      ? 'No fixed-heading variant is used.'
      : ok
        ? `${plan.time} is within ${WMM_VALIDITY.model} validity.`
        : `${plan.time} is outside ${WMM_VALIDITY.model} validity: magnetic headings cannot be given.`,
    numbers: {
      time: plan.time,
      model: WMM_VALIDITY.model,
      validFrom: WMM_VALIDITY.validFrom,
      validTo: WMM_VALIDITY.validTo,
    },
  };
}

function daylightCheck(plan: Plan, result: PlanResult): CheckResult {
  const when = new Date(plan.time);
  const { lat, lon } = result.releasePoint;
  const tw = civilTwilight(when, lat, lon);
  const t = when.getTime();
  const ok =
    tw.polar === 'day' ||
    (tw.dawn !== null && tw.dusk !== null && t >= tw.dawn.getTime() && t <= tw.dusk.getTime());
  return {
    id: 'daylight',
    title: 'Between civil dawn and dusk',
    status: ok ? 'pass' : 'fail',
    why:
      (ok
        ? 'The plan time is between civil dawn and civil dusk at the release point.'
        : 'The plan time is outside civil twilight (sun more than 6° below the horizon).') +
      ' Night rules differ by country; an override records any authorisation.',
    numbers: {
      dawn:
        tw.dawn?.toISOString() ?? (tw.polar === 'day' ? 'none (polar day)' : 'none (polar night)'),
      dusk:
        tw.dusk?.toISOString() ?? (tw.polar === 'day' ? 'none (polar day)' : 'none (polar night)'),
      sunElevation_deg: r1(sunElevationDeg(when, lat, lon)),
    },
  };
}

function batteryCheck(plan: Plan, result: PlanResult, st: SafetySettings): CheckResult {
  const k = 1 - st.thrustMargin_pct / 100;
  const rows = result.sites.filter((s) => s.guidance === 'fixed-heading');
  const items = rows.flatMap((s) => {
    const v = plan.variants.find((x) => x.id === s.variant);
    const limit = (v?.controlTime_s ?? 0) * k;
    const thrust = s.thrustTime_s ?? 0;
    return thrust > limit ? [{ site: s.id, thrust_s: r1(thrust), limit_s: r1(limit) }] : [];
  });
  return {
    id: 'battery',
    title: 'Thrust time within the battery margin',
    status: rows.length === 0 ? 'n/a' : items.length ? 'fail' : 'pass',
    why:
      rows.length === 0
        ? 'No site uses a fixed-heading variant.'
        : items.length
          ? `${items.length} site(s) need more than ${100 - st.thrustMargin_pct} % of the control time.`
          : `Every fixed-heading site keeps ${st.thrustMargin_pct} % of its control time in reserve.`,
    numbers: { margin_pct: st.thrustMargin_pct, sites: rows.length },
    items,
  };
}

function pHitCheck(plan: Plan, result: PlanResult): CheckResult {
  const items = result.sites
    .filter((s) => !s.meetsRequired)
    .map((s) => ({ site: s.id, variant: s.variant, pHit: r3(s.pHit) }));
  return {
    id: 'p-hit',
    title: 'Every site meets the required P(hit)',
    status: result.sites.length === 0 ? 'n/a' : items.length ? 'fail' : 'pass',
    why: items.length
      ? `${items.length} site(s) below the required P(hit) of ${plan.requiredPHit}.`
      : `All ${result.sites.length} site(s) reach P(hit) ≥ ${plan.requiredPHit}.`,
    numbers: { required: plan.requiredPHit, sites: result.sites.length },
    items,
  };
}

/** Every automatic check for a plan and its result, plus the hazard area (m²). */
export function safetyChecks(
  plan: Plan,
  result: PlanResult,
  settings: SafetySettings = DEFAULT_SAFETY_SETTINGS,
): SafetyReport {
  const hz = hazardArea(result, settings.hazardBuffer_m);
  const vertices =
    hz.feature.geometry.type === 'Polygon'
      ? [hz.feature.geometry.coordinates]
      : hz.feature.geometry.coordinates;
  const hazard: CheckResult = {
    id: 'hazard-area',
    title: 'Hazard area',
    status: 'pass',
    why:
      `Every 99 % landing ellipse swept over its release window, and the ground under the ` +
      `release, grown by ${settings.hazardBuffer_m} m: ${Math.round(hz.area_m2)} m². Keep people out of it.`,
    numbers: { area_m2: Math.round(hz.area_m2), buffer_m: settings.hazardBuffer_m },
    items: vertices.flatMap((poly, part) =>
      poly.flatMap((ring, r) => ring.map(([lon, lat]) => ({ part, ring: r, lat, lon }))),
    ),
  };
  return {
    checks: [
      windCheck(plan, result),
      ceilingCheck(plan, result, settings),
      noDropCheck(result, settings),
      hazard,
      energyCheck(plan, result),
      magneticCheck(plan, result),
      daylightCheck(plan, result),
      batteryCheck(plan, result, settings),
      pHitCheck(plan, result),
    ],
    hazardArea: hz.feature,
    hazardArea_m2: hz.area_m2,
  };
}
