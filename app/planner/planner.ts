import {
  bestShift,
  classW20,
  type Dispersion,
  fallTurbulence,
  FallTable,
  fixedHeadingProgramme,
  type FlightSetup,
  flySamples,
  hashLabel,
  hitProfile,
  type LocalEllipse,
  LocalFrame,
  magneticDeclination,
  magneticHeading,
  nominalPath,
  passiveOffset,
  pathTimeAt,
  type Programme,
  reachRadius,
  Rng,
  runAround,
  searchEdge,
  streamSeed,
  summarize,
  type Vec,
  W20_HEIGHT_M,
  type WindProfile,
} from '../model';
import {
  massFactor,
  type Plan,
  planWindProfile,
  type ResolvedSite,
  type ResolvedVariant,
  soundingDensity,
} from '../plan';
import { errorSources } from './error-sources';
import { recommend } from './recommend';
import type {
  GeoEllipse,
  PlanOptions,
  PlanResult,
  SiteGround,
  SiteResult,
  VariantResult,
} from './results';
import {
  aimedPath,
  crossing,
  ELEVATION_NOTICE_M,
  fallProfile,
  flightTerrain,
  geoPolygon,
  hiddenBy,
  inRing,
  type PlanGround,
  planGround,
  planTerrain,
  reachRing,
} from './terrain-flight';
import { windCoverageWarnings } from './wind-coverage';

const DEG = Math.PI / 180;

/** Search limit of the homing window and hover zone edges: doublings of the first step out. */
export const EDGE_DOUBLINGS = 6;

interface Context {
  plan: Plan;
  frame: LocalFrame;
  wind: WindProfile;
  top_m: number;
  unit: Vec;
  speed: number;
  declination: number | null;
  declinationModel: string | null;
  probeN: number;
  /** Density from the plan's sounding, when it has one. */
  density?: (z_m: number) => number;
  /** The elevation model and its ground, when planned over one. */
  ground?: PlanGround;
}

function setupFor(ctx: Context, v: ResolvedVariant, s: ResolvedSite): FlightSetup {
  const air = {
    descentRateSL_mps: v.descentRate_mps * massFactor(v),
    isaOffset_K: ctx.plan.atmosphere.isaOffset_K,
    density: ctx.density,
    wind: ctx.wind,
  };
  const table = new FallTable({
    ...air,
    top_m: ctx.top_m,
    bottom_m: s.elevation_m,
    entryLoss_m: v.entryLoss_m,
  });
  const w = ctx.wind.at(ctx.top_m);
  const u = ctx.plan.uncertainty;
  const w20 = ctx.wind.at(s.elevation_m + W20_HEIGHT_M);
  const turbulence = fallTurbulence(table, s.elevation_m, {
    w20_mps: classW20(u.turbulence, Math.hypot(w20.east_mps, w20.north_mps)),
    gust_mps: u.gust_mps,
    gustTime_s: u.gustTime_s,
    verticalAir_mps: u.verticalAir_mps,
  });
  return {
    table,
    turbulence,
    guidance: v.guidance,
    cotGamma: v.guidance === 'passive' ? 0 : 1 / Math.tan(v.glideAngle_deg * DEG),
    controlTime_s: v.guidance === 'passive' ? 0 : v.controlTime_s,
    throwTime_s: v.throwTime_s,
    carrier: { x: ctx.unit.x * ctx.speed, y: ctx.unit.y * ctx.speed },
    windTop: { x: w.east_mps, y: w.north_mps },
    ...(ctx.ground ? { terrain: flightTerrain(ctx.ground, table, air) } : {}),
  };
}

const add = (a: Vec, b: Vec, k = 1): Vec => ({ x: a.x + k * b.x, y: a.y + k * b.y });

function geoEllipse(frame: LocalFrame, e: LocalEllipse): GeoEllipse {
  return {
    center: frame.toLatLon(e.center.x, e.center.y),
    semiMajor_m: e.semiMajor_m,
    semiMinor_m: e.semiMinor_m,
    azimuth_deg: e.azimuth_deg,
  };
}

