// Checks over an elevation model: the carrier's height above the ground along its track or at its
// hover points, against the least clearance and the ceiling (docs/model.md §15, §18).
import { LocalFrame } from '../model';
import type { CarrierGroundPoint, PlanResult } from '../planner';
import {
  type CheckResult,
  type CheckStatus,
  LOCAL_RULES,
  r1,
  r3,
  type SafetySettings,
  shortList,
  siteLabel,
  sitesWord,
} from './check-result';

const TITLE = 'Carrier clear of the terrain';
const r6 = (x: number): number => Math.round(x * 1e6) / 1e6;

/** A carrier point with its height above the ground (m) and the sites it releases for. */
interface Above {
  p: CarrierGroundPoint;
  above_m: number;
  sites: string[];
}

/**
 * The sites a carrier point serves: a hover point names its site; a track point serves every
 * site whose release window holds the time the carrier passes it (t = along-track distance from
 * the release point / ground speed), within half the spacing of the track points.
 */
function sitesOf(result: PlanResult): (p: CarrierGroundPoint) => string[] {
  const frame = new LocalFrame(result.releasePoint);
  const { unit, groundSpeed_mps } = result.track;
  const track = result.terrain?.carrier.filter((p) => p.kind === 'track') ?? [];
  const times = track.map((p) => {
    const q = frame.toLocal(p);
    return groundSpeed_mps > 0 ? (q.x * unit.x + q.y * unit.y) / groundSpeed_mps : 0;
  });
  let slack = 0;
  for (let i = 1; i < times.length; i++) slack = Math.max(slack, Math.abs(times[i] - times[i - 1]));
  slack = slack / 2 + 1e-6;
  const at = new Map(track.map((p, i) => [p, times[i]]));
  return (p) => {
    if (p.site !== undefined) return [p.site];
    const t = at.get(p);
    if (t === undefined) return [];
    return result.sites
      .filter((s) => s.releaseWindow && t >= s.releaseWindow.open_s - slack)
      .filter((s) => s.releaseWindow && t <= s.releaseWindow.close_s + slack)
      .map((s) => s.id);
  };
}

const where = (a: Above): string =>
  `${a.p.lat.toFixed(5)}, ${a.p.lon.toFixed(5)} (ground ${r1(a.p.ground_m ?? NaN)} m MSL, ` +
  `carrier ${r1(a.above_m)} m above it)`;

/**
 * The carrier's height above the terrain (release altitude MSL − ground under it) at every point
 * of PlanResult.terrain.carrier: fail below `terrainClearance_m` or above `ceiling_m` (a valley
 * under the track lifts the carrier over the legal height); warn where the ground is unknown;
 * n/a when planned without an elevation model.
 */
