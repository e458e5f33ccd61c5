// What the exporters share (geojson.ts, kml.ts, gpx.ts, csv.ts): rounding, rings from the model's
// rings.ts (geodesic vertices), track times, release text, XML escaping.
import { alongTrack, ellipseRingLatLon, type LatLon } from '../model';
import type { Plan, ResolvedSite } from '../plan';
import { type GeoEllipse, type PlanResult, pHitText, type SiteResult } from '../planner';
import type { Position } from './geojson';

/** Degrees rounded to 7 decimals (≈ 1 cm), without negative zero. */
export const r7 = (x: number): number => Math.round(x * 1e7) / 1e7 + 0;
export const round = (x: number, d: number): number => Math.round(x * 10 ** d) / 10 ** d + 0;
export const pos = (p: LatLon): Position => [r7(p.lon), r7(p.lat)];

// Smallest drawn semi-axis, m: a zero-size ellipse would be a degenerate ring. The true
// sizes stay in the properties.
export const MIN_AXIS_M = 0.3;

/** Closed ring on an ellipse (semi-axes m, major axis azimuth degrees true), [lon, lat]. */
export function ellipsePositions(
  c: LatLon,
  a_m: number,
  b_m: number,
  az_deg: number,
  n = 72,
): Position[] {
  const ring = ellipseRingLatLon(
    c,
    Math.max(a_m, MIN_AXIS_M),
    Math.max(b_m, MIN_AXIS_M),
    az_deg,
    n,
  );
  return ccw(ring.map(pos));
}

/** Twice the signed planar area of a closed [lon, lat] ring; > 0 when counter-clockwise. */
export function shoelace(ring: Position[]): number {
  let s = 0;
  for (let i = 0; i + 1 < ring.length; i++) {
    s += ring[i][0] * ring[i + 1][1] - ring[i + 1][0] * ring[i][1];
  }
  return s;
}

// RFC 7946 §3.1.6: exterior rings counter-clockwise, holes clockwise.
export const ccw = (ring: Position[]): Position[] =>
  shoelace(ring) < 0 ? [...ring].reverse() : ring;
export const cw = (ring: Position[]): Position[] =>
  shoelace(ring) > 0 ? [...ring].reverse() : ring;

export function orientPolygon(rings: number[][][]): Position[][] {
  return rings.map((ring, i) => {
    const rounded = ring.map((p): Position => [r7(p[0]), r7(p[1])]);
    return i === 0 ? ccw(rounded) : cw(rounded);
  });
}

/** Point on the carrier track time_s seconds after passing the plan's release point. */
export function trackPoint(result: PlanResult, time_s: number): LatLon {
  return alongTrack(
    result.releasePoint,
    result.track.trackDeg,
    result.track.groundSpeed_mps * time_s,
  );
}

/** Track span, s: −60…+60 around the plan's release point, widened to cover every window and release. */
export function trackSpan(result: PlanResult): [number, number] {
  let lo = -60;
  let hi = 60;
  for (const s of result.sites) {
    lo = Math.min(lo, s.release.time_s, s.releaseWindow?.open_s ?? 0);
    hi = Math.max(hi, s.release.time_s, s.releaseWindow?.close_s ?? 0);
  }
  return [Math.floor(lo), Math.ceil(hi)];
}

/** Times of track vertices, about every 10 s from `from` to `to` inclusive. */
export function trackTimes(from: number, to: number): number[] {
  const n = Math.max(1, Math.min(200, Math.round((to - from) / 10)));
  return Array.from({ length: n + 1 }, (_, i) => from + ((to - from) * i) / n);
}

export const moving = (result: PlanResult): boolean => result.track.groundSpeed_mps > 0;

/** The resolved plan site of a result (same index in planDrop's output; by id as a fallback). */
export function planSite(plan: Plan, result: PlanResult, i: number): ResolvedSite {
  const id = result.sites[i].id;
  return plan.sites[i]?.id === id
    ? plan.sites[i]
    : (plan.sites.find((s) => s.id === id) ?? plan.sites[i]);
}

export const ellipseRingOf = (e: GeoEllipse): Position[] =>
  ellipsePositions(e.center, e.semiMajor_m, e.semiMinor_m, e.azimuth_deg);

export const signed = (t: number): string => `${t >= 0 ? '+' : '−'}${Math.abs(t).toFixed(1)} s`;

/** One-line human summary of a site's release, used in KML and GPX descriptions. */
export function releaseText(r: SiteResult): string {
  const parts = [
    `site ${r.id} (${r.name})`,
    `variant ${r.variant}`,
    `release ${signed(r.release.time_s)}`,
  ];
  const w = r.releaseWindow;
  if (w) parts.push(`window ${signed(w.open_s)} to ${signed(w.close_s)}, best ${signed(w.best_s)}`);
  if (r.releaseZone) parts.push(`hover within ${r.releaseZone.radius_m.toFixed(1)} m`);
  if (!w && !r.releaseZone) parts.push('no release window meets the required P(hit)');
  if (r.headingTrue_deg !== undefined) {
    const mag = r.headingMag_deg == null ? '' : ` / ${r.headingMag_deg.toFixed(0)}° magnetic`;
    parts.push(
      `heading ${r.headingTrue_deg.toFixed(0)}° true${mag}, thrust ${(r.thrustTime_s ?? 0).toFixed(1)} s`,
    );
  }
  parts.push(`P(hit) ${pHitText(r.pHit, r.pHitSE)}, CEP ${r.cep_m.toFixed(1)} m`);
  return parts.join('; ');
}

/** XML 1.0 text/attribute escape; characters XML 1.0 cannot carry are replaced by U+FFFD. */
export function xmlEscape(text: string): string {
  return String(text)
    .replace(/[\u0000-\u0008\u000B\u000C\u000E-\u001F\uFFFE\uFFFF]/g, '\uFFFD') // eslint-disable-line no-control-regex
    .replace(/&/g, '&amp;')
    .replace(/</g, '&lt;')
    .replace(/>/g, '&gt;')
    .replace(/"/g, '&quot;')
    .replace(/'/g, '&apos;');
}

export const el = (tag: string, text: string | number): string =>
  `<${tag}>${xmlEscape(String(text))}</${tag}>`;
