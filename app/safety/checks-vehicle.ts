// Checks of the vehicles: impact energy against published categories, battery, P(hit).
import { densityAt, RHO0 } from '../model';
import { massFactor, type Plan, type ResolvedVariant, soundingDensity } from '../plan';
import { pHitText, type PlanResult } from '../planner';
import {
  type CheckResult,
  type CheckStatus,
  DEG,
  LOCAL_RULES,
  overall,
  r1,
  r3,
  type SafetySettings,
  shortList,
  siteLabel,
  sitesWord,
  usedVariants,
  windSpeeds,
} from './check-result';

/** Joules per foot-pound-force, exact: 0.3048 m × 4.4482216152605 N (NIST SP 811, App. B). */
export const J_PER_FT_LBF = 0.3048 * 4.4482216152605;
/** 14 CFR 107 subpart D, Category 2: 11 ft-lbf (≈ 14.9 J). Shown with the local-rules caution. */
export const IMPACT_CAT2_FT_LBF = 11;
/** 14 CFR 107 subpart D, Category 3: 25 ft-lbf (≈ 33.9 J). */
export const IMPACT_CAT3_FT_LBF = 25;
/** Impact energy (J) of mass_kg at vertical w_mps and horizontal u_mps: ½·m·(w² + u²). */
export function impactEnergy_J(mass_kg: number, w_mps: number, u_mps: number): number {
  return 0.5 * mass_kg * (w_mps * w_mps + u_mps * u_mps);
}

/** Touchdown of one variant on ground at elevation_m: speeds (m/s) and energy (J, null without a mass). */
export interface Touchdown {
  variant: string;
  mass_kg: number | null;
  vertical_mps: number;
  horizontal_mps: number;
  speed_mps: number;
  energy_J: number | null;
}

/**
 * Touchdown speeds and energy of variant `v` landing on ground at elevation_m in the plan's air:
 * vertical w ∝ √(ρ0/ρ) (momentum theory) at that ground, horizontal the surface wind plus, for a
 * steered vehicle still gliding at full authority, w·cot γ; energy ½·m·(w² + u²).
 */
export function touchdown(
  plan: Plan,
  v: ResolvedVariant,
  elevation_m: number,
  surfaceWind_mps: number,
): Touchdown {
  // The same air the planner used: the plan's sounding when it has one, else the ISA offset.
  const density =
    soundingDensity(plan) ?? ((z: number) => densityAt(z, plan.atmosphere.isaOffset_K));
  const mass = v.payloadMass_kg ?? v.referenceMass_kg ?? null;
  const w = v.descentRate_mps * massFactor(v) * Math.sqrt(RHO0 / density(elevation_m));
  const steer = v.guidance === 'passive' ? 0 : w / Math.tan(v.glideAngle_deg * DEG);
  const u = surfaceWind_mps + steer;
  return {
    variant: v.id,
    mass_kg: mass,
    vertical_mps: w,
    horizontal_mps: u,
    speed_mps: Math.hypot(w, u),
    energy_J: mass === null ? null : impactEnergy_J(mass, w, u),
  };
}

/** Touchdown of every variant of the plan at one site (the details view and the brief). */
export function siteTouchdowns(plan: Plan, result: PlanResult, siteId: string): Touchdown[] {
  const site = plan.sites.find((s) => s.id === siteId);
  const elev = site?.elevation_m ?? plan.groundElevation_m;
  const surface = windSpeeds(plan, result).surface_mps;
  return plan.variants.map((v) => touchdown(plan, v, elev, surface));
}