// Salt of the stream on which passive and fixed-heading flights choose their release time, apart
// from the main stream that reports (the homing and hover probes have their own salt, below).
const SELECT_SALT = 0x5bd1e995;

/** Flies n samples from `release` and returns the landing points. */
function fly(
  ctx: Context,
  su: FlightSetup,
  release: Vec,
  site: Vec,
  n: number,
  seed: number | Rng,
  prog?: Programme,
) {
  const xs = new Float64Array(n);
  const ys = new Float64Array(n);
  const off = flySamples(
    su,
    {
      n,
      rng: typeof seed === 'number' ? new Rng(seed) : seed,
      uncertainty: ctx.plan.uncertainty,
      release,
      trackUnit: ctx.unit,
      groundSpeed_mps: ctx.speed,
      site,
      programme: prog,
    },
    xs,
    ys,
  );
  return { xs, ys, off };
}

function hitShare(xs: Float64Array, ys: Float64Array, site: Vec, tol: number): number {
  let h = 0;
  for (let i = 0; i < xs.length; i++)
    if ((xs[i] - site.x) ** 2 + (ys[i] - site.y) ** 2 <= tol * tol) h++;
  return h / xs.length;
}

/** What evaluate reports from: the main stream's landings (local frame, before `shift`), and more. */
export interface Reported {
  xs: Float64Array;
  ys: Float64Array;
  /** The moving carrier's best-time shift of the release, added to every landing. */
  shift: Vec;
  site: Vec;
  stats: Dispersion;
  table: FallTable;
}

