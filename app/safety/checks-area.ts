// Checks of where and in what wind the drop happens: surface and release wind, ceiling, no-drop zones.
import { LocalFrame } from '../model';
import { type Plan, planWindProfile } from '../plan';
import { type PlanResult, windCoverageWarnings } from '../planner';
import {
  type CheckResult,
  type CheckStatus,
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
import { boxGap, boxOf, clearanceLocal, localZone } from './clearance';
import { circumscribed, hazardPieces } from './hazard-area';

export function windCheck(plan: Plan, result: PlanResult): CheckResult {
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
  // The variants behind the verdict, each with the sites it was chosen for.
  const flagged = items.filter((i) => i.status === status && status !== 'pass');
  const sitesOf = (variant: string) =>
    result.sites.filter((s) => s.variant === variant).map((s) => s.id);
  const named = flagged.map((i) => {
    const at = sitesOf(i.variant);
    const limit = typeof i.limit_mps === 'number' ? ` (limit ${i.limit_mps} m/s)` : '';
    return `${i.variant}${limit}, used at ${shortList(at.map((id) => siteLabel(result, id)))}`;
  });
  const why =
    status === 'fail'
      ? `Wind up to ${r1(w.max_mps)} m/s between the surface and the release altitude exceeds ` +
        `the limit of ${named.join('; ')}.`
      : status === 'warn'
        ? `No wind limit set for ${named.join('; ')}; the wind could not be checked for it.`
        : status === 'n/a'
          ? 'No variant is used.'
          : `Wind up to ${r1(w.max_mps)} m/s is within every used variant's limit.`;
  const flaggedIds = new Set(flagged.map((i) => i.variant));
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
    sites: result.sites.filter((s) => flaggedIds.has(s.variant)).map((s) => s.id),
  };
}

/**
 * Whether the wind layers reach down to the release and up to it: the planner's own coverage
 * warnings (windCoverageWarnings), so the check and PlanResult.warnings always say the same.
 */
export function windCoverageCheck(plan: Plan, result: PlanResult): CheckResult {
  const found = windCoverageWarnings(plan, result.releaseAltitudeMSL_m);
  const z = planWindProfile(plan).z;
  const sentence = (w: string): string => {
    const t = w.replace(/^winds:\s*/, '');
    return `${t.charAt(0).toUpperCase()}${t.slice(1)}.`;
  };
  return {
    id: 'wind-coverage',
    title: 'Wind profile covers the fall',
    status: found.length ? 'warn' : 'pass',
    why: found.length
      ? found.map(sentence).join(' ')
      : 'The wind layers reach from below the release to its altitude, so no part of the fall ' +
        'uses wind extrapolated beyond them.',
    numbers: {
      releaseMSL_m: r1(result.releaseAltitudeMSL_m),
      lowestLayerMSL_m: z.length ? r1(z[0]) : 'none',
      topLayerMSL_m: z.length ? r1(z[z.length - 1]) : 'none',
    },
  };
}

export function ceilingCheck(plan: Plan, result: PlanResult, st: SafetySettings): CheckResult {
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

export function noDropCheck(result: PlanResult, st: SafetySettings): CheckResult {
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
  // Each site once, in plan order, with its closest zone.
  const closest = new Map<string, Record<string, number | string>>();
  for (const it of items) {
    const had = closest.get(it.site as string);
    if (!had || (it.clearance_m as number) < (had.clearance_m as number))
      closest.set(it.site as string, it);
  }
  const sites = result.sites.map((s) => s.id).filter((id) => closest.has(id));
  const named = sites.map((id) => {
    const it = closest.get(id)!;
    return `${siteLabel(result, id)} (${it.clearance_m} m from ${it.zone})`;
  });
  return {
    id: 'no-drop-zones',
    title: 'Landing ellipses clear of no-drop zones',
    status: ok ? 'pass' : 'fail',
    why: ok
      ? `Every 99 % landing ellipse, over its whole release window, is at least ${st.noDropBuffer_m} m from every no-drop zone.`
      : `The 99 % landing ellipses of ${sitesWord(sites.length)} come closer than ` +
        `${st.noDropBuffer_m} m to a no-drop zone (0 m = overlapping): ${shortList(named)}.`,
    numbers: { zones: zones.length, buffer_m: st.noDropBuffer_m, leastClearance_m: r1(least) },
    items,
    sites,
  };
}
