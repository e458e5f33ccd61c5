import { distance_m, FallTable, G0, type WindProfile } from '../model';
import type { Plan, ResolvedVariant } from './plan';
import schema from './plan.schema.json';
import { planWindProfile, soundingDensity } from './plan-air';

const DEG = Math.PI / 180;

/**
 * Working radius of the planner's local azimuthal-equidistant frame at the release point, m
 * (docs/plan-format.md, "Limits across fields"). Every site must lie within it, and so must each
 * variant's farthest nominal landing relative to its own release (throw + drift + reach).
 */
export const FRAME_LIMIT_M = 50_000;

/**
 * Flown mass over the mass the descent rate was measured with. Descent scales with √(mass
 * ratio) only for the same rotor carrying a different load; 1/4 to 4 halves or doubles the rate.
 */
export const MASS_RATIO_MIN = 0.25;
export const MASS_RATIO_MAX = 4;

/** Descent rate after mass scaling, m/s: the same range as variants[].descentRate_mps. */
export const EFFECTIVE_DESCENT_MIN_MPS = 0.05;
export const EFFECTIVE_DESCENT_MAX_MPS = 30;

/** Integration cells per fall for the bound: ample for a 50 km yes/no, cheap for 100 variants. */
const BOUND_CELLS = 512;

/** A problem in house form: `message` starts with `path`. */
export interface LimitIssue {
  path: string;
  message: string;
}

const km = (m: number): string => `${(m / 1000).toFixed(1)} km`;

/** √(payload / reference), 1 without both masses. */
export function massFactor(v: { payloadMass_kg?: number; referenceMass_kg?: number }): number {
  return v.payloadMass_kg && v.referenceMass_kg
    ? Math.sqrt(v.payloadMass_kg / v.referenceMass_kg)
    : 1;
}

/** The plan's wind profile and air density, built once for all its variants. */
export interface PlanAir {
  wind: WindProfile;
  density?: (z_m: number) => number;
}

export function planAir(plan: Plan): PlanAir {
  return { wind: planWindProfile(plan), density: soundingDensity(plan) };
}

/**
 * Farthest a variant's nominal landing can be from its release point for any site of the plan,
 * m, with the numbers behind it: forward throw + the largest drift to any ground between the
 * release and the lowest site + the full steering reach. An upper bound of what planDrop uses.
 */
export function variantExtent(
  plan: Plan,
  v: ResolvedVariant,
  planAirOnce: PlanAir = planAir(plan),
): { extent_m: number; fallTime_s: number; drift_m: number; reach_m: number; throw_m: number } {
  const { wind, density } = planAirOnce;
  const ground = plan.groundElevation_m;
  const top = plan.release.altitude_m + (plan.release.reference === 'AGL' ? ground : 0);
  const lowest = plan.sites.reduce((lo, s) => Math.min(lo, s.elevation_m), Infinity);
  const table = new FallTable({
    top_m: top,
    bottom_m: lowest,
    descentRateSL_mps: v.descentRate_mps * massFactor(v),
    entryLoss_m: v.entryLoss_m,
    isaOffset_K: plan.atmosphere.isaOffset_K,
    density,
    wind,
    cell_m: Math.max(1, (top - lowest) / BOUND_CELLS),
  });
  let drift = 0;
  for (let i = 0; i < table.t.length; i++) {
    drift = Math.max(drift, Math.hypot(table.dEast[i], table.dNorth[i]));
  }
  const w = wind.at(top);
  const track = plan.carrier.trackDeg * DEG;
  const speed = plan.carrier.groundSpeed_mps;
  const air = Math.hypot(
    speed * Math.sin(track) - w.east_mps,
    speed * Math.cos(track) - w.north_mps,
  );
  const throw_m = air * (v.throwTime_s ?? table.wTop_mps / G0);
  const reach_m =
    v.guidance === 'passive'
      ? 0
      : table.steeredDrop(v.controlTime_s) / Math.tan(v.glideAngle_deg * DEG);
  return {
    extent_m: throw_m + drift + reach_m,
    fallTime_s: table.fallTime_s,
    drift_m: drift,
    reach_m,
    throw_m,
  };
}

/**
 * Limits across fields that the schema cannot express, on a plan that passed every other check:
 * sites within FRAME_LIMIT_M of the release point, and each variant's farthest landing within
 * FRAME_LIMIT_M of its release. Then every release point and landing planDrop reports lies within
 * 3 × FRAME_LIMIT_M of the plan's release point (docs/plan-format.md).
 */