function evaluate(
  ctx: Context,
  v: ResolvedVariant,
  s: ResolvedSite,
  keep?: (r: Reported) => void,
): VariantResult {
  const { plan, frame, unit, speed } = ctx;
  const su = setupFor(ctx, v, s);
  const site = frame.toLocal(s);
  const off = passiveOffset(su);
  // Streams follow the ids, so adding, removing or reordering sites leaves the others' numbers alone.
  const seed = streamSeed(plan.monteCarlo.seed, hashLabel(s.id), hashLabel(v.id));
  const n = plan.monteCarlo.samples;
  const req = plan.requiredPHit;
  const tol = s.tolerance_m;
  const moving = speed > 0;

  // Release used: on a moving track, the point whose uncontrolled landing passes closest to the
  // site; when hovering, the point whose uncontrolled landing is the site (the zone's centre).
  const toSite = { x: site.x - off.x, y: site.y - off.y };
  let sStar = moving ? (toSite.x * unit.x + toSite.y * unit.y) / speed : 0;
  let rel: Vec = moving ? { x: unit.x * speed * sStar, y: unit.y * speed * sStar } : toSite;
  const reach = reachRadius(su);
  const programmeAt = (r: Vec): Programme | undefined =>
    v.guidance === 'fixed-heading'
      ? fixedHeadingProgramme(su, { x: site.x - r.x - off.x, y: site.y - r.y - off.y })
      : undefined;
  const prog = programmeAt(rel);
  // Over terrain a moving open-loop release flies its main stream only once the best time is
  // chosen (a moved release meets other ground); everything else flies it from here.
  const late = ctx.ground !== undefined && moving && v.guidance !== 'homing';
  const empty = { xs: new Float64Array(0), ys: new Float64Array(0), off: 0 };
  let { xs, ys, off: offCount } = late ? empty : fly(ctx, su, rel, site, n, seed, prog);

  let shift: Vec = { x: 0, y: 0 };
  let releaseWindow: VariantResult['releaseWindow'] = null;
  let releaseZone: VariantResult['releaseZone'] = null;
  // Sequential probe (docs/model.md §9): the first half of the samples settles the clear cases
  // (share 3 binomial standard errors above or below the requirement); only probes near the edge
  // fly the second half. One generator for both halves, so the result equals one full run's.
  const probeSeed = seed ^ 0x2545f491;
  const probe = (r: Vec): number => {
    const prog = programmeAt(r);
    const rng = new Rng(probeSeed);
    const n1 = Math.max(1, Math.floor(ctx.probeN / 2));
    const a = fly(ctx, su, r, site, n1, rng, prog);
    const h1 = hitShare(a.xs, a.ys, site, tol);
    const se = Math.sqrt((req * (1 - req)) / n1);
    if (n1 === ctx.probeN || Math.abs(h1 - req) > 3 * se) return h1;
    const b = fly(ctx, su, r, site, ctx.probeN - n1, rng, prog);
    return (h1 * n1 + hitShare(b.xs, b.ys, site, tol) * (ctx.probeN - n1)) / ctx.probeN;
  };

  if (moving && v.guidance !== 'homing') {
    // Landing moves rigidly with the release point: the exact chord sweep applies. The best time
    // and the window are chosen on their own samples; P(hit), CEP and ellipses come from the main
    // ones, so the maximum's luck does not flatter them (docs/model.md §9).
    const sel = fly(ctx, su, rel, site, n, seed ^ SELECT_SALT, prog);
    const prof = hitProfile(sel.xs, sel.ys, site, tol, unit, speed);
    const best = bestShift(prof);
    const b = Number.isFinite(best.shift) ? best.shift : 0;
    const run = runAround(prof, b, req);
    shift = { x: unit.x * speed * b, y: unit.y * speed * b };
    if (run) {
      const bestPt = add(rel, shift);
      releaseWindow = {
        open_s: sStar + run[0],
        close_s: sStar + run[1],
        best: frame.toLatLon(bestPt.x, bestPt.y),
        best_s: sStar + b,
      };
    }
    sStar += b;
  } else if (moving) {
    const p0 = hitShare(xs, ys, site, tol);
    if (p0 >= req) {
      const at = (t: number): number => probe(add(rel, unit, speed * t));
      const span = (reach + tol + 50) / speed;
      const open = searchEdge(at, -span, req, EDGE_DOUBLINGS, 7);
      const close = searchEdge(at, span, req, EDGE_DOUBLINGS, 7);
      releaseWindow = {
        open_s: sStar + open.edge,
        close_s: sStar + close.edge,
        best: frame.toLatLon(rel.x, rel.y),
        best_s: sStar,
        ...(open.bounded ? {} : { openUnbounded: true as const }),
        ...(close.bounded ? {} : { closeUnbounded: true as const }),
      };
    }
  }

  if (late) {
    ({ xs, ys, off: offCount } = fly(ctx, su, add(rel, shift), site, n, seed, prog));
    rel = add(rel, shift);
    shift = { x: 0, y: 0 };
  }
  const stats: Dispersion = summarize(xs, ys, site, tol, shift);
  keep?.({ xs, ys, shift, site, stats, table: su.table });
  rel = add(rel, shift);
  const flatNominal = add(rel, off);
  let nominal = flatNominal;
  let fallTime_s = su.table.fallTime_s;
  let terrainPart: Pick<VariantResult, 'landingGround_m' | 'reachPolygon' | 'terrain'> = {};
  let ring: Vec[] | null = null;
  let hidden = false;
  if (ctx.ground) {
    // The uncontrolled descent over the ground; the descent aimed at the site for the profile
    // and hidden ground (docs/model.md §18).
    const open = crossing(su, nominalPath(su, rel));
    if (open) {
      nominal = { x: open.x, y: open.y };
      fallTime_s = pathTimeAt(su, open.z);
    }
    ring = reachRing(su, rel);
    const aimed = aimedPath(su, rel, site, flatNominal, prog);
    const aimedHit = crossing(su, aimed);
    const siteGround = ctx.ground.ground.height(site.x, site.y) ?? s.elevation_m;
    // Hidden only when the aimed descent would pass over the site at its level: a descent that
    // misses the site anyway (out of reach, a passive release off the best line) is not hidden.
    const atLevel = new Float64Array(2);
    aimed(s.elevation_m, atLevel);
    const aimedAtSite = Math.hypot(atLevel[0] - site.x, atLevel[1] - site.y) <= tol;
    const hiddenAt = aimedAtSite ? hiddenBy(frame, aimedHit, site, siteGround, tol) : undefined;
    hidden = hiddenAt !== undefined;
    const reachPolygon = ring ? geoPolygon(frame, ring) : null;
    terrainPart = {
      landingGround_m: open ? open.z : null,
      reachPolygon,
      terrain: {
        landingGround_m: open ? open.z : null,
        reachPolygon,
        fallProfile: fallProfile(su, aimed, aimedHit ? aimedHit.z : su.terrain!.bottom_m),
        ...(hiddenAt ? { hiddenBy: hiddenAt } : {}),
        offTerrain: offCount / n,
      },
    };
  }
  const miss = Math.hypot(site.x - nominal.x, site.y - nominal.y);

  if (!moving) {
    // Hover: where to hold so that P(hit) meets the requirement (a disc about the best point).
    const c = rel;
    if (stats.pHit >= req) {
      // Eight directions; the first one's edge is the starting radius, so it is always finite.
      let radius = 0;
      let unbounded = false;
      for (let d = 0; d < 8; d++) {
        const u = { x: Math.sin((d * Math.PI) / 4), y: Math.cos((d * Math.PI) / 4) };
        const at = (r: number): number => probe(add(c, u, r));
        const e = searchEdge(at, reach + tol + 50, req, EDGE_DOUBLINGS, 8);
        if (d === 0 || e.edge < radius) [radius, unbounded] = [e.edge, !e.bounded];
      }
      releaseZone = {
        center: frame.toLatLon(c.x, c.y),
        radius_m: radius,
        ...(unbounded ? { unbounded: true as const } : {}),
      };
    }
  }

  const result: VariantResult = {
    variant: v.id,
    guidance: v.guidance,
    release: { ...frame.toLatLon(rel.x, rel.y), time_s: moving ? sStar : 0 },
    fallTime_s,
    nominalLanding: frame.toLatLon(nominal.x, nominal.y),
    nominalMiss_m: miss,
    reachRadius_m: reach,
    reachable: hidden
      ? false
      : v.guidance === 'passive'
        ? miss <= tol
        : ctx.ground
          ? ring !== null && inRing(ring, site, tol)
          : miss <= reach + tol,
    ellipse50: geoEllipse(frame, stats.ellipse50),
    ellipse95: geoEllipse(frame, stats.ellipse95),
    ellipse99: geoEllipse(frame, stats.ellipse99),
    meanLanding: frame.toLatLon(stats.mean.x, stats.mean.y),
    cep_m: stats.cep_m,
    pHit: stats.pHit,
    pHitSE: Math.sqrt((stats.pHit * (1 - stats.pHit)) / n),
    gust_mps: su.turbulence?.gust_mps ?? 0,
    gustTime_s: su.turbulence && su.turbulence.gust_mps > 0 ? su.turbulence.gustTime_s : 0,
    verticalAir_mps: su.turbulence?.verticalAir_mps ?? 0,
    releaseWindow,
    releaseZone,
  };
  if (prog) {
    result.headingTrue_deg = prog.headingTrue_deg;
    result.headingMag_deg =
      ctx.declination === null ? null : magneticHeading(prog.headingTrue_deg, ctx.declination);
    result.thrustTime_s = prog.thrust_s;
  }
  return { ...result, ...terrainPart };
}

