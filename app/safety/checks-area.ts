// Checks of where and in what wind the drop happens: surface and release wind, ceiling, no-drop zones.
import { LocalFrame } from '../model';
import type { Plan } from '../plan';
import type { PlanResult } from '../planner';
import {
  type CheckResult,
  type CheckStatus,
  LOCAL_RULES,
  overall,
  r1,
  r3,
  type SafetySettings,
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