export function energyCheck(plan: Plan, result: PlanResult): CheckResult {
  const used = usedVariants(plan, result);
  const surface = windSpeeds(plan, result).surface_mps;
  const cat2 = IMPACT_CAT2_FT_LBF * J_PER_FT_LBF;
  const cat3 = IMPACT_CAT3_FT_LBF * J_PER_FT_LBF;
  const elevationOf = new Map<string, number>();
  for (const p of plan.sites) if (!elevationOf.has(p.id)) elevationOf.set(p.id, p.elevation_m);
  const items = used.map((v): Record<string, number | string> => {
    // Highest site is the thinnest air and the fastest touchdown.
    let elev = -Infinity;
    for (const s of result.sites) {
      if (s.variant === v.id)
        elev = Math.max(elev, elevationOf.get(s.id) ?? plan.groundElevation_m);
    }
    const t = touchdown(plan, v, elev, surface);
    if (t.mass_kg === null || t.energy_J === null)
      return { variant: v.id, status: 'warn', note: 'mass unknown' };
    const e = t.energy_J;
    const s: CheckStatus = e > cat3 ? 'fail' : e > cat2 ? 'warn' : 'pass';
    return {
      variant: v.id,
      status: s,
      mass_kg: t.mass_kg,
      vertical_mps: r3(t.vertical_mps),
      horizontal_mps: r3(t.horizontal_mps),
      speed_mps: r3(t.speed_mps),
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

export function batteryCheck(plan: Plan, result: PlanResult, st: SafetySettings): CheckResult {
  const k = 1 - st.thrustMargin_pct / 100;
  const rows = result.sites.filter((s) => s.guidance === 'fixed-heading');
  const items = rows.flatMap((s) => {
    const v = plan.variants.find((x) => x.id === s.variant);
    const limit = (v?.controlTime_s ?? 0) * k;
    const thrust = s.thrustTime_s ?? 0;
    return thrust > limit ? [{ site: s.id, thrust_s: r1(thrust), limit_s: r1(limit) }] : [];
  });
  const named = items.map(
    (i) => `${siteLabel(result, i.site)} (${i.thrust_s} s of thrust, ${i.limit_s} s allowed)`,
  );
  return {
    id: 'battery',
    title: 'Thrust time within the battery margin',
    status: rows.length === 0 ? 'n/a' : items.length ? 'fail' : 'pass',
    why:
      rows.length === 0
        ? 'No site uses a fixed-heading variant.'
        : items.length
          ? `${sitesWord(items.length)} need${items.length === 1 ? 's' : ''} more than ` +
            `${100 - st.thrustMargin_pct} % of the control time: ${shortList(named)}.`
          : `Every fixed-heading site keeps ${st.thrustMargin_pct} % of its control time in reserve.`,
    numbers: { margin_pct: st.thrustMargin_pct, sites: rows.length },
    items,
    sites: items.map((i) => i.site),
  };
}

export function pHitCheck(plan: Plan, result: PlanResult): CheckResult {
  const below = result.sites.filter((s) => !s.meetsRequired);
  const items = below.map((s) => ({
    site: s.id,
    variant: s.variant,
    pHit: r3(s.pHit),
    pHitSE: r3(s.pHitSE),
    ...(s.recommendation.kind === 'unreachable' ? { note: 'no variant can reach this site' } : {}),
  }));
  const named = below.map(
    (s) =>
      `${siteLabel(result, s.id)} (` +
      (s.recommendation.kind === 'unreachable'
        ? 'no variant can reach it'
        : `${pHitText(s.pHit, s.pHitSE)} with ${s.variant}`) +
      ')',
  );
  return {
    id: 'p-hit',
    title: 'Every site meets the required P(hit)',
    status: result.sites.length === 0 ? 'n/a' : items.length ? 'fail' : 'pass',
    why: items.length
      ? `${sitesWord(items.length)} ${items.length === 1 ? 'is' : 'are'} below the required ` +
        `P(hit) of ${plan.requiredPHit}: ` +
        `${shortList(named)}.`
      : `All ${result.sites.length} site(s) reach P(hit) ≥ ${plan.requiredPHit}.`,
    numbers: { required: plan.requiredPHit, sites: result.sites.length },
    items,
    sites: items.map((i) => i.site),
  };
}