/**
 * Re-flies one site × variant exactly as planDrop does (same seed, release and best-time shift)
 * and hands back its result with the main stream it reported from; null for an unknown id.
 */
export function reportedStream(
  plan: Plan,
  siteId: string,
  variantId: string,
  opts: Pick<PlanOptions, 'terrain'> = {},
): (Reported & { result: VariantResult }) | null {
  const s0 = plan.sites.find((x) => x.id === siteId);
  const v = plan.variants.find((x) => x.id === variantId);
  if (!s0 || !v) return null;
  let kept: Reported | undefined;
  const warnings: string[] = [];
  const ctx = context(plan, opts, warnings);
  const s = groundedSite(ctx, s0, warnings).site;
  const result = evaluate(ctx, v, s, (r) => (kept = r));
  return kept ? { ...kept, result } : null;
}

const r1 = (v: number): string => (Math.round(v * 10) / 10).toString();

/**
 * A site's elevation over terrain: typed wins (a warning when the model differs by more than
 * ELEVATION_NOTICE_M); otherwise the model's height at the site; the plan's ground, with a
 * warning, where the model has none.
 */
function groundedSite(
  ctx: Context,
  s: ResolvedSite,
  warnings: string[],
): { site: ResolvedSite; ground?: SiteGround } {
  if (!ctx.ground) return { site: s };
  const model = ctx.ground.model;
  const h = model.sample(s);
  if (!s.elevationDefaulted) {
    // Typed elevations far from the model's are collected into one warning (elevationWarning).
    return { site: s, ground: { elevation_m: s.elevation_m, source: 'typed', terrain_m: h } };
  }
  if (h === null) {
    warnings.push(
      `site ${s.id}: ${model.name} has no height at the site; its elevation is the plan's ground, ` +
        `${r1(s.elevation_m)} m`,
    );
    return {
      site: s,
      ground: { elevation_m: s.elevation_m, source: 'plan-ground', terrain_m: null },
    };
  }
  if (!(h < ctx.top_m - 1)) {
    // The plan's checks compare typed elevations with the release; the model's are checked here.
    throw new Error(
      `${model.name}: the ground at site ${s.id} is ${r1(h)} m MSL, not below the release ` +
        `altitude ${r1(ctx.top_m)} m MSL; raise the release or type the site's elevation`,
    );
  }
  return {
    site: { ...s, elevation_m: h },
    ground: { elevation_m: h, source: 'terrain', terrain_m: h },
  };
}