export function terrainClearanceCheck(result: PlanResult, st: SafetySettings): CheckResult {
  const terrain = result.terrain;
  const settings = { clearanceSetting_m: st.terrainClearance_m, ceilingSetting_m: st.ceiling_m };
  if (!terrain || terrain.carrier.length === 0) {
    return {
      id: 'terrain-clearance',
      title: TITLE,
      status: 'n/a',
      why: terrain
        ? `The elevation model ${terrain.name} gave no carrier points to check (no sites).`
        : 'Planned without an elevation model: the ceiling check measures the release above the ' +
          'plan ground only.',
      numbers: settings,
    };
  }
  const zRel = result.releaseAltitudeMSL_m;
  const serves = sitesOf(result);
  const known: Above[] = [];
  const unknown: CarrierGroundPoint[] = [];
  for (const p of terrain.carrier) {
    if (p.ground_m === null || !Number.isFinite(p.ground_m)) unknown.push(p);
    else known.push({ p, above_m: zRel - p.ground_m, sites: serves(p) });
  }
  const low = known.filter((a) => a.above_m < st.terrainClearance_m);
  const high = known.filter((a) => a.above_m > st.ceiling_m);
  const lowest = known.reduce<Above | null>((m, a) => (!m || a.above_m < m.above_m ? a : m), null);
  const highest = known.reduce<Above | null>((m, a) => (!m || a.above_m > m.above_m ? a : m), null);
  const status: CheckStatus = low.length || high.length ? 'fail' : unknown.length ? 'warn' : 'pass';

  const order = new Map(result.sites.map((s, i) => [s.id, i]));
  const inPlanOrder = (ids: Iterable<string>): string[] =>
    [...new Set(ids)].sort((a, b) => (order.get(a) ?? 0) - (order.get(b) ?? 0));
  const named = (ids: string[]): string =>
    ids.length ? ` (release for ${shortList(ids.map((id) => siteLabel(result, id)))})` : '';
  const unknownSites = inPlanOrder(unknown.flatMap(serves));

  const parts: string[] = [];
  if (low.length && lowest) {
    parts.push(
      `The carrier at ${r1(zRel)} m MSL passes less than ${r1(st.terrainClearance_m)} m above ` +
        `the terrain at ${low.length} of ${terrain.carrier.length} points; lowest at ` +
        `${where(lowest)}${named(lowest.sites)}.`,
    );
  }
  if (high.length && highest) {
    parts.push(
      `Over low ground the carrier is more than the ceiling setting of ${r1(st.ceiling_m)} m above ` +
        `the terrain at ${high.length} points; highest at ${where(highest)}${named(highest.sites)}.`,
    );
  }
  if (unknown.length) {
    parts.push(
      `${terrain.name} has no height under ${unknown.length} of ${terrain.carrier.length} carrier ` +
        `points${unknownSites.length ? ` (release for ${sitesWord(unknownSites.length)}: ${shortList(unknownSites.map((id) => siteLabel(result, id)))})` : ''}; the clearance there is not checked.`,
    );
  }
  if (status === 'pass' && lowest && highest) {
    parts.push(
      `Along its track or at its hover points the carrier is ${r1(lowest.above_m)}–` +
        `${r1(highest.above_m)} m above the terrain of ${terrain.name}: at least the clearance ` +
        `setting of ${r1(st.terrainClearance_m)} m and within the ceiling setting of ${r1(st.ceiling_m)} m.`,
    );
  }
  parts.push(`Set the clearance to the local rule (30 m is common practice). ${LOCAL_RULES}`);

  // Each flagged site once, with its worst point.
  const flagged = [...low, ...high];
  const bySite = new Map<string, Above>();
  for (const a of flagged) {
    for (const id of a.sites) {
      const had = bySite.get(id);
      const worse = (x: Above) =>
        x.above_m < st.terrainClearance_m
          ? st.terrainClearance_m - x.above_m
          : x.above_m - st.ceiling_m;
      if (!had || worse(a) > worse(had)) bySite.set(id, a);
    }
  }
  const sites = inPlanOrder(status === 'fail' ? bySite.keys() : unknownSites);
  const items = inPlanOrder(bySite.keys()).map((id) => {
    const a = bySite.get(id)!;
    return {
      site: id,
      lat: r6(a.p.lat),
      lon: r6(a.p.lon),
      ground_m: r1(a.p.ground_m ?? NaN),
      aboveGround_m: r1(a.above_m),
      status: 'fail',
    };
  });
  const worstPoint = status === 'fail' ? (low.length ? lowest : highest) : lowest;
  return {
    id: 'terrain-clearance',
    title: TITLE,
    status,
    why: parts.join(' '),
    numbers: {
      ...settings,
      releaseMSL_m: r3(zRel),
      points: terrain.carrier.length,
      unknownGround: unknown.length,
      leastAboveGround_m: lowest ? r1(lowest.above_m) : 'none',
      mostAboveGround_m: highest ? r1(highest.above_m) : 'none',
      ...(worstPoint
        ? {
            worstLat: r6(worstPoint.p.lat),
            worstLon: r6(worstPoint.p.lon),
            worstGround_m: r1(worstPoint.p.ground_m ?? NaN),
            worstAboveGround_m: r1(worstPoint.above_m),
          }
        : {}),
    },
    ...(items.length ? { items } : {}),
    sites,
  };
}