export function frameLimitIssues(plan: Plan): LimitIssue[] {
  const out: LimitIssue[] = [];
  const origin = plan.release;
  plan.sites.forEach((s, i) => {
    const d = distance_m(origin, s);
    if (!(d <= FRAME_LIMIT_M)) {
      const at = `sites[${i}]`;
      out.push({
        path: at,
        message:
          `${at} ${JSON.stringify(s.name)} is ${Number.isFinite(d) ? km(d) : 'half the globe'} from the ` +
          `release point (release.lat, release.lon); sites must be within ${km(FRAME_LIMIT_M)} of it`,
      });
    }
  });
  if (plan.sites.length === 0 || out.length > 0) return out;
  const air = planAir(plan);
  plan.variants.forEach((v, i) => {
    const e = variantExtent(plan, v, air);
    if (e.extent_m <= FRAME_LIMIT_M) return;
    const at = `variants[${i}]`;
    const steer =
      v.guidance === 'passive'
        ? ''
        : `, steering reach ${km(e.reach_m)} (glideAngle_deg, controlTime_s)`;
    out.push({
      path: at,
      message:
        `${at} ${JSON.stringify(v.id)} would land up to ${km(e.extent_m)} from its release: ` +
        `${e.fallTime_s.toFixed(0)} s fall from release.altitude_m at descentRate_mps ` +
        `${v.descentRate_mps} drifts ${km(e.drift_m)} in winds.layers, throw ${km(e.throw_m)}${steer}; ` +
        `at most ${km(FRAME_LIMIT_M)} is supported`,
    });
  });
  return out;
}

/**
 * Most Monte Carlo flights one plan may ask for: sites × variants × monteCarlo.samples. Every site
 * is planned with every variant; 20 million flights (1,000 sites × 10 variants × 2,000 samples) is
 * about ten seconds on one core (npm run bench), so a plan can never ask for hours of work.
 */
export const MAX_PLAN_FLIGHTS = 20_000_000;

/** The work limit above, or null when the plan is within it. */
export function workIssue(plan: Plan): LimitIssue | null {
  const sites = plan.sites.length;
  const variants = plan.variants.length;
  const samples = plan.monteCarlo.samples;
  const flights = sites * variants * samples;
  if (flights <= MAX_PLAN_FLIGHTS) return null;
  return {
    path: 'monteCarlo.samples',
    message:
      `monteCarlo.samples ${samples} with ${sites} sites and ${variants} variants asks for ` +
      `${flights.toExponential(2)} Monte Carlo flights (sites × variants × samples); at most ` +
      `${MAX_PLAN_FLIGHTS.toLocaleString('en-US')} are allowed: lower the samples to at most ` +
      `${Math.max(1, Math.floor(MAX_PLAN_FLIGHTS / Math.max(1, sites * variants)))} or split the plan`,
  };
}

/** Largest plan file read, bytes (CLI and app): a plan at every documented maximum is far smaller. */
export const MAX_PLAN_BYTES = 32 * 1024 * 1024;

/** Deepest nesting a plan file may have; a plan needs 8 (a zone vertex's coordinate). */
export const MAX_PLAN_DEPTH = 32;

type Json = Record<string, unknown>;
const isRecord = (x: unknown): x is Json =>
  typeof x === 'object' && x !== null && !Array.isArray(x);
const isNum = (x: unknown): x is number => typeof x === 'number' && Number.isFinite(x);
const keyText = (k: string): string => (k.length > 40 ? `${k.slice(0, 40)}…` : k);

/**
 * The first place `raw` nests deeper than MAX_PLAN_DEPTH, as an issue, or null. Walks with its
 * own stack, so it is safe on input that would overflow the call stack of the schema check,
 * structuredClone or JSON.stringify; never visits more than depth × breadth of what is there.
 */