function context(plan: Plan, opts: PlanOptions, warnings: string[]): Context {
  const ground = plan.groundElevation_m;
  const top_m = plan.release.altitude_m + (plan.release.reference === 'AGL' ? ground : 0);
  const trackRad = plan.carrier.trackDeg * DEG;
  let declination: number | null = null;
  let declinationModel: string | null = null;
  try {
    const d = magneticDeclination(plan.release.lat, plan.release.lon, new Date(plan.time), top_m);
    declination = d.declination_deg;
    declinationModel = d.model;
  } catch (e) {
    warnings.push(`time: ${(e as Error).message}; magnetic headings are not given`);
  }
  warnings.push(...windCoverageWarnings(plan, top_m));
  const frame = new LocalFrame(plan.release);
  return {
    plan,
    frame,
    wind: planWindProfile(plan),
    top_m,
    unit: { x: Math.sin(trackRad), y: Math.cos(trackRad) },
    speed: plan.carrier.groundSpeed_mps,
    declination,
    declinationModel,
    probeN: Math.max(1, Math.min(plan.monteCarlo.samples, opts.probeSamples ?? 128)),
    density: soundingDensity(plan),
    ...(opts.terrain ? { ground: planGround(plan, frame, opts.terrain) } : {}),
  };
}

/** Plans every site with every variant and picks one per site (docs/model.md §10). */
export function planDrop(plan: Plan, opts: PlanOptions = {}): PlanResult {
  const warnings: string[] = [];
  const ctx = context(plan, opts, warnings);
  const sites = plan.sites.map((s0, si): SiteResult => {
    const { site: s, ground } = groundedSite(ctx, s0, warnings);
    const all = plan.variants.map((v) => evaluate(ctx, v, s));
    opts.onProgress?.(si + 1, plan.sites.length);
    const rec = recommend(all, plan.variants, plan.requiredPHit);
    const recommended = rec.variant;
    const chosenId = s.variant ?? recommended;
    const chosen = all.find((r) => r.variant === chosenId) ?? all[0];
    return {
      id: s.id,
      name: s.name,
      lat: s.lat,
      lon: s.lon,
      ...chosen,
      recommended,
      recommendation: rec,
      pinned: s.variant !== undefined,
      meetsRequired: chosen.pHit >= plan.requiredPHit,
      comparison: all.map((r) => ({
        variant: r.variant,
        reachable: r.reachable,
        pHit: r.pHit,
        pHitSE: r.pHitSE,
        cep_m: r.cep_m,
        cost: plan.variants.find((v) => v.id === r.variant)?.cost ?? 0,
      })),
      byVariant: all,
      ...(ground ? { ground } : {}),
    };
  });
  if (ctx.ground) {
    const typed = elevationWarning(ctx.ground.model.name, sites);
    if (typed) warnings.push(typed);
    warnings.push(...terrainWarnings(ctx.ground.model.name, sites));
  }
  return {
    name: plan.name,
    time: plan.time,
    declination_deg: ctx.declination,
    declinationModel: ctx.declinationModel,
    releaseAltitudeMSL_m: ctx.top_m,
    releasePoint: { lat: plan.release.lat, lon: plan.release.lon },
    track: { unit: ctx.unit, groundSpeed_mps: ctx.speed, trackDeg: plan.carrier.trackDeg },
    sites,
    errorSources: errorSources(plan),
    warnings,
    ...(ctx.ground
      ? { terrain: planTerrain(ctx.ground, ctx.frame, ctx.unit, ctx.speed, sites) }
      : {}),
  };
}

