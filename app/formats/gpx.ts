// GPX 1.1: the release points as waypoints and the carrier track.
import type { LatLon } from '../model';
import type { Plan } from '../plan';
import { type PlanResult, pHitText } from '../planner';
import {
  el,
  moving,
  planSite,
  r7,
  releaseText,
  round,
  signed,
  trackPoint,
  trackSpan,
  trackTimes,
} from './export-shared';

/** xsd:dateTime in UTC for plan time + offset_s, or undefined when the plan time is not a date. */
export function utcAt(planTime: string, offset_s: number): string | undefined {
  const ms = Date.parse(planTime);
  if (!Number.isFinite(ms) || !Number.isFinite(offset_s)) return undefined;
  return new Date(ms + Math.round(offset_s * 1000)).toISOString();
}

// GPX 1.1 wptType sequence: ele, time, magvar, geoidheight, name, cmt, desc, src, link, sym, type, …
export function wpt(
  tag: 'wpt' | 'rtept',
  p: LatLon,
  f: { ele?: number; time?: string; name: string; cmt?: string; desc?: string; type?: string },
): string {
  const parts = [`<${tag} lat="${r7(p.lat)}" lon="${r7(p.lon)}">`];
  if (f.ele !== undefined && Number.isFinite(f.ele)) parts.push(el('ele', round(f.ele, 2)));
  if (f.time) parts.push(el('time', f.time));
  parts.push(el('name', f.name));
  if (f.cmt) parts.push(el('cmt', f.cmt));
  if (f.desc) parts.push(el('desc', f.desc));
  if (f.type) parts.push(el('type', f.type));
  parts.push(`</${tag}>`);
  return parts.join('');
}

/** GPX 1.1 with a waypoint per release point (R-<id>) and per site, and the carrier track as a route. */
export function toGPX(plan: Plan, result: PlanResult): string {
  const lines = [
    '<?xml version="1.0" encoding="UTF-8"?>',
    '<gpx version="1.1" creator="Seedfall" xmlns="http://www.topografix.com/GPX/1/1" ' +
      'xmlns:xsi="http://www.w3.org/2001/XMLSchema-instance" ' +
      'xsi:schemaLocation="http://www.topografix.com/GPX/1/1 http://www.topografix.com/GPX/1/1/gpx.xsd">',
  ];
  const t0 = utcAt(result.time, 0);
  lines.push(
    `<metadata>${el('name', result.name)}${el('desc', `Seedfall drop plan; times are planned, relative to passing the plan's release point at ${result.time}`)}${t0 ? el('time', t0) : ''}</metadata>`,
  );
  for (const r of result.sites) {
    lines.push(
      wpt('wpt', r.release, {
        ele: result.releaseAltitudeMSL_m,
        time: utcAt(result.time, r.release.time_s),
        name: `R-${r.id}`,
        cmt: `release ${r.id} with ${r.variant}`,
        desc: releaseText(r),
        type: 'release',
      }),
    );
  }
  result.sites.forEach((r, i) => {
    const s = planSite(plan, result, i);
    lines.push(
      wpt('wpt', s, {
        ele: s.elevation_m,
        name: r.id,
        cmt: r.name,
        desc: `${r.name}; tolerance ${s.tolerance_m} m; variant ${r.variant}; P(hit) ${pHitText(r.pHit, r.pHitSE)}`,
        type: 'site',
      }),
    );
  });
  if (moving(result)) {
    const [from, to] = trackSpan(result);
    const pts = trackTimes(from, to).map((t) =>
      wpt('rtept', trackPoint(result, t), {
        ele: result.releaseAltitudeMSL_m,
        time: utcAt(result.time, t),
        name: `T${signed(t).replace(/ s$/, '').replace('−', '-')}`,
      }),
    );
    // rteType sequence: name, cmt, desc, src, link, number, type, extensions, rtept*.
    lines.push(
      `<rte>${el('name', 'Carrier track')}${el('desc', `${result.track.trackDeg}° true at ${result.track.groundSpeed_mps} m/s`)}`,
      ...pts,
      '</rte>',
    );
  }
  lines.push('</gpx>', '');
  return lines.join('\n');
}