export function nestingIssue(raw: unknown): LimitIssue | null {
  const stack: [unknown, number, string][] = [[raw, 0, '']];
  while (stack.length > 0) {
    const [node, depth, path] = stack.pop()!;
    if (typeof node !== 'object' || node === null) continue;
    if (depth >= MAX_PLAN_DEPTH) {
      const at = path || 'plan';
      return {
        path,
        message: `${at} is nested more than ${MAX_PLAN_DEPTH} levels deep; a plan needs at most 8`,
      };
    }
    if (Array.isArray(node)) {
      for (let i = node.length - 1; i >= 0; i--) {
        if (typeof node[i] === 'object' && node[i] !== null)
          stack.push([node[i], depth + 1, `${path}[${i}]`]);
      }
    } else {
      const keys = Object.keys(node);
      for (let i = keys.length - 1; i >= 0; i--) {
        const v = (node as Json)[keys[i]];
        const k = keyText(keys[i]);
        if (typeof v === 'object' && v !== null)
          stack.push([v, depth + 1, path ? `${path}.${k}` : k]);
      }
    }
  }
  return null;
}

/**
 * No-drop zone positions are [lon, lat] (RFC 7946 §3.1.1): the schema holds both within ±180, this
 * holds the latitude within ±90. One issue per zone (the first bad position), counting the rest.
 */
export function zoneLatitudeIssues(raw: Json): LimitIssue[] {
  const out: LimitIssue[] = [];
  const safety = isRecord(raw.safety) ? raw.safety : {};
  const zones = Array.isArray(safety.noDropZones) ? safety.noDropZones : [];
  zones.forEach((z, zi) => {
    const rings = isRecord(z) && isRecord(z.geometry) ? z.geometry.coordinates : undefined;
    if (!Array.isArray(rings)) return;
    let first = '';
    let firstLat = 0;
    let bad = 0;
    rings.forEach((ring, ri) => {
      if (!Array.isArray(ring)) return;
      ring.forEach((pos, pi) => {
        const lat = Array.isArray(pos) ? pos[1] : undefined;
        if (!isNum(lat) || Math.abs(lat) <= 90) return;
        if (bad++ === 0) {
          first = `safety.noDropZones[${zi}].geometry.coordinates[${ri}][${pi}][1]`;
          firstLat = lat;
        }
      });
    });
    if (bad === 0) return;
    const more = bad > 1 ? `; ${bad - 1} more positions of this zone too` : '';
    out.push({
      path: first,
      message:
        `${first} (latitude) is ${firstLat}, must be between -90 and 90; ` +
        `positions are [lon, lat]${more}`,
    });
  });
  return out;
}

/** Mass ratio and the mass-scaled descent rate of each variant, on raw (maybe invalid) input. */
export function massIssues(raw: Json): LimitIssue[] {
  const out: LimitIssue[] = [];
  const variants = Array.isArray(raw.variants) ? raw.variants : [];
  variants.forEach((v, i) => {
    if (!isRecord(v)) return;
    const { payloadMass_kg: m, referenceMass_kg: m0, descentRate_mps: w } = v;
    // A mass outside its own range is reported by the schema already.
    const range = schema.definitions.variant.properties.referenceMass_kg;
    const inRange = (x: unknown): x is number =>
      isNum(x) && x >= range.minimum && x <= range.maximum;
    if (!inRange(m) || !inRange(m0)) return;
    const at = `variants[${i}].payloadMass_kg`;
    const ratio = m / m0;
    if (!(ratio >= MASS_RATIO_MIN && ratio <= MASS_RATIO_MAX)) {
      out.push({
        path: at,
        message:
          `${at} is ${m} kg, ${Number(ratio.toPrecision(3))} times referenceMass_kg (${m0} kg); ` +
          `it must be between ${MASS_RATIO_MIN} and ${MASS_RATIO_MAX} times referenceMass_kg`,
      });
      return;
    }
    // A rate outside its own range is reported by the schema already.
    if (!isNum(w) || w < EFFECTIVE_DESCENT_MIN_MPS || w > EFFECTIVE_DESCENT_MAX_MPS) return;
    const eff = w * Math.sqrt(ratio);
    if (!(eff >= EFFECTIVE_DESCENT_MIN_MPS && eff <= EFFECTIVE_DESCENT_MAX_MPS)) {
      out.push({
        path: `variants[${i}].descentRate_mps`,
        message:
          `variants[${i}].descentRate_mps ${w} scaled by √(payloadMass_kg / referenceMass_kg) is ` +
          `${Number(eff.toPrecision(3))} m/s; the scaled rate must be between ` +
          `${EFFECTIVE_DESCENT_MIN_MPS} and ${EFFECTIVE_DESCENT_MAX_MPS}`,
      });
    }
  });
  return out;
}