/** Most sites a terrain warning names (the rest are counted). */
const WARN_SITES = 20;

/** Sites whose typed elevation is more than ELEVATION_NOTICE_M from the model's, in one warning. */
function elevationWarning(name: string, sites: SiteResult[]): string | null {
  const far: string[] = [];
  for (const s of sites) {
    const g = s.ground;
    if (!g || g.source !== 'typed' || g.terrain_m === null) continue;
    const d = Math.abs(g.terrain_m - g.elevation_m);
    if (d > ELEVATION_NOTICE_M) {
      far.push(
        `${s.id} (typed ${r1(g.elevation_m)} m, model ${r1(g.terrain_m)} m, ${r1(d)} m apart)`,
      );
    }
  }
  if (far.length === 0) return null;
  const shown = far.slice(0, WARN_SITES).join(', ');
  const more = far.length > WARN_SITES ? ` and ${far.length - WARN_SITES} more sites` : '';
  return (
    `typed site elevations differ from ${name}'s by more than ${ELEVATION_NOTICE_M} m; ` +
    `the typed ones are used: ${shown}${more}`
  );
}

/**
 * Hidden sites, descents that left the model and reach areas that did not meet known ground, in
 * words: one warning per kind, naming at most WARN_SITES sites (each with its variants) and
 * counting the rest.
 */
function terrainWarnings(name: string, sites: SiteResult[]): string[] {
  const hidden: string[] = [];
  const off: string[] = [];
  const noReach: string[] = [];
  for (const s of sites) {
    const h: string[] = [];
    const o: string[] = [];
    const n: string[] = [];
    for (const r of s.byVariant) {
      const t = r.terrain;
      if (!t) continue;
      if (t.hiddenBy) {
        h.push(
          `${r.variant}: ground ${r1(t.hiddenBy.aboveSite_m)} m above the site, ` +
            `${r1(t.hiddenBy.fromSite_m)} m from it`,
        );
      }
      if (t.offTerrain > 0) o.push(`${r.variant} ${r1(t.offTerrain * 100)} %`);
      if (r.guidance !== 'passive' && r.reachRadius_m > 0 && t.reachPolygon === null) {
        n.push(r.variant);
      }
    }
    if (h.length) hidden.push(`${s.id} (${h.join('; ')})`);
    if (o.length) off.push(`${s.id} (${o.join(', ')})`);
    if (n.length) noReach.push(`${s.id} (${n.join(', ')})`);
  }
  const list = (xs: string[]): string =>
    xs.slice(0, WARN_SITES).join(', ') +
    (xs.length > WARN_SITES ? ` and ${xs.length - WARN_SITES} more sites` : '');
  const out: string[] = [];
  if (hidden.length) {
    out.push(
      `hidden by higher ground — the descent aimed at the site meets the ground first: ${list(hidden)}`,
    );
  }
  if (off.length) {
    out.push(
      `descents that met no known ground in ${name} (nodata or outside it) count as misses: ${list(off)}`,
    );
  }
  if (noReach.length) {
    out.push(
      `reach area not known (a steered glide met no known ground in ${name}); counted not reachable: ${list(noReach)}`,
    );
  }
  return out;
}
